// The preview's spread toggle and the Monte Carlo cloud, in real headless
// Chromium, fed render messages made by the real core as the extension host
// makes them (renderSvg with the spread choice and the cloud).
import assert from 'assert';
import { chromium, type Browser } from 'playwright-core';
import { mkdirSync } from 'node:fs';
import { checkPlan, renderSvg, targetTables } from '../../src/core';
import { sampleCloud, type SpreadCloud, type SpreadShown } from '../../src/core/render/cloud';
import { buildTimeline } from '../../src/core/sim/view';
import { buildRenderMessage, type RenderMessage } from '../../src/shared/messages';
import { fixture, openStandIn, type StandIn } from './standInHost';

const CHROMIUM_ARGS = ['--no-sandbox', '--disable-gpu', '--disable-background-networking', '--no-first-run',
  '--disable-component-update', '--disable-sync'];
const URI = 'file:///work/plans/seed-trays.veer';
const PLAN = fixture('seed-trays.veer');
// 0-based line of the mark in fixtures/seed-trays.veer, read off the file.
const LINE_MARK = 17;

/** The render message the host sends with this spread choice and cloud (src/extension/preview.ts, renderNow). */
function renderWith(version: number, spread: SpreadShown, cloud?: SpreadCloud): RenderMessage {
  const result = checkPlan(PLAN, { fileName: 'seed-trays.veer' });
  const svg = renderSvg(result, { standalone: false, spread, ...(cloud ? { cloud } : {}) });
  const message = buildRenderMessage(result, { uri: URI, version }, -1, svg, targetTables(result, PLAN), 1000, buildTimeline(result, -1));
  message.spread = spread;
  if (cloud) message.cloud = { count: cloud.count, dots: cloud.spots.reduce((n, s) => n + s.x.length, 0), id: version };
  return message;
}

