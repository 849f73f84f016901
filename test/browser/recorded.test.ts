// A recorded run laid over the plan in the preview, in real headless Chromium:
// the render message the extension host sends after "Veer: Overlay a Recorded
// Run" (renderSvg with the reconstructed paths of examples/parcel-table.log.csv),
// drawn through the preview's allow-list, and gone again once cleared.
import assert from 'assert';
import { chromium, type Browser } from 'playwright-core';
import { mkdirSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { checkPlan, renderSvg, targetTables } from '../../src/core';
import { replayLog, type RecordedOverlay } from '../../src/core/record/compare';
import { buildTimeline } from '../../src/core/sim/view';
import { buildRenderMessage, type RenderMessage } from '../../src/shared/messages';
import { openStandIn, type StandIn } from './standInHost';

const CHROMIUM_ARGS = ['--no-sandbox', '--disable-gpu', '--disable-background-networking', '--no-first-run',
  '--disable-component-update', '--disable-sync'];
const ROOT = join(__dirname, '..', '..');
const URI = 'file:///work/plans/parcel-table.veer';
const PLAN = readFileSync(join(ROOT, 'examples', 'parcel-table.veer'), 'utf8');
const LOG = readFileSync(join(ROOT, 'examples', 'parcel-table.log.csv'), 'utf8');

/** The render message of src/extension/preview.ts's renderNow, with or without the recorded run. */
function renderWith(version: number, recorded?: RecordedOverlay): RenderMessage {
  const result = checkPlan(PLAN, { fileName: 'parcel-table.veer' });
  const svg = renderSvg(result, { standalone: false, ...(recorded ? { recorded } : {}) });
  return buildRenderMessage(result, { uri: URI, version }, -1, svg, targetTables(result, PLAN), 1000, buildTimeline(result, -1));
}

describe('path preview: a recorded run laid over the plan (Chromium)', function () {
  let browser: Browser;
  let host: StandIn;
  const overlay = replayLog(checkPlan(PLAN, { fileName: 'parcel-table.veer' }), LOG, 'parcel-table.log.csv').overlay;

  before(async () => {
    browser = await chromium.launch({ executablePath: '/usr/bin/chromium', args: CHROMIUM_ARGS });
    mkdirSync('test-output', { recursive: true });
  });
  after(async () => browser?.close());
  afterEach(async () => host?.page.context().close());

  async function rendered(message: RenderMessage): Promise<StandIn> {
    host = await openStandIn(browser);
    await host.send(message);
    await host.page.waitForFunction((v) => document.body.dataset.version === String(v), message.version);
    return host;
  }

  it('draws the two reconstructed paths through the allow-list, ending where the reconstruction ends', async () => {
    await rendered(renderWith(1, overlay));
    const drawn = await host.page.evaluate(() => {
      const svg = document.querySelector('svg.drawing')!;
      const fused = svg.querySelector('g.recorded path.recorded-fused');
      const wheels = svg.querySelector('g.recorded path.recorded-wheels');
      const [a, b] = (svg.getAttribute('data-frame') ?? '0 0').split(' ').map(Number);
      const d = fused?.getAttribute('d') ?? '';
      const nums = d.replace(/[ML]/g, ' ').trim().split(/\s+/).map(Number);
      const box = fused ? (fused as SVGGraphicsElement).getBoundingClientRect() : undefined;
      return {
        points: nums.length / 2,
        // The last point back in field millimetres (data-frame: field x = user x + a, field y = b − user y).
        end: { x: nums[nums.length - 2] + a, y: b - nums[nums.length - 1] },
        dashed: wheels?.getAttribute('stroke-dasharray') ?? null,
        colour: fused ? getComputedStyle(fused).color : '',
        runColour: getComputedStyle(svg.querySelector('.path.run-0')!).color,
        width: box?.width ?? 0,
        height: box?.height ?? 0,
        label: svg.querySelector('g.recorded .recorded-label')?.textContent,
      };
    });
    assert.ok(drawn.points > 500, `${drawn.points} points`);
    const last = overlay.fused![overlay.fused!.length - 1];
    // The renderer writes coordinates to 0.01 of a user unit (a millimetre here).
    assert.ok(Math.abs(drawn.end.x - last.x) < 0.05 && Math.abs(drawn.end.y - last.y) < 0.05, `${JSON.stringify(drawn.end)} vs ${JSON.stringify(last)}`);
    assert.ok(drawn.dashed, 'the wheels-only path is dashed');
    // The stand-in page has no theme variables: the layer takes the stylesheet's fallback magenta (#c026d3), not a run's colour.
    assert.strictEqual(drawn.colour, 'rgb(192, 38, 211)');
    assert.notStrictEqual(drawn.colour, drawn.runColour);
    assert.ok(drawn.width > 100 && drawn.height > 50, `on screen ${drawn.width} × ${drawn.height} px`);
    assert.strictEqual(drawn.label, 'recorded');
    await host.page.locator('svg.drawing').screenshot({ path: 'test-output/recorded-overlay.png' });
    assert.deepStrictEqual(host.errors, []);
  });

  it('a drawing without the recorded run (after "Veer: Clear the Recorded Run") has no trace of it', async () => {
    await rendered(renderWith(1, overlay));
    assert.strictEqual(await host.page.locator('svg.drawing g.recorded').count(), 1);
    await host.send(renderWith(2));
    await host.page.waitForFunction(() => document.body.dataset.version === '2');
    assert.strictEqual(await host.page.locator('svg.drawing .recorded, svg.drawing .recorded-fused, svg.drawing .recorded-wheels').count(), 0);
    assert.deepStrictEqual(host.errors, []);
  });
});
