// Redraws docs/recorded-run.png, the README's picture of a recorded run laid
// over the demo plan: the same SVG `veer render examples/parcel-table.veer
// --log examples/parcel-table.log.csv` writes, photographed by Debian's
// Chromium (playwright-core).
//   node --import tsx scripts/recorded-picture.ts
import { readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { chromium } from 'playwright-core';
import { checkPlan, renderSvg } from '../src/core';
import { replayLog } from '../src/core/record/compare';

async function main(): Promise<void> {
  const root = join(__dirname, '..');
  const plan = readFileSync(join(root, 'examples', 'parcel-table.veer'), 'utf8');
  const log = readFileSync(join(root, 'examples', 'parcel-table.log.csv'), 'utf8');
  const result = checkPlan(plan, { fileName: 'parcel-table.veer' });
  const { overlay } = replayLog(result, log, 'parcel-table.log.csv');
  const svg = renderSvg(result, { standalone: true, recorded: overlay });
  const browser = await chromium.launch({ executablePath: process.env.CHROMIUM ?? '/usr/bin/chromium', args: ['--no-sandbox'] });
  try {
    const page = await browser.newPage({ viewport: { width: 1000, height: 1400 }, deviceScaleFactor: 1 });
    await page.setContent(`<!DOCTYPE html><html><body style="margin:0;background:#fff">${svg.replace(/^<\?xml[^>]*>\s*/, '')}</body></html>`);
    const box = await page.locator('svg').first().boundingBox();
    if (!box) throw new Error('the drawing has no size');
    const png = await page.screenshot({ clip: { x: 0, y: 0, width: Math.ceil(box.width), height: Math.ceil(box.height) } });
    writeFileSync(join(root, 'docs', 'recorded-run.png'), png);
    console.log(`wrote docs/recorded-run.png (${Math.ceil(box.width)} × ${Math.ceil(box.height)})`);
  } finally {
    await browser.close();
  }
}

void main();
