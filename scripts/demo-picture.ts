// Redraws docs/demo.png, the README's picture of the demo plan: the same SVG
// `veer render` writes, photographed by Debian's Chromium (playwright-core).
//   npm run demo:picture
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import { checkPlan, renderSvg } from '../src/core';
import { writePicture } from './picture';

const plan = readFileSync(join(__dirname, '..', 'examples', 'parcel-table.veer'), 'utf8');
void writePicture(renderSvg(checkPlan(plan, { fileName: 'parcel-table.veer' }), { standalone: true }), 'docs/demo.png');
