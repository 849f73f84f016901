import { checkPlan, fewestResets } from './src/core';
const base = (extra: string) => `wheel 56\ntrack 160\n${extra}`;
function show(t: string) { const r = checkPlan(t); console.log('---'); for (const d of r.diagnostics) console.log('  D', d.range.start.line, d.range.start.character, d.range.end.character, d.code, d.message.slice(0,80), JSON.stringify(d.fixes?.map(f=>f.edits))); for (const s of r.runs[0]?.segments ?? []) if (s.kind!=='start') console.log(JSON.stringify({k:s.kind, l:s.line, t:s.turned, ys:s.yawStart, ye:s.yawEnd, yt:s.yawTarget})); return r; }
show(base('start (500,500) heading 0\nturn 120 by gyro\nturn 120 by gyro\nturn 120 by gyro reset'));
show('yaw range 0 to 360\n'+base('start (500,500) heading 0\nturn -30 by gyro\nturn to 300\nturn to 10'));
show(base('start (500,500) heading 0\nturn to 178\nturn to -170\ndrive 100 hold 179\ndrive 100 hold 200\ndrive 100 hold 170 step'));
const r = show(base('start (500,500) heading 0\nturn 150 by gyro\nturn 100 by gyro\nturn 100 by gyro\nturn 100 by gyro\ndrive 10 hold 90'));
console.log(JSON.stringify(fewestResets(r)));
