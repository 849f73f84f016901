import { checkPlan } from './src/core';
const base = (extra: string) => `wheel 56\ntrack 160 effective 162.4\n${extra}`;
function show(t: string) { const r = checkPlan(t); for (const d of r.diagnostics) console.log('  D', d.range.start.line, d.code, d.message.slice(0,100)); for (const s of r.runs[0]?.segments ?? []) if (s.kind!=='start') console.log(JSON.stringify({k:s.kind, sh:s.shape, end:s.end, c:s.center, w:s.wheelDeg, m:s.motorDeg, r:s.radius, t:s.turned, ys:s.yawStart, ye:s.yawEnd, yt:s.yawTarget, dur:s.duration})); }
show(base('start (500,500) heading 0\nturn 90\nturn 90 pivot left\nturn 90 pivot right'));
show('turns counterclockwise\n' + base('start (500,500) heading 0\nturn 90 arc 200\nturn 90 arc 200 reverse\nturn -90 ratio 50%\ndrive 100'));
show(base('gear 3\nstart (500,500) heading 90\ndrive 100\nturn 90\nsquare front'));
