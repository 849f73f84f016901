// Redraws docs/demo.png, the README's picture of the demo plan: the same SVG
// `veer render` writes, photographed by Debian's Chromium (playwright-core).
//   npm run demo:picture
import { readFileSync, writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { chromium } from 'playwright-core';
import { checkPlan, renderSvg } from '../src/core';

async function main(): Promise<void> {
  const root = join(__dirname, '..');
  const plan = readFileSync(join(root, 'examples', 'parcel-table.veer'), 'utf8');
  const svg = renderSvg(checkPlan(plan, { fileName: 'parcel-table.veer' }), { standalone: true });
  const browser = await chromium.launch({ executablePath: process.env.CHROMIUM ?? '/usr/bin/chromium', args: ['--no-sandbox'] });
  try {
    const page = await browser.newPage({ viewport: { width: 1000, height: 1400 }, deviceScaleFactor: 1 });
    await page.setContent(`<!DOCTYPE html><html><body style="margin:0;background:#fff">${svg.replace(/^<\?xml[^>]*>\s*/, '')}</body></html>`);
    const box = await page.locator('svg').first().boundingBox();
    if (!box) throw new Error('the drawing has no size');
    const png = await page.screenshot({ clip: { x: 0, y: 0, width: Math.ceil(box.width), height: Math.ceil(box.height) } });
    writeFileSync(join(root, 'docs', 'demo.png'), png);
    console.log(`wrote docs/demo.png (${Math.ceil(box.width)} × ${Math.ceil(box.height)})`);
  } finally {
    await browser.close();
  }
}

void main();
