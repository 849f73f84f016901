import Flatten from '@flatten-js/core';
const p = new Flatten.Point(1, 0);
console.log(p.rotate(Math.PI/2, new Flatten.Point(0,0)));
const a = new Flatten.Arc(new Flatten.Point(0,0), 2, 0, Math.PI/2, true);
console.log(a.start, a.end, a.length);
