import { readFileSync } from 'node:fs';
import { checkPlan, toJsonDocument } from './src/core';
const t = readFileSync(process.argv[2], 'utf8');
console.log(JSON.stringify(toJsonDocument('x', checkPlan(t)), null, 1));
