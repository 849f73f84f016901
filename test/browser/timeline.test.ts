// The preview's run timeline, scrubber and trace chart in real headless
// Chromium. The drawing is the real core's; the timelines and traces here are
// INVENTED demonstration data (hand-made numbers shaped like a gyro turn and a
// drive), so every expected number below can be worked out by hand from them.
import assert from 'assert';
import { chromium, type Browser } from 'playwright-core';
import type { RenderMessage, TimelineRun, TraceColumns, TraceMessage } from '../../src/shared/messages';
import { fixture, openStandIn, renderFor, traceFor, type StandIn, type StandInOptions } from './standInHost';

const CHROMIUM_ARGS = ['--no-sandbox', '--disable-gpu', '--disable-background-networking', '--no-first-run',
  '--disable-component-update', '--disable-sync'];
const URI = 'file:///work/plans/greenhouse.veer';
const PLAN = fixture('greenhouse.veer');
// 0-based lines of fixtures/greenhouse.veer's first run, read off the file.
const LINE_DRIVE_1 = 11; // drive 300
const LINE_SPIN = 12; // turn 90 by gyro
const LINE_DRIVE_2 = 13; // drive 500
const LINE_TURN_TO = 14; // turn to 45 by gyro

/**
 * An invented timeline of the first run: the drives and turns take 1.5, 1, 2.5
 * and 1 s (6 s in all) against a 5.5 s limit, so the last turn ends past it.
 * The poses follow the plan's own geometry: from (200, 200) heading 0, 300 mm
 * up to (200, 500), a spin to heading 90 (which faces +x under `turns
 * clockwise`, spec section 2), 500 mm to (700, 500), then a turn to 45.
 */
const TIMELINE: TimelineRun = {
  runIndex: 0,
  name: 'to the rack',
  total: 6,
  limit: 5.5,
  blocks: [
    { line: LINE_DRIVE_1, kind: 'drive', start: 0, duration: 1.5, label: 'drive 300 mm' },
    { line: LINE_SPIN, kind: 'turn', start: 1.5, duration: 1, label: 'turn 90° gyro', problem: 'warning' },
    { line: LINE_DRIVE_2, kind: 'drive', start: 2.5, duration: 2.5, label: 'drive 500 mm' },
    { line: LINE_TURN_TO, kind: 'turn', start: 5, duration: 1, label: 'turn to 45° gyro', problem: 'error' },
  ],
  poses: { t: [0, 1.5, 2.5, 5, 6], x: [200, 200, 200, 700, 700], y: [200, 500, 500, 500, 500], heading: [0, 0, 90, 90, 45] },
};
/** An invented body: 100 mm wide, 160 mm long, the axle 30 mm ahead of its centre. */
const BODY = { kind: 'rect' as const, width: 100, length: 160, axle: 30 };

/** The first run drawn alone, with the invented timeline (and the invented body when asked). */
function render(version: number, body = false): RenderMessage {
  return { ...renderFor(PLAN, URI, version, 0), timeline: [TIMELINE], ...(body ? { footprint: BODY } : {}) };
}

/**
 * An invented trace of `samples` points over 2 s: a first-order approach to
 * `target` (time constant 0.3 s), power proportional to the error, wheel
 * speeds following the power. Shapes only; no model is claimed.
 */
function trace(version: number, line: number, target: number, samples = 2000): TraceMessage {
  const c: TraceColumns = { t: [], reading: [], target: [], error: [], powerLeft: [], powerRight: [], speedLeft: [], speedRight: [] };
  for (let i = 0; i < samples; i++) {
    const t = (2 * i) / (samples - 1);
    const reading = target * (1 - Math.exp(-t / 0.3));
    const error = target - reading;
    const power = Math.max(-100, Math.min(100, 1.2 * error));
    c.t.push(t);
    c.reading.push(reading);
    c.target.push(target);
    c.error.push(error);
    c.powerLeft.push(power);
    c.powerRight.push(-power);
    c.speedLeft.push(power * 4);
    c.speedRight.push(-power * 4);
  }
  return { type: 'trace', uri: URI, version, line, title: `Line ${line + 1}: turn by gyro (invented trace to ${target}°)`, columns: c, stop: 2 };
}

type Win = Window & { __posted: { type: string; line?: number }[]; __state: unknown };

