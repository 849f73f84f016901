// The preview's webview script in real headless Chromium, fed render messages
// made by the real core from fixture plans.
import assert from 'assert';
import { chromium, type Browser } from 'playwright-core';
import { readdirSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { checkPlan } from '../../src/core';
import { summariseSegments, type RenderMessage } from '../../src/shared/messages';
import { fixture, openStandIn, renderFor, type StandIn } from './standInHost';
import { TARGET_COLUMNS } from '../../src/core/targets';

const CHROMIUM_ARGS = ['--no-sandbox', '--disable-gpu', '--disable-background-networking', '--no-first-run',
  '--disable-component-update', '--disable-sync'];
const URI = 'file:///work/plans/greenhouse.veer';
const PLAN = fixture('greenhouse.veer');
// 0-based lines of fixtures/greenhouse.veer, read off the file.
const LINE_BOX = 6;
const LINE_FIRST_DRIVE = 11;
const LINE_SPIN = 12;

type Win = Window & { __posted: unknown[]; __state: unknown; __pwned?: unknown };

describe('path preview webview (Chromium)', function () {
  let browser: Browser;
  let host: StandIn;

  before(async function () {
    browser = await chromium.launch({ executablePath: '/usr/bin/chromium', args: CHROMIUM_ARGS });
  });
  after(async () => browser?.close());
  afterEach(async () => host?.page.context().close());

  async function rendered(message: RenderMessage, initialState?: unknown): Promise<StandIn> {
    host = await openStandIn(browser, initialState);
    await host.send(message);
    await host.page.waitForFunction((v) => document.body.dataset.version === String(v), message.version);
    return host;
  }

  it('says it is ready with the document it had before a reload (none at first)', async () => {
    host = await openStandIn(browser);
    const ready = await host.waitForPosted('ready');
    assert.deepStrictEqual(ready, { type: 'ready', uri: '', version: -1 });
  });

  it('draws every segment the core computed, with the ids of the render message', async () => {
    const message = renderFor(PLAN, URI, 1);
    await rendered(message);
    const drawn = await host.page.$$eval('svg.drawing [data-segment]', (els) => [...new Set(els.map((e) => e.getAttribute('data-segment')))]);
    const expected = message.segments.map((s) => s.id);
    assert.deepStrictEqual([...drawn].sort(), [...expected].sort());
    assert.strictEqual(await host.page.locator('svg.drawing').count(), 1);
    assert.deepStrictEqual(host.errors, []);
  });

  it('highlights the segment on the cursor line and moves with the cursor', async () => {
    await rendered(renderFor(PLAN, URI, 1));
    await host.send({ type: 'cursor', uri: URI, version: 1, line: LINE_FIRST_DRIVE });
    await host.page.waitForSelector(`path.seg.is-current[data-line="${LINE_FIRST_DRIVE}"]`);
    await host.send({ type: 'cursor', uri: URI, version: 1, line: LINE_BOX });
    await host.page.waitForSelector(`.obstacle.is-current[data-line="${LINE_BOX}"]`);
    const lines = await host.page.$$eval('.is-current', (els) => [...new Set(els.map((e) => e.getAttribute('data-line')))]);
    assert.deepStrictEqual(lines, [String(LINE_BOX)]);
  });

  it('ignores a cursor message for another document or an older version', async () => {
    await rendered(renderFor(PLAN, URI, 3));
    await host.send({ type: 'cursor', uri: 'file:///other.veer', version: 3, line: LINE_FIRST_DRIVE });
    await host.send({ type: 'cursor', uri: URI, version: 2, line: LINE_FIRST_DRIVE });
    // A current message after them: once it shows, the earlier two have been handled.
    await host.send({ type: 'cursor', uri: URI, version: 3, line: LINE_SPIN });
    await host.page.waitForSelector(`.is-current[data-line="${LINE_SPIN}"]`);
    assert.strictEqual(await host.page.locator(`.is-current[data-line="${LINE_FIRST_DRIVE}"]`).count(), 0);
  });

  it('drops a render of an older version of the same document', async () => {
    await rendered(renderFor(PLAN, URI, 5));
    const before = await host.page.$eval('svg.drawing', (el) => el.outerHTML);
    const older = renderFor(PLAN.replace('drive 300', 'drive 600'), URI, 4);
    await host.send(older);
    await host.send({ type: 'cursor', uri: URI, version: 5, line: LINE_SPIN });
    await host.page.waitForSelector(`.is-current[data-line="${LINE_SPIN}"]`);
    assert.strictEqual(await host.page.evaluate(() => document.body.dataset.version), '5');
    const after = await host.page.$eval('svg.drawing', (el) => { el.querySelectorAll('.is-current').forEach((e) => e.classList.remove('is-current')); return el.outerHTML; });
    assert.strictEqual(after, before);
  });

  it('posts a reveal of the right line when a segment is clicked', async () => {
    await rendered(renderFor(PLAN, URI, 7));
    await host.page.locator(`path.seg[data-line="${LINE_FIRST_DRIVE}"]`).click();
    const reveal = await host.waitForPosted('reveal');
    assert.deepStrictEqual(reveal, { type: 'reveal', uri: URI, version: 7, line: LINE_FIRST_DRIVE });
  });

  it('shows the segment numbers from the render message on hover', async () => {
    const message = renderFor(PLAN, URI, 1);
    await rendered(message);
    await host.page.locator(`path.seg[data-line="${LINE_FIRST_DRIVE}"]`).hover();
    const tooltip = host.page.locator('.tooltip');
    await tooltip.waitFor({ state: 'visible' });
    const seg = message.segments.find((s) => s.line === LINE_FIRST_DRIVE && s.kind === 'drive');
    assert.ok(seg);
    const text = await tooltip.innerText();
    assert.match(text, new RegExp(`line ${LINE_FIRST_DRIVE + 1}: drive`));
    // Formatting of the core's own numbers, not new values.
    // The same rounding as every other surface: up to two decimals of a second, one of a millimetre, no trailing zeros.
    const trim = (v: number, digits: number) => String(Number(v.toFixed(digits)));
    assert.ok(text.includes(`time ${trim(seg.duration, 2)} s`), text);
    assert.ok(text.includes(`(${trim(seg.endX, 1)}, ${trim(seg.endY, 1)}) mm`), text);
  });

  it('zooms with the wheel, pans with a drag (which is not a click), and fits again', async () => {
    await rendered(renderFor(PLAN, URI, 1));
    const viewBox = () => host.page.$eval('svg.drawing', (el) => el.getAttribute('viewBox')!.split(' ').map(Number));
    const fitted = await viewBox();
    const box = (await host.page.locator('.stage').boundingBox())!;
    await host.page.mouse.move(box.x + box.width / 2, box.y + box.height / 2);
    await host.page.mouse.wheel(0, -400);
    await host.page.waitForFunction((w) => Number(document.querySelector('svg.drawing')!.getAttribute('viewBox')!.split(' ')[2]) < w, fitted[2]);
    const zoomed = await viewBox();
    assert.ok(zoomed[2] < fitted[2] && zoomed[3] < fitted[3], `zoomed ${zoomed} fitted ${fitted}`);
    // Width and height shrink by the same factor: the aspect ratio is kept.
    assert.ok(Math.abs(zoomed[2] / zoomed[3] - fitted[2] / fitted[3]) < 1e-6);

    await host.page.mouse.down();
    await host.page.mouse.move(box.x + box.width / 2 + 120, box.y + box.height / 2 + 40, { steps: 6 });
    await host.page.mouse.up();
    const panned = await viewBox();
    assert.ok(panned[0] < zoomed[0] && panned[1] < zoomed[1], `dragging right and down shows more of the left and top: ${panned} vs ${zoomed}`);
    assert.strictEqual(panned[2], zoomed[2]);

    const state = await host.page.evaluate(() => (window as unknown as Win).__state as { view?: { x: number } });
    assert.strictEqual(state.view?.x, panned[0]);

    await host.page.getByRole('button', { name: 'Fit' }).click();
    assert.deepStrictEqual(await viewBox(), fitted);
    assert.strictEqual((await host.posted()).filter((m) => m.type === 'reveal').length, 0);
  });

  it('restores the zoom it saved before a reload', async () => {
    const saved = { uri: URI, version: 2, run: -1, view: { x: 100, y: 150, width: 600, height: 400 } };
    host = await openStandIn(browser, saved);
    assert.deepStrictEqual(await host.waitForPosted('ready'), { type: 'ready', uri: URI, version: 2 });
    await host.send(renderFor(PLAN, URI, 2));
    await host.page.waitForFunction(() => document.body.dataset.version === '2');
    assert.strictEqual(await host.page.$eval('svg.drawing', (el) => el.getAttribute('viewBox')), '100 150 600 400');
  });

  it('offers a run selector for a plan with several runs', async () => {
    const message = renderFor(PLAN, URI, 1);
    await rendered(message);
    const select = host.page.locator('select.run-select');
    await select.waitFor({ state: 'visible' });
    assert.deepStrictEqual(await select.locator('option').allTextContents(), ['All runs', ...message.runNames]);
    await select.selectOption('1');
    assert.deepStrictEqual(await host.waitForPosted('selectRun'), { type: 'selectRun', uri: URI, version: 1, run: 1 });
  });

  it('hides the run selector for a single run', async () => {
    await rendered(renderFor(PLAN.split('\nrun "back home"')[0]!, URI, 1));
    assert.strictEqual(await host.page.locator('select.run-select').isHidden(), true);
  });

  it('takes its colours from the editor theme', async () => {
    await rendered(renderFor(PLAN, URI, 1));
    await host.send({ type: 'cursor', uri: URI, version: 1, line: LINE_SPIN });
    await host.page.waitForSelector('.is-current');
    const colours = () => host.page.evaluate(() => ({
      background: getComputedStyle(document.body).backgroundColor,
      path: getComputedStyle(document.querySelector('.path.run-0 .seg:not(.is-current)')!).stroke,
      current: getComputedStyle(document.querySelector('.seg.is-current')!).stroke,
      width: parseFloat(getComputedStyle(document.querySelector('.path.run-0 .seg:not(.is-current)')!).strokeWidth),
    }));
    await host.setTheme('vscode-light');
    const light = await colours();
    // Expected colours: the stand-in host's theme variables (standInHost.ts THEMES).
    assert.deepStrictEqual([light.background, light.path, light.current], ['rgb(255, 255, 255)', 'rgb(26, 133, 255)', 'rgb(209, 134, 22)']);
    await host.setTheme('vscode-dark');
    const dark = await colours();
    assert.deepStrictEqual([dark.background, dark.path, dark.current], ['rgb(31, 31, 31)', 'rgb(55, 148, 255)', 'rgb(224, 145, 58)']);
    await host.setTheme('vscode-high-contrast');
    const contrast = await colours();
    assert.deepStrictEqual([contrast.background, contrast.current], ['rgb(0, 0, 0)', 'rgb(243, 133, 24)']);
    assert.ok(contrast.width > dark.width, `high contrast draws thicker paths: ${contrast.width} vs ${dark.width}`);
  });

  it('shows markup in plan names as text and never runs it', async () => {
    const uri = 'file:///work/plans/hostile.veer';
    const message = renderFor(fixture('hostile-names.veer'), uri, 1);
    await rendered(message);
    await host.send({ type: 'cursor', uri, version: 1, line: 5 });
    await host.page.waitForSelector('.is-current');
    const page = host.page;
    assert.strictEqual(await page.evaluate(() => (window as unknown as Win).__pwned), undefined);
    assert.strictEqual(await page.locator('img, iframe, foreignObject').count(), 0);
    const scripts = await page.$$eval('script', (els) => els.map((e) => (e as HTMLScriptElement).src));
    assert.deepStrictEqual(scripts, ['https://veer-preview.test/host.js', 'https://veer-preview.test/media/preview.js']);
    const labels = await page.$$eval('svg.drawing .label', (els) => els.map((e) => e.textContent));
    assert.ok(labels.includes('<img src=x onerror=window.__pwned=1>'), labels.join(' | '));
    assert.ok(labels.includes('<script>window.__pwned=2</script>'), labels.join(' | '));
    assert.deepStrictEqual(await page.locator('select.run-select option').allTextContents(), ['All runs', ...message.runNames]);
    await page.locator('.seg').first().hover();
    await page.locator('.tooltip').waitFor({ state: 'visible' });
    assert.strictEqual(await page.evaluate(() => (window as unknown as Win).__pwned), undefined);
  });

  it('strips script, handlers and foreign content even from a hostile SVG', async () => {
    const hostile = `<svg xmlns="http://www.w3.org/2000/svg" xmlns:xlink="http://www.w3.org/1999/xlink" viewBox="0 0 100 100">
<script>window.__pwned = 'script'</script>
<image href="x" onerror="window.__pwned = 'image'" width="5" height="5"/>
<path class="seg seg-drive" data-line="1" data-segment="0:0" d="M10 10L90 90" stroke="currentColor" stroke-width="8" onclick="window.__pwned = 'click'" onmouseover="window.__pwned = 'hover'"/>
<foreignObject width="50" height="50"><img xmlns="http://www.w3.org/1999/xhtml" src="x" onerror="window.__pwned = 'foreign'"/></foreignObject>
<a xlink:href="javascript:window.__pwned = 'link'"><rect class="obstacle" data-line="2" x="60" y="5" width="30" height="20"/></a>
<style>@import url(https://example.invalid/x.css);</style>
<set attributeName="onmouseover" to="window.__pwned = 'set'"/>
</svg>`;
    const base = renderFor(PLAN, URI, 1);
    await rendered({ ...base, svg: hostile, segments: [] });
    const page = host.page;
    const found = await page.$$eval('svg.drawing, svg.drawing *', (els) => ({
      names: els.map((e) => e.localName),
      handlers: els.flatMap((e) => Array.from(e.attributes).filter((a) => a.name.toLowerCase().startsWith('on')).map((a) => a.name)),
      links: els.flatMap((e) => Array.from(e.attributes).filter((a) => a.localName === 'href').map((a) => a.value)),
    }));
    for (const name of ['script', 'foreignObject', 'img', 'style']) assert.ok(!found.names.includes(name), `${name} in ${found.names}`);
    assert.deepStrictEqual(found.handlers, []);
    assert.deepStrictEqual(found.links, []);
    await page.locator('path.seg').click();
    assert.deepStrictEqual(await host.waitForPosted('reveal'), { type: 'reveal', uri: URI, version: 1, line: 1 });
    assert.strictEqual(await page.evaluate(() => (window as unknown as Win).__pwned), undefined);
  });

  it('a forged render message with HTML inside an SVG title (a refresh, a form) changes nothing on the page', async () => {
    const forged = `<svg xmlns="http://www.w3.org/2000/svg" viewBox="0 0 100 100"><title><meta http-equiv="refresh" content="0;url=https://example.invalid/">
<form action="https://example.invalid/" id="forged-form"><input name="q" value="x"><button id="forged-button">Go</button></form></title>
<g><title>plain <b>markup</b></title>
<path class="seg seg-drive" data-line="1" data-segment="0:0" d="M10 10L90 90" stroke="currentColor" stroke-width="8"/></g></svg>`;
    const base = renderFor(PLAN, URI, 1);
    await rendered({ ...base, svg: forged, segments: [] });
    const page = host.page;
    assert.strictEqual(await page.locator('meta[http-equiv="refresh"], form, input[name="q"], button#forged-button, b').count(), 0);
    // The drawing itself is kept and still works.
    await page.locator('path.seg').click();
    assert.deepStrictEqual(await host.waitForPosted('reveal'), { type: 'reveal', uri: URI, version: 1, line: 1 });
    // The page's policy forbids forms, frames and a base URL whatever slips through.
    const policy = await page.$eval('meta[http-equiv="Content-Security-Policy"]', (m) => m.getAttribute('content'));
    for (const rule of ["form-action 'none'", "frame-src 'none'", "base-uri 'none'"]) assert.ok(policy!.includes(rule), policy!);
    assert.ok(page.url().startsWith('https://veer-preview.test/'), page.url());
  });

  it('shows the targets table on its tab: a row per motion, linked to the plan lines both ways, and copy buttons', async () => {
    const message = renderFor(PLAN, URI, 1);
    await rendered(message);
    const page = host.page;
    await page.getByRole('tab', { name: 'Targets' }).click();
    assert.ok(await page.locator('svg.drawing').isHidden());
    const rows = page.locator('.targets tbody tr');
    const expectedRows = message.targets.reduce((n, t) => n + t.rows.length, 0);
    assert.ok(expectedRows >= 3);
    assert.strictEqual(await rows.count(), expectedRows);
    // The first drive's row shows its line (1-based), its text and its wheel degrees, as the core computed them.
    const drive = message.targets[0].rows.find((r) => r.line === LINE_FIRST_DRIVE + 1)!;
    const row = page.locator(`.targets tr[data-line="${LINE_FIRST_DRIVE}"]`);
    const cells = await row.locator('td').allTextContents();
    assert.strictEqual(cells[0], String(LINE_FIRST_DRIVE + 1));
    assert.strictEqual(cells[1], drive.motion);
    const wheelColumn = TARGET_COLUMNS.findIndex((c) => c.key === 'left_wheel_deg');
    assert.strictEqual(Number(cells[wheelColumn]), Math.round(drive.left_wheel_deg! * 10) / 10);
    // Cursor to row, and row to plan line.
    await host.send({ type: 'cursor', uri: URI, version: 1, line: LINE_SPIN });
    await page.waitForSelector(`.targets tr.is-current[data-line="${LINE_SPIN}"]`);
    await row.click();
    assert.deepStrictEqual(await host.waitForPosted('reveal'), { type: 'reveal', uri: URI, version: 1, line: LINE_FIRST_DRIVE });
    await page.getByRole('button', { name: 'Copy CSV' }).click();
    assert.deepStrictEqual(await host.waitForPosted('copyTargets'), { type: 'copyTargets', uri: URI, version: 1, format: 'csv' });
    // The tab is remembered across a reload.
    assert.strictEqual((await page.evaluate(() => (window as unknown as Win).__state) as { tab?: string }).tab, 'targets');
    await page.screenshot({ path: 'test-output/preview-targets.png' });
  });

  it('says what a problem marker is about when the pointer is on it', async () => {
    const wrapping = ['wheel 60 mm', 'track 130 mm', 'field 2000 by 2000', 'start (500, 500) heading 0', 'turn 90 by gyro', 'turn 90 by gyro'].join('\n');
    const message = renderFor(wrapping, URI, 1);
    await rendered(message);
    const page = host.page;
    const marker = page.locator('svg.drawing .marker').first();
    await marker.hover({ force: true });
    const tooltip = page.locator('.tooltip.is-problem');
    await tooltip.waitFor({ state: 'visible' });
    assert.match(await tooltip.innerText(), /never settles/);
  });

  it('draws a heading compass and reads out field coordinates under the pointer', async () => {
    await rendered(renderFor(PLAN, URI, 1));
    const page = host.page;
    assert.strictEqual(await page.locator('svg.drawing .compass').count(), 1);
    assert.match(await page.locator('svg.drawing .compass title').textContent() ?? '', /clockwise/);
    // The first run starts at (200, 200) (fixtures/greenhouse.veer): the read-out over its start dot says so.
    const dot = page.locator('svg.drawing .start circle').first();
    const box = (await dot.boundingBox())!;
    await page.mouse.move(box.x + box.width / 2, box.y + box.height / 2);
    const text = await page.locator('.readout').innerText();
    const [, x, y] = /x (-?\d+) mm, y (-?\d+) mm/.exec(text) ?? [];
    assert.ok(Math.abs(Number(x) - 200) <= 6 && Math.abs(Number(y) - 200) <= 6, text);
  });

  it('a click a few pixels off a thin path still finds it', async () => {
    await rendered(renderFor(PLAN, URI, 1));
    const page = host.page;
    const path = page.locator(`svg.drawing path.seg[data-line="${LINE_FIRST_DRIVE}"]`);
    const box = (await path.boundingBox())!;
    // The first drive runs straight up: 4 pixels to the side of its middle is off the stroke.
    await page.mouse.click(box.x + box.width / 2 + 4, box.y + box.height / 2);
    assert.deepStrictEqual(await host.waitForPosted('reveal'), { type: 'reveal', uri: URI, version: 1, line: LINE_FIRST_DRIVE });
  });

  it('keeps labels apart: no two label boxes overlap in the example and fixture plans', async () => {
    const dir = join(__dirname, '..', 'fixtures');
    const plans = [
      ...readdirSync(dir).filter((f) => f.endsWith('.veer')).map((f) => readFileSync(join(dir, f), 'utf8')),
      readFileSync(join(__dirname, '..', '..', 'examples', 'parcel-table.veer'), 'utf8'),
      PLAN,
    ];
    for (const [i, plan] of plans.entries()) {
      await rendered(renderFor(plan, URI, i + 1));
      const boxes = await host.page.$$eval('svg.drawing .label', (els) => els.map((e) => {
        const b = (e as SVGGraphicsElement).getBoundingClientRect();
        return { x0: b.left, y0: b.top, x1: b.right, y1: b.bottom, text: e.textContent };
      }));
      for (let a = 0; a < boxes.length; a++) {
        for (let b = a + 1; b < boxes.length; b++) {
          const p = boxes[a];
          const q = boxes[b];
          const overlap = Math.min(p.x1, q.x1) - Math.max(p.x0, q.x0) > 0.5 && Math.min(p.y1, q.y1) - Math.max(p.y0, q.y0) > 0.5;
          assert.ok(!overlap, `plan ${i}: "${p.text}" and "${q.text}" overlap`);
        }
      }
      await host.page.context().close();
    }
  });

  it('asks the host for a drawing sized for its panel, once', async () => {
    await rendered(renderFor(PLAN, URI, 1));
    const asked = await host.waitForPosted('viewSize');
    const width = await host.page.evaluate(() => document.querySelector('.stage')!.clientWidth);
    assert.strictEqual(asked.width, Math.round(width));
    // A drawing made for that width asks nothing more.
    await host.page.evaluate(() => { (window as unknown as Win).__posted.length = 0; });
    await host.send({ ...renderFor(PLAN, URI, 2), width: asked.width });
    await host.page.waitForFunction(() => document.body.dataset.version === '2');
    const posted = await host.page.evaluate(() => (window as unknown as Win).__posted as { type: string }[]);
    assert.deepStrictEqual(posted.filter((m) => m.type === 'viewSize'), []);
  });

  it('exports the same PNG with or without the cursor highlight', async () => {
    await rendered(renderFor(PLAN, URI, 1));
    const page = host.page;
    await page.getByRole('button', { name: 'PNG' }).click();
    const plain = (await host.waitForPosted('exportPng')).base64;
    await host.send({ type: 'cursor', uri: URI, version: 1, line: LINE_FIRST_DRIVE });
    await page.waitForSelector('.is-current');
    await page.evaluate(() => { (window as unknown as Win).__posted.length = 0; });
    await page.getByRole('button', { name: 'PNG' }).click();
    const highlighted = (await host.waitForPosted('exportPng')).base64;
    assert.ok(plain === highlighted, 'the exported image must not show the editor\'s cursor line');
    // The highlight is still on the page afterwards.
    assert.ok(await page.locator('.is-current').count() > 0);
  });

  it('exports a PNG of the drawing, rasterised in the page', async () => {
    await rendered(renderFor(PLAN, URI, 1));
    await host.page.getByRole('button', { name: 'PNG' }).click();
    const exported = await host.waitForPosted('exportPng');
    assert.strictEqual(exported.uri, URI);
    const bytes = Buffer.from(exported.base64, 'base64');
    // PNG signature and IHDR layout: PNG specification (W3C, 2nd edition), sections 5.2 and 11.2.2.
    assert.deepStrictEqual([...bytes.subarray(0, 8)], [0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]);
    const width = bytes.readUInt32BE(16);
    const height = bytes.readUInt32BE(20);
    // 2400: the long side the preview exports at (rasterise.ts; a design choice, no published source).
    assert.strictEqual(Math.max(width, height), 2400);
    // The picture is not blank: count pixels unlike the top-left (background) one.
    const painted = await host.page.evaluate(async (src) => {
      const img = new Image();
      img.src = src;
      await img.decode();
      const canvas = document.createElement('canvas');
      canvas.width = img.width;
      canvas.height = img.height;
      const ctx = canvas.getContext('2d')!;
      ctx.drawImage(img, 0, 0);
      const data = ctx.getImageData(0, 0, img.width, img.height).data;
      let count = 0;
      for (let i = 0; i < data.length; i += 4) {
        if (data[i] !== data[0] || data[i + 1] !== data[1] || data[i + 2] !== data[2]) count++;
      }
      return count;
    }, `data:image/png;base64,${exported.base64}`);
    assert.ok(painted > 10_000, `only ${painted} pixels drawn`);
  });

  it('asks the host for an SVG export of the document it shows', async () => {
    await rendered(renderFor(PLAN, URI, 4));
    await host.page.getByRole('button', { name: 'SVG' }).click();
    assert.deepStrictEqual(await host.waitForPosted('exportSvg'), { type: 'exportSvg', uri: URI, version: 4 });
  });

  it('builds tooltip data for every segment of every run', () => {
    const result = checkPlan(PLAN, { fileName: 'greenhouse.veer' });
    const summaries = summariseSegments(result.runs);
    assert.strictEqual(summaries.length, result.runs.reduce((n, r) => n + r.segments.length, 0));
    const spin = summaries.find((s) => s.line === LINE_SPIN)!;
    assert.strictEqual(spin.kind, 'turn');
    assert.strictEqual(spin.shape, 'spin');
    // A 90° turn from heading 0 under `turns clockwise` ends at heading 90 (spec section 2).
    assert.strictEqual(spin.endHeading, 90);
  });
});
