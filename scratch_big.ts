import { checkPlan } from './src/core';
const lines = ['wheel 56', 'track 160', 'field 100000 by 100000', 'start (50000, 50000) heading 0'];
let n = 0; const parts: string[] = [...lines];
let len = 0;
while (len < 10_000_000) { const l = n % 3 === 0 ? 'drive 10 speed 40%' : n % 3 === 1 ? 'turn 90 by gyro reset' : 'turn -90 pivot left'; parts.push(l); len += l.length + 1; n++; }
const text = parts.join('\n');
let t = performance.now();
const r = checkPlan(text);
console.log(text.length, n, (performance.now() - t).toFixed(0), 'ms', r.diagnostics.length);
t = performance.now();
const r2 = checkPlan('x'.repeat(13_000_000));
console.log((performance.now() - t).toFixed(0), 'ms', r2.diagnostics[0].message);
