import { readFileSync } from 'node:fs';
import { checkPlan } from './src/core';
for (const f of process.argv.slice(2)) { console.log("==", f); const r = checkPlan(readFileSync(f, "utf8"));
for (const d of r.diagnostics) console.log(`D ${d.range.start.line+1}:${d.range.start.character} ${d.severity} ${d.code}: ${d.message}`);
for (const run of r.runs) { console.log('RUN', run.name, run.duration.toFixed(3), run.distance.toFixed(3)); for (const s of run.segments) console.log(`  ${s.line+1} ${s.kind} ${s.shape??''} end=(${s.end.x.toFixed(3)}, ${s.end.y.toFixed(3)}, ${s.end.heading}) yaw ${s.yawStart}->${s.yawEnd} t=${s.yawTarget} w=${s.wheelDeg?.left.toFixed(3)},${s.wheelDeg?.right.toFixed(3)} m=${s.motorDeg?.left.toFixed(3)},${s.motorDeg?.right.toFixed(3)} d=${s.duration.toFixed(3)}`); } }