describe('run timeline, scrubber and trace chart (Chromium)', function () {
  let browser: Browser;
  let host: StandIn;

  before(async function () {
    browser = await chromium.launch({ executablePath: '/usr/bin/chromium', args: CHROMIUM_ARGS });
  });
  after(async () => browser?.close());
  afterEach(async () => host?.page.context().close());

  async function rendered(message: RenderMessage, options: StandInOptions = {}): Promise<StandIn> {
    host = await openStandIn(browser, undefined, options);
    await host.send(message);
    await host.page.waitForFunction((v) => document.body.dataset.version === String(v), message.version);
    return host;
  }

  async function traced(message: TraceMessage, shownBefore: number): Promise<void> {
    await host.send(message);
    await host.page.waitForFunction((n) => Number(document.querySelector<HTMLElement>('.trace')?.dataset.drawn ?? 0) > n, shownBefore);
  }

  /** The scrub lines posted so far, in order. */
  async function scrubLines(): Promise<number[]> {
    return (await host.posted()).filter((m) => m.type === 'scrub').map((m) => (m as { line: number }).line);
  }

  it('draws the three trace charts for a trace message and replaces their data with the next', async () => {
    await rendered(render(1));
    const first = trace(1, LINE_SPIN, 90);
    await traced(first, 0);
    const page = host.page;
    assert.strictEqual(await page.locator('.trace-title').innerText(), first.title);
    assert.strictEqual(await page.locator('.trace-charts .uplot').count(), 3);
    // Every series has its legend entry (the stop band's lower edge is only the band's edge).
    const labels = await page.$$eval('.trace-charts .u-legend .u-series:not(.band-low) .u-label', (els) => els.map((e) => e.textContent));
    assert.deepStrictEqual(labels, ['time s', 'reading', 'target', 'error', 'stop band', 'time s', 'left power', 'right power', 'time s', 'left speed', 'right speed']);

    // The reading is drawn: pixels of its colour (the theme's --veer-run-0, #1a85ff in the light stand-in theme) on the yaw canvas.
    const readingPixels = () => page.$eval('.trace-yaw canvas', (canvas) => {
      const c = canvas as HTMLCanvasElement;
      const data = c.getContext('2d')!.getImageData(0, 0, c.width, c.height).data;
      let n = 0;
      for (let i = 0; i < data.length; i += 4) if (Math.abs(data[i]! - 0x1a) < 8 && Math.abs(data[i + 1]! - 0x85) < 8 && Math.abs(data[i + 2]! - 0xff) < 8) n++;
      return n;
    });
    assert.ok(await readingPixels() > 100, 'the reading line is drawn');
    await page.screenshot({ path: 'test-output/preview-trace.png' });

    // The legend at the right edge of the plot shows the last sample: the message's own last numbers, at one decimal.
    const lastValues = async () => {
      const over = (await page.locator('.trace-yaw .u-over').boundingBox())!;
      await page.mouse.move(over.x + over.width - 1, over.y + over.height / 2);
      await page.mouse.move(over.x + over.width - 0.5, over.y + over.height / 2);
      return page.$$eval('.trace-yaw .u-legend .u-series .u-value', (els) => els.map((e) => e.textContent));
    };
    const last = first.columns!.reading.length - 1;
    let values = await lastValues();
    assert.strictEqual(values[1], first.columns!.reading[last]!.toFixed(1));

    const second = trace(1, LINE_TURN_TO, -45);
    await traced(second, 1);
    assert.strictEqual(await page.locator('.trace-title').innerText(), second.title);
    assert.strictEqual(await page.locator('.trace-charts .uplot').count(), 3, 'the same three charts, with new data');
    values = await lastValues();
    assert.strictEqual(values[1], second.columns!.reading[last]!.toFixed(1));
    assert.strictEqual(values[2], '-45.0');
    assert.deepStrictEqual(host.errors, []);
  });

  it('shows the note when the line has no simulated motion', async () => {
    await rendered(render(1));
    await traced(trace(1, LINE_SPIN, 90), 0);
    await traced({ type: 'trace', uri: URI, version: 1, line: 6, title: 'Line 7', note: 'No motion on this line: put the cursor on a drive or a turn.' }, 1);
    const page = host.page;
    assert.strictEqual(await page.locator('.trace-note').innerText(), 'No motion on this line: put the cursor on a drive or a turn.');
    assert.ok(await page.locator('.trace-charts').isHidden());
    assert.strictEqual(await page.locator('.trace-title').innerText(), 'Line 7');
  });

  it('drops a trace for another document or an older version', async () => {
    await rendered(render(3));
    await host.send({ ...trace(2, LINE_SPIN, 90), title: 'old' });
    await host.send({ ...trace(3, LINE_SPIN, 90), uri: 'file:///other.veer', title: 'other' });
    await traced(trace(3, LINE_DRIVE_2, 30), 0);
    assert.match(await host.page.locator('.trace-title').innerText(), /^Line 14:/);
  });

  it('sizes the timeline blocks by their time, marks the limit and what runs past it', async () => {
    await rendered(render(1));
    const page = host.page;
    const strip = (await page.locator('.timeline .strip').boundingBox())!;
    const blocks = await page.$$eval('.timeline .strip .block', (els) => els.map((e) => {
      const r = e.getBoundingClientRect();
      return { left: r.left, width: r.width, line: Number((e as HTMLElement).dataset.line), classes: e.className };
    }));
    // The axis spans 6 s (the run's total, longer than its 5.5 s limit): a block's width is its share of 6 s.
    const inner = strip.width - 2; // the strip's 1 px border on each side
    const expected = [1.5, 1, 2.5, 1].map((d) => (d / 6) * inner);
    blocks.forEach((b, i) => assert.ok(Math.abs(b.width - expected[i]!) < 1, `block ${i}: ${b.width} px, expected ${expected[i]} px`));
    assert.deepStrictEqual(blocks.map((b) => b.line), [LINE_DRIVE_1, LINE_SPIN, LINE_DRIVE_2, LINE_TURN_TO]);
    // The limit marker at 5.5 of 6 s.
    const marker = (await page.locator('.timeline .limit-marker').boundingBox())!;
    const markerCentre = marker.x + marker.width / 2;
    assert.ok(Math.abs(markerCentre - (strip.x + 1 + (5.5 / 6) * inner)) < 1.5, `limit marker at ${markerCentre}`);
    // Only the last turn (5 s to 6 s) ends past 5.5 s; problems are tinted by severity.
    assert.deepStrictEqual(blocks.map((b) => b.classes.includes('is-over')), [false, false, false, true]);
    assert.ok(blocks[1]!.classes.includes('problem-warning') && blocks[3]!.classes.includes('problem-error'));
    const tint = await page.$$eval('.timeline .strip .block', (els) => els.map((e) => getComputedStyle(e).backgroundColor));
    assert.notStrictEqual(tint[1], tint[0]);
    assert.notStrictEqual(tint[3], tint[1]);
    assert.match(await page.locator('.timeline .row-total').innerText(), /6 s · limit 5.5 s/);
    await page.screenshot({ path: 'test-output/preview-timeline.png' });
  });

  it('names a block and its time on hover, and reveals its line on a click', async () => {
    await rendered(render(4));
    const page = host.page;
    const block = page.locator(`.timeline .block[data-line="${LINE_SPIN}"]`);
    await block.hover();
    const tooltip = page.locator('.tooltip');
    await tooltip.waitFor({ state: 'visible' });
    const text = await tooltip.innerText();
    // 1.5 s to 2.5 s: the invented block's start and start + duration.
    assert.match(text, /line 13: turn 90° gyro/);
    assert.match(text, /1\.5 s → 2\.5 s \(1 s\)/);
    assert.match(text, /warning/);
    await block.click();
    assert.deepStrictEqual(await host.waitForPosted('reveal'), { type: 'reveal', uri: URI, version: 4, line: LINE_SPIN });
    await page.locator(`.timeline .block[data-line="${LINE_TURN_TO}"]`).hover();
    await page.locator('.tooltip', { hasText: 'past the 5.5 s limit' }).waitFor();
    // 0.5 s past: the block ends at 6 s, the limit is 5.5 s.
    assert.match(await tooltip.innerText(), /ends 0\.5 s past the 5\.5 s limit/);
  });

  it('scrubs with the keyboard: the footprint moves to the interpolated pose, the line is marked and posted', async () => {
    await rendered(render(1, true));
    const page = host.page;
    const scrubber = page.getByRole('slider', { name: 'Time in the run' });
    await scrubber.focus();
    // Page Down twice: to the second and third block starts (1.5 s, the spin; 2.5 s, the second drive); Shift+Right: one second on, 3.5 s.
    await page.keyboard.press('PageDown');
    await page.keyboard.press('PageDown');
    await page.keyboard.press('Shift+ArrowRight');
    await page.locator('.timeline .clock', { hasText: /^3\.5 s$/ }).waitFor();
    assert.strictEqual(await scrubber.getAttribute('aria-valuetext'), '3.5 s of 6 s, line 14: drive 500 mm');
    assert.strictEqual(await page.locator('.timeline .block.is-current').getAttribute('data-line'), String(LINE_DRIVE_2));

    // At 3.5 s the robot is 0.4 of the way from the 2.5 s sample (200, 500) to the 5 s sample (700, 500):
    // axle midpoint (400, 500), heading 90. Heading 90 under `turns clockwise` faces +x, its right is -y
    // (spec section 2). The body's centre is 30 mm behind the axle: (370, 500); half length 80, half width 50.
    // Corners front-left, front-right, back-right, back-left (the core's footprintCorners order):
    const field = [[450, 550], [450, 450], [290, 450], [290, 550]];
    const frame = (await page.$eval('svg.drawing', (svg) => svg.getAttribute('data-frame')))!.split(' ').map(Number);
    // data-frame (render/svg.ts): field x = user x + a, field y = b − user y.
    const user = field.map(([x, y]) => [x! - frame[0]!, frame[1]! - y!]);
    const points = (await page.$eval('svg.drawing .scrub-robot polygon', (p) => p.getAttribute('points')))!
      .split(' ').map((pair) => pair.split(',').map(Number));
    points.forEach((p, i) => assert.ok(Math.hypot(p[0]! - user[i]![0]!, p[1]! - user[i]![1]!) < 0.01, `corner ${i}: ${p} vs ${user[i]}`));
    // The heading tick runs from the axle midpoint to the front's middle, (450, 500).
    const nose = await page.$eval('svg.drawing .scrub-robot line', (l) => ['x1', 'y1', 'x2', 'y2'].map((a) => Number(l.getAttribute(a))));
    [400 - frame[0]!, frame[1]! - 500, 450 - frame[0]!, frame[1]! - 500].forEach((v, i) => assert.ok(Math.abs(nose[i]! - v) < 0.01, `tick ${nose} vs ${v}`));

    // The drawing marks the scrubbed motion's line as it marks the cursor's, and the host is told once per line.
    await page.waitForSelector(`svg.drawing .seg.is-current[data-line="${LINE_DRIVE_2}"]`);
    assert.deepStrictEqual(await scrubLines(), [LINE_SPIN, LINE_DRIVE_2]);
    // Arrow keys step 0.1 s: still the same drive, so nothing more is posted.
    await page.keyboard.press('ArrowLeft');
    await page.locator('.timeline .clock', { hasText: /^3\.4 s$/ }).waitFor();
    assert.deepStrictEqual(await scrubLines(), [LINE_SPIN, LINE_DRIVE_2]);
    // Enter reveals the scrubbed line; Escape puts the robot away and tells the host -1.
    await page.keyboard.press('Enter');
    assert.deepStrictEqual(await host.waitForPosted('reveal'), { type: 'reveal', uri: URI, version: 1, line: LINE_DRIVE_2 });
    await page.keyboard.press('Escape');
    await host.waitForPosted('scrub', (m) => m.line === -1);
    assert.strictEqual(await page.$eval('svg.drawing .scrub-robot', (g) => getComputedStyle(g).display), 'none');
    assert.strictEqual(await page.locator('svg.drawing .is-current').count(), 0);
  });

  it('draws a round robot at the pose, its heading tick one radius ahead', async () => {
    await rendered(render(1));
    const page = host.page;
    await page.getByRole('slider', { name: 'Time in the run' }).focus();
    // Home, then Page Down twice: the third block's start, 2.5 s, the sample at (200, 500) heading 90.
    await page.keyboard.press('Home');
    await page.keyboard.press('PageDown');
    await page.keyboard.press('PageDown');
    await page.locator('.timeline .clock', { hasText: /^2\.5 s$/ }).waitFor();
    const frame = (await page.$eval('svg.drawing', (svg) => svg.getAttribute('data-frame')))!.split(' ').map(Number);
    const circle = await page.$eval('svg.drawing .scrub-robot circle.scrub-body', (c) => ['cx', 'cy', 'r'].map((a) => Number(c.getAttribute(a))));
    // Greenhouse has no body: the footprint is a circle of half the 120 mm track (spec: footprint without `body`).
    [200 - frame[0]!, frame[1]! - 500, 60].forEach((v, i) => assert.ok(Math.abs(circle[i]! - v) < 0.01, `circle ${circle} vs ${v}`));
    const nose = await page.$eval('svg.drawing .scrub-robot line', (l) => [Number(l.getAttribute('x2')), Number(l.getAttribute('y2'))]);
    // Heading 90 clockwise faces +x: the tick ends at (260, 500).
    [260 - frame[0]!, frame[1]! - 500].forEach((v, i) => assert.ok(Math.abs(nose[i]! - v) < 0.01, `tick ${nose} vs ${v}`));
  });

  it('plays at real time from animation frames and stops at the end, posting each new line once', async () => {
    await rendered(render(2), { manualFrames: true });
    const page = host.page;
    await page.getByRole('button', { name: 'Play' }).click();
    await page.getByRole('button', { name: 'Pause' }).waitFor();
    // The first frame only sets the clock going; each later frame moves time on by the frame's own interval.
    await host.frame(16);
    await host.frame(1000);
    await page.locator('.timeline .clock', { hasText: /^1 s$/ }).waitFor();
    await host.frame(1000); // 2 s: the spin (1.5 s to 2.5 s)
    await page.waitForSelector(`svg.drawing .is-current[data-line="${LINE_SPIN}"]`);
    await host.frame(1000); // 3 s: the second drive
    await host.frame(2500); // 5.5 s: the last turn
    assert.deepStrictEqual(await scrubLines(), [LINE_DRIVE_1, LINE_SPIN, LINE_DRIVE_2, LINE_TURN_TO]);
    await host.frame(2500); // past the 6 s end: it stops there
    await page.getByRole('button', { name: 'Play' }).waitFor();
    await page.locator('.timeline .clock', { hasText: /^6 s$/ }).waitFor();
    assert.strictEqual(await host.frame(16), 0, 'no frame is asked for once stopped');
    // Stopped at the end, the robot shows the last pose (700, 500), heading 45.
    const frame = (await page.$eval('svg.drawing', (svg) => svg.getAttribute('data-frame')))!.split(' ').map(Number);
    const axle = await page.$eval('svg.drawing .scrub-robot .scrub-axle', (c) => [Number(c.getAttribute('cx')), Number(c.getAttribute('cy'))]);
    [700 - frame[0]!, frame[1]! - 500].forEach((v, i) => assert.ok(Math.abs(axle[i]! - v) < 0.01, `axle ${axle} vs ${v}`));
  });

  it('Space plays and pauses from the scrubber; the Reset button puts the robot away', async () => {
    await rendered(render(2), { manualFrames: true });
    const page = host.page;
    await page.getByRole('slider', { name: 'Time in the run' }).focus();
    await page.keyboard.press('Space');
    await page.getByRole('button', { name: 'Pause' }).waitFor();
    await host.frame(16);
    await host.frame(500);
    await page.keyboard.press('Space');
    await page.getByRole('button', { name: 'Play' }).waitFor();
    await page.locator('.timeline .clock', { hasText: /^0\.5 s$/ }).waitFor();
    await host.frame(500);
    await host.frame(500);
    assert.strictEqual(await page.locator('.timeline .clock').innerText(), '0.5 s', 'paused: time stands still');
    await page.getByRole('button', { name: 'Reset' }).click();
    await host.waitForPosted('scrub', (m) => m.line === -1);
    await page.locator('.timeline .clock', { hasText: /^0 s$/ }).waitFor();
  });

  it('scrubs by dragging along the strip', async () => {
    await rendered(render(5));
    const page = host.page;
    const strip = (await page.locator('.timeline .strip').boundingBox())!;
    const y = strip.y + strip.height / 2;
    await page.mouse.move(strip.x + 2, y);
    await page.mouse.down();
    // Three quarters of the strip: 4.5 s of the 6 s axis, in the second drive (2.5 s to 5 s).
    await page.mouse.move(strip.x + 1 + 0.75 * (strip.width - 2), y, { steps: 8 });
    await page.mouse.up();
    await page.waitForSelector(`svg.drawing .is-current[data-line="${LINE_DRIVE_2}"]`);
    const clock = await page.locator('.timeline .clock').innerText();
    const t = Number(/^([\d.]+) s$/.exec(clock)?.[1]);
    assert.ok(Math.abs(t - 4.5) < 0.02, clock);
    assert.strictEqual((await host.posted()).filter((m) => m.type === 'reveal').length, 0, 'a drag is not a click');
  });

  it('keeps the exported PNG free of the scrubbed robot', async () => {
    await rendered(render(1, true));
    const page = host.page;
    await page.getByRole('button', { name: 'PNG' }).click();
    const plain = (await host.waitForPosted('exportPng')).base64;
    await page.getByRole('slider', { name: 'Time in the run' }).focus();
    await page.keyboard.press('PageDown');
    await page.waitForSelector('svg.drawing .scrub-robot polygon[points]');
    await page.evaluate(() => { (window as unknown as Win).__posted.length = 0; });
    await page.getByRole('button', { name: 'PNG' }).click();
    const scrubbed = (await host.waitForPosted('exportPng')).base64;
    assert.ok(plain === scrubbed, 'the exported image must not show the scrubbed robot or its line');
  });

  it('folds the sections under the drawing, remembers it, and hides them on the Targets tab', async () => {
    await rendered(render(1));
    const page = host.page;
    await traced(trace(1, LINE_SPIN, 90), 0);
    await page.locator('.section-trace > summary').click();
    assert.ok(await page.locator('.trace-charts').isHidden());
    // A <details> element's toggle event comes after the click, in a task of its own: wait for the state it saves.
    await page.waitForFunction(() => ((window as unknown as Win).__state as { folded?: string[] } | undefined)?.folded?.includes('trace'));
    const state = await page.evaluate(() => (window as unknown as Win).__state as { folded?: string[] });
    assert.deepStrictEqual(state.folded, ['trace']);
    await page.getByRole('tab', { name: 'Targets' }).click();
    assert.ok(await page.locator('.below').isHidden());
    await page.getByRole('tab', { name: 'Drawing' }).click();
    assert.ok(await page.locator('.timeline .strip').isVisible());
  });

  it('shows the core\'s own timeline and trace of a plan with gyro turns', async () => {
    // Real data: the render and trace messages the extension host builds from the core's simulation.
    const message = renderFor(PLAN, URI, 1);
    await rendered(message);
    const page = host.page;
    assert.strictEqual(await page.locator('.timeline .timeline-row').count(), message.timeline.length);
    assert.strictEqual(await page.locator('.timeline .block').count(), message.timeline.reduce((n, r) => n + r.blocks.length, 0));
    const spin = traceFor(PLAN, URI, 1, LINE_SPIN);
    assert.ok(spin.columns && spin.columns.t.length > 10, 'the core simulates the gyro spin');
    await traced(spin, 0);
    assert.strictEqual(await page.locator('.trace-title').innerText(), spin.title);
    assert.match(spin.title, /^Line 13: /);
    await page.getByRole('slider', { name: 'Time in the run' }).focus();
    await page.keyboard.press('PageDown');
    await page.waitForSelector('svg.drawing .scrub-robot circle.scrub-body[cx]');
    assert.deepStrictEqual(host.errors, []);
  });

  it('says so when the plan has no predicted timeline', async () => {
    await rendered({ ...render(1), timeline: [] });
    assert.strictEqual(await host.page.locator('.timeline-note').innerText(), 'No predicted timeline for this plan.');
    assert.ok(await host.page.getByRole('button', { name: 'Play' }).isHidden());
  });

  it('follows the theme: the charts are drawn again in the new colours', async () => {
    await rendered(render(1));
    await traced(trace(1, LINE_SPIN, 90), 0);
    const page = host.page;
    const blueAt = (r: number, g: number, b: number) => page.$eval('.trace-yaw canvas', (canvas, [r0, g0, b0]) => {
      const c = canvas as HTMLCanvasElement;
      const data = c.getContext('2d')!.getImageData(0, 0, c.width, c.height).data;
      let n = 0;
      for (let i = 0; i < data.length; i += 4) if (Math.abs(data[i]! - r0!) < 8 && Math.abs(data[i + 1]! - g0!) < 8 && Math.abs(data[i + 2]! - b0!) < 8) n++;
      return n;
    }, [r, g, b]);
    // --vscode-charts-blue of the stand-in themes (standInHost.ts THEMES): #1a85ff light, #3794ff dark.
    await host.setTheme('vscode-dark');
    await page.waitForFunction(() => Number(document.querySelector<HTMLElement>('.trace')?.dataset.drawn) >= 1);
    await page.waitForFunction(() => {
      const c = document.querySelector<HTMLCanvasElement>('.trace-yaw canvas');
      if (!c) return false;
      const d = c.getContext('2d')!.getImageData(0, 0, c.width, c.height).data;
      for (let i = 0; i < d.length; i += 4) if (Math.abs(d[i]! - 0x37) < 8 && Math.abs(d[i + 1]! - 0x94) < 8 && Math.abs(d[i + 2]! - 0xff) < 8) return true;
      return false;
    });
    assert.ok(await blueAt(0x37, 0x94, 0xff) > 100);
    assert.strictEqual(await blueAt(0x1a, 0x85, 0xff), 0);
  });
});
