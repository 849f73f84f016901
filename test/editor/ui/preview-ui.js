// The path preview through the real editor's UI, as a person would use it:
//   EXTENSIONS=veer.vsix real-editor.sh ui test/editor/workspace test/editor/ui/preview-ui.js [OUT_DIR] [PLAN]
// Opens the plan, sees its squiggle and Problems entry, opens the preview, and
// checks the drawing, the cursor highlight, the trace chart following the
// cursor between two motions, the run timeline, and click-to-reveal. Leaves
// screenshots in OUT_DIR (default test-output/).
//
// Every wait is on a condition. The deadlines are generous because a loaded CI
// machine can take well over 30 s to start the extension host and load the
// extension, which is activated only when the plan opens (onLanguage:veer):
// so the script first waits for the editor to know the plan's language, then
// for the extension's status bar item (proof of activation), and only then for
// the squiggle. Each stage logs its time, so a slow stage can be told from a
// broken one.
const fs = require('fs');
const path = require('path');
const { openEditor, openFile, runCommand, problems, webview } = require(path.join(
  process.env.REAL_EDITOR_DIR || path.join(__dirname, '..', '..', '..', '..', 'shared', 'tools', 'real-editor'),
  'editor-page.js',
));

const outDir = path.resolve(process.argv[2] || 'test-output');
const planName = process.argv[3] || 'wrap-check.veer';
// 0-based lines of test/editor/workspace/wrap-check.veer.
const DRIVE_LINE = 9; // drive 3 * lane speed 60% hold 0
const WRAP_LINE = 11; // the turn whose yaw target crosses the wrap point (turn 90 by gyro)
const SECOND_RUN_DRIVE_LINE = 17; // drive lane

/** Deadline of each wait once the editor is up (UI_WAIT_MS overrides it). */
const WAIT_MS = Number(process.env.UI_WAIT_MS || 120000);

function check(condition, message) {
  if (!condition) throw new Error(message);
}

/** Goes to a 1-based line with the editor's Go to Line box. */
async function goToLine(page, line) {
  await page.keyboard.press('Control+G');
  await page.waitForSelector('.quick-input-widget .quick-input-box input');
  await page.keyboard.type(String(line));
  await page.keyboard.press('Enter');
  await page.waitForSelector(`.statusbar-item:has-text("Ln ${line},")`);
}