describe('path preview: the spread and the sampled cloud (Chromium)', function () {
  let browser: Browser;
  let host: StandIn;

  before(async () => {
    browser = await chromium.launch({ executablePath: '/usr/bin/chromium', args: CHROMIUM_ARGS });
    mkdirSync('test-output', { recursive: true });
  });
  after(async () => browser?.close());
  afterEach(async () => host?.page.context().close());

  async function shown(message: RenderMessage, initialState?: unknown): Promise<StandIn> {
    if (!host || host.page.isClosed()) host = await openStandIn(browser, initialState);
    await host.send(message);
    await host.page.waitForFunction((v) => document.body.dataset.version === String(v), message.version);
    return host;
  }

  it('offers "Spread: marks / every motion / off" in the toolbar, on marks at first; a choice is posted and remembered', async () => {
    host = await openStandIn(browser);
    await shown(renderWith(1, 'marks'));
    const select = host.page.locator('.toolbar select.spread-select');
    assert.deepStrictEqual(await select.locator('option').allTextContents(), ['Spread: marks', 'Spread: every motion', 'Spread: off']);
    assert.strictEqual(await select.inputValue(), 'marks');
    assert.strictEqual(await host.page.locator('svg.drawing .mark ellipse.spread').count(), 1);
    assert.strictEqual(await host.page.locator('svg.drawing .spread-end').count(), 0);

    await select.selectOption('all');
    const posted = await host.waitForPosted('setSpread');
    assert.deepStrictEqual(posted, { type: 'setSpread', uri: URI, version: 1, spread: 'all' });
    // The host answers with a drawing made with the choice.
    await shown(renderWith(2, 'all'));
    assert.ok(await host.page.locator('svg.drawing .spread-end').count() >= 2);
    assert.strictEqual(await host.page.locator('svg.drawing .heading-band').count(), await host.page.locator('svg.drawing ellipse.spread').count());
    await host.page.screenshot({ path: 'test-output/preview-spread-all.png' });
    const state = await host.page.evaluate(() => (window as unknown as { __state: { spread?: string } }).__state);
    assert.strictEqual(state.spread, 'all');
    assert.deepStrictEqual(host.errors, []);
  });

  it('after a reload, says its remembered choice in the ready message and shows it', async () => {
    host = await openStandIn(browser, { uri: URI, version: 2, run: -1, spread: 'off' });
    const ready = await host.waitForPosted('ready');
    assert.deepStrictEqual(ready, { type: 'ready', uri: URI, version: 2, spread: 'off' });
    assert.strictEqual(await host.page.locator('select.spread-select').inputValue(), 'off');
    await shown(renderWith(3, 'off'));
    assert.strictEqual(await host.page.locator('svg.drawing .spread, svg.drawing .heading-band').count(), 0);
  });

  it('draws the cloud of sampled end points, says so in the toolbar, and tells the host how many dots it shows', async () => {
    host = await openStandIn(browser);
    const result = checkPlan(PLAN, { fileName: 'seed-trays.veer' });
    const cloud = sampleCloud(result, 1000, 1);
    const message = renderWith(4, 'marks', cloud);
    await shown(message);
    const dots = await host.page.$$eval('svg.drawing .cloud path', (paths) => paths.reduce((n, p) => n + (p.getAttribute('d')?.match(/M/g) ?? []).length, 0));
    // Two places (the mark, and the run's end 150 mm on), 1,000 samples drawn at each.
    assert.deepStrictEqual(cloud.spots.map((s) => s.kind), ['mark', 'end']);
    assert.strictEqual(dots, 2000);
    const said = await host.waitForPosted('cloudShown');
    assert.deepStrictEqual(said, { type: 'cloudShown', uri: URI, version: 4, id: 4, dots: 2000 });
    assert.strictEqual(await host.page.locator('.toolbar .cloud-note').textContent(), '1,000 sampled runs');
    // The sampled share sits under the mark's name, beside the linear model's chance.
    const share = cloud.spots.find((s) => s.line === LINE_MARK)!.share!;
    const label = await host.page.locator('svg.drawing .mark .sampled-share').textContent();
    assert.strictEqual(label, `sampled ${share > 0.995 && share < 1 ? '> 99' : Math.round(share * 100)} %`);
    // The dots are drawn, not clicked: the pointer reaches what lies beneath.
    const cloudHit = await host.page.evaluate(() => {
      const path = document.querySelector('svg.drawing .cloud path') as SVGPathElement;
      const box = path.getBoundingClientRect();
      return document.elementsFromPoint(box.x + box.width / 2, box.y + box.height / 2).some((e) => e.closest('.cloud'));
    });
    assert.strictEqual(cloudHit, false);
    // The dots are semi-transparent, in the run's colour.
    const style = await host.page.$eval('svg.drawing .cloud path', (p) => ({ opacity: getComputedStyle(p).strokeOpacity, colour: getComputedStyle(p).stroke }));
    assert.strictEqual(style.opacity, '0.35');
    const runColour = await host.page.$eval('svg.drawing .path.run-0', (g) => getComputedStyle(g).color);
    assert.strictEqual(style.colour, runColour);
    await host.page.screenshot({ path: 'test-output/preview-cloud.png' });
    const mark = (await host.page.locator('svg.drawing .mark path').first().boundingBox())!;
    await host.page.mouse.move(mark.x + mark.width / 2, mark.y + mark.height / 2);
    await host.page.mouse.wheel(0, -900);
    await host.page.waitForFunction(() => !document.body.classList.contains('is-fitted'));
    await host.page.screenshot({ path: 'test-output/preview-cloud-zoomed.png' });
    // In a dark theme the dots take the run's dark-theme colour.
    await host.setTheme('vscode-dark');
    assert.strictEqual(await host.page.$eval('svg.drawing .cloud path', (p) => getComputedStyle(p).stroke),
      await host.page.$eval('svg.drawing .path.run-0', (g) => getComputedStyle(g).color));
    await host.page.screenshot({ path: 'test-output/preview-cloud-dark.png' });

    // The next edit's drawing comes without the cloud: the dots and the note go.
    await shown(renderWith(5, 'marks'));
    assert.strictEqual(await host.page.locator('svg.drawing .cloud').count(), 0);
    assert.strictEqual(await host.page.locator('.toolbar .cloud-note').isHidden(), true);
    assert.deepStrictEqual(host.errors, []);
  });
});
