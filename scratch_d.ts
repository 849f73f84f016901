import { checkPlan } from './src/core';
const r = checkPlan('yaw range -180 to 180\nturns clockwise\nwheel 56\ntrack 160\nstart (5000, 5000) heading 0\nturn 0 by gyro reset');
console.log(r.diagnostics, r.runs[0].segments.map(s=>[s.line,s.kind,s.yawTarget]));