(async () => {
  fs.mkdirSync(outDir, { recursive: true });
  const started = Date.now();
  let stage = 'editor start';
  const reached = (next) => {
    console.log(`preview-ui: ${stage} done at ${((Date.now() - started) / 1000).toFixed(1)} s`);
    stage = next;
  };
  const { page, close } = await openEditor();
  page.setDefaultTimeout(WAIT_MS);
  let failed = false;
  try {
    reached('open the plan');
    await openFile(page, planName);
    reached('plan language known');
    await page.waitForSelector('.statusbar-item:has-text("Veer plan")');
    reached('extension activated (its status bar item)');
    await page.waitForSelector('.statusbar-item .codicon-compass');
    reached('squiggle and Problems entry');
    await page.waitForSelector('.monaco-editor .squiggly-error');
    const rows = await problems(page);
    check(rows.some((r) => r.includes('wrap-cross')), `Problems panel: ${rows.join(' | ')}`);
    await page.keyboard.press('Control+Shift+M'); // hide the panel again: more room for the drawing
    // The status bar counts the plan's problems (one error here), not only its wrap problems.
    await page.waitForSelector('.statusbar-item:has-text("1 error")');

    reached('preview drawn');
    await page.locator('.monaco-editor .view-lines').first().click();
    await runCommand(page, 'Veer: Open Path Preview to the Side');
    const view = webview(page);
    await view.locator('svg.drawing path.seg').first().waitFor();
    const segments = await view.locator('svg.drawing path.seg').count();
    check(segments >= 5, `only ${segments} segments drawn`);
    check(await view.locator('svg.drawing .marker-wrap').count() >= 1, 'no wrap marker in the drawing');

    reached('cursor highlight, reveal and tooltip');
    await page.locator('.monaco-editor .view-lines').first().click();
    await goToLine(page, WRAP_LINE + 1);
    await view.locator(`svg.drawing .seg.is-current[data-line="${WRAP_LINE}"]`).waitFor();
    await page.screenshot({ path: path.join(outDir, 'preview-ui-highlight.png') });

    reached('trace follows the cursor');
    // The chart names the motion on the cursor's line (1-based, as the editor numbers lines).
    const traceTitle = view.locator('.trace-title');
    await view.locator(`.trace[data-line="${WRAP_LINE}"]`).waitFor();
    const gyroTitle = await traceTitle.innerText();
    check(gyroTitle.startsWith(`Line ${WRAP_LINE + 1}:`) && /gyro/.test(gyroTitle), `trace title on the gyro turn: ${gyroTitle}`);
    await view.locator('.trace-charts .uplot canvas').first().waitFor();
    check(await view.locator('.trace-charts .uplot').count() === 3, 'three trace charts');
    await goToLine(page, DRIVE_LINE + 1);
    await view.locator(`.trace[data-line="${DRIVE_LINE}"]`).waitFor();
    const driveTitle = await traceTitle.innerText();
    check(driveTitle.startsWith(`Line ${DRIVE_LINE + 1}:`) && /drive/.test(driveTitle), `trace title on the drive: ${driveTitle}`);
    const blocks = await view.locator('.timeline .strip .block').count();
    check(blocks >= 5, `only ${blocks} timeline blocks`);
    // Scrub to the second motion's start: the drawing marks its line.
    await view.locator('.timeline .scrubber').focus();
    await view.locator('.timeline .scrubber').press('PageDown');
    await view.locator('svg.drawing .scrub-robot').first().waitFor({ state: 'attached' });
    await view.locator('.timeline .block.is-current').waitFor();
    await page.screenshot({ path: path.join(outDir, 'preview-ui-trace.png') });
    await view.locator('.timeline .scrubber').press('Escape');

    await view.locator(`svg.drawing path.seg[data-line="${DRIVE_LINE}"]`).click();
    await page.waitForSelector(`.statusbar-item:has-text("Ln ${DRIVE_LINE + 1},")`);
    // The click selected the line's text, so the status bar counts a selection.
    await page.waitForSelector('.statusbar-item:has-text("selected")');
    await view.locator(`svg.drawing .seg.is-current[data-line="${DRIVE_LINE}"]`).waitFor();

    // With the preview focused (its drawing was just clicked), the summary stays in the status bar.
    await view.locator('svg.drawing').click({ position: { x: 5, y: 5 } });
    await page.waitForSelector('.statusbar-item:has-text("1 error")');
    await view.locator(`svg.drawing path.seg[data-line="${SECOND_RUN_DRIVE_LINE}"]`).hover();
    const tooltip = view.locator('.tooltip', { hasText: `line ${SECOND_RUN_DRIVE_LINE + 1}: drive` });
    await tooltip.waitFor({ state: 'visible' });
    const tip = await tooltip.innerText();
    check(/time \d+(\.\d{1,2})? s/.test(tip), `tooltip: ${tip}`);
    await page.screenshot({ path: path.join(outDir, 'preview-ui.png') });
    reached('done');
    console.log(`preview-ui: ${segments} segments drawn; highlight, reveal and tooltip seen; screenshots in ${outDir}`);
  } catch (e) {
    failed = true;
    console.error(`preview-ui FAILED at "${stage}" after ${((Date.now() - started) / 1000).toFixed(1)} s:`, e.message);
    await page.screenshot({ path: path.join(outDir, 'preview-ui-failure.png') }).catch(() => {});
  } finally {
    await close();
  }
  process.exit(failed ? 1 : 0);
})();
