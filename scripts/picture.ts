// The README's pictures: a drawing as `veer render` writes it, photographed by
// Debian's Chromium (playwright-core) and written as a PNG.
import { writeFileSync } from 'node:fs';
import { join } from 'node:path';
import { chromium } from 'playwright-core';

/** Writes `svg` (a standalone drawing) as a PNG at `file`, relative to the repository; prints its size. */
export async function writePicture(svg: string, file: string): Promise<void> {
  const browser = await chromium.launch({ executablePath: process.env.CHROMIUM ?? '/usr/bin/chromium', args: ['--no-sandbox'] });
  try {
    const page = await browser.newPage({ viewport: { width: 1000, height: 1400 }, deviceScaleFactor: 1 });
    await page.setContent(`<!DOCTYPE html><html><body style="margin:0;background:#fff">${svg.replace(/^<\?xml[^>]*>\s*/, '')}</body></html>`);
    const box = await page.locator('svg').first().boundingBox();
    if (!box) throw new Error('the drawing has no size');
    const png = await page.screenshot({ clip: { x: 0, y: 0, width: Math.ceil(box.width), height: Math.ceil(box.height) } });
    writeFileSync(join(__dirname, '..', file), png);
    console.log(`wrote ${file} (${Math.ceil(box.width)} × ${Math.ceil(box.height)})`);
  } finally {
    await browser.close();
  }
}
