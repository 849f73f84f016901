// Redraws docs/recorded-run.png, the README's picture of a recorded run laid
// over the demo plan: the same SVG `veer render examples/parcel-table.veer
// --log examples/parcel-table.log.csv` writes, photographed by Debian's
// Chromium (playwright-core).
//   node --import tsx scripts/recorded-picture.ts
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { checkPlan, renderSvg } from '../src/core';
import { replayLog } from '../src/core/record/compare';
import { writePicture } from './picture';

const root = join(__dirname, '..');
const plan = readFileSync(join(root, 'examples', 'parcel-table.veer'), 'utf8');
const log = readFileSync(join(root, 'examples', 'parcel-table.log.csv'), 'utf8');
const result = checkPlan(plan, { fileName: 'parcel-table.veer' });
const { overlay } = replayLog(result, log, 'parcel-table.log.csv');
void writePicture(renderSvg(result, { standalone: true, recorded: overlay }), 'docs/recorded-run.png');
