// "Veer: Overlay a Recorded Run" through the real editor's UI, on the
// installed production .vsix:
//   EXTENSIONS=veer.vsix real-editor.sh ui test/editor/workspace test/editor/ui/recorded-ui.js [OUT_DIR]
// Opens the demo plan's copy, runs the command from the palette, picks the log
// in the editor's own open dialog, sees the summary and the recorded path in
// the preview, then clears it with "Veer: Clear the Recorded Run".
// Screenshots in OUT_DIR (default test-output/).
const fs = require('fs');
const path = require('path');
const { openEditor, openFile, runCommand, webview } = require(path.join(
  process.env.REAL_EDITOR_DIR || path.join(__dirname, '..', '..', '..', '..', 'shared', 'tools', 'real-editor'),
  'editor-page.js',
));

const outDir = path.resolve(process.argv[2] || 'test-output');
const PLAN = 'recorded-check.veer';
const LOG = 'recorded-check.log.csv';
/** Deadline of each wait once the editor is up (UI_WAIT_MS overrides it). */
const WAIT_MS = Number(process.env.UI_WAIT_MS || 120000);

function check(condition, message) {
  if (!condition) throw new Error(message);
}

(async () => {
  fs.mkdirSync(outDir, { recursive: true });
  const started = Date.now();
  let stage = 'editor start';
  const reached = (next) => {
    console.log(`recorded-ui: ${stage} done at ${((Date.now() - started) / 1000).toFixed(1)} s`);
    stage = next;
  };
  const { page, close } = await openEditor();
  page.setDefaultTimeout(WAIT_MS);
  let failed = false;
  try {
    reached('open the plan');
    await openFile(page, PLAN);
    await page.waitForSelector('.statusbar-item:has-text("Veer plan")');

    reached('the command and its open dialog');
    await page.locator('.monaco-editor .view-lines').first().click();
    await runCommand(page, 'Veer: Overlay a Recorded Run');
    // The editor's own open dialog is a quick input holding a path: type the log's and accept it.
    const input = page.locator('.quick-input-widget .quick-input-box input');
    await page.waitForSelector('.quick-input-widget:has-text("Choose the log of a recorded run")');
    await input.fill(path.join(process.env.WORKSPACE, LOG));
    await page.waitForSelector(`.quick-input-list .monaco-list-row:has-text("${LOG}")`);
    await page.keyboard.press('Enter');

    reached('the summary and the drawing');
    await page.waitForSelector('.notification-toast:has-text("Recorded run of \\"to the dock\\"")');
    const summary = await page.locator('.notification-toast .notification-list-item-message:has-text("Recorded run of")').first().textContent();
    check(/ends \d+\.\d mm and -?\d+\.\d° off the plan/.test(summary), `summary: ${summary}`);
    const view = webview(page);
    await view.locator('svg.drawing g.recorded path.recorded-fused').waitFor();
    const points = (await view.locator('svg.drawing g.recorded path.recorded-fused').getAttribute('d')).split('L').length;
    check(points > 500, `${points} points in the recorded path`);
    check(await view.locator('svg.drawing g.recorded path.recorded-wheels').count() === 1, 'no wheels-only path');
    await page.screenshot({ path: path.join(outDir, 'recorded-ui.png') });

    reached('clear it');
    await page.locator('.monaco-editor .view-lines').first().click();
    await runCommand(page, 'Veer: Clear the Recorded Run');
    await view.locator('svg.drawing g.recorded').waitFor({ state: 'detached' });
    await view.locator('svg.drawing path.seg').first().waitFor();
    await page.screenshot({ path: path.join(outDir, 'recorded-ui-cleared.png') });
    reached('done');
    console.log(`recorded-ui: the log picked in the open dialog, ${points} points drawn, "${summary.trim().slice(0, 90)}"; cleared; screenshots in ${outDir}`);
  } catch (e) {
    failed = true;
    console.error(`recorded-ui FAILED at "${stage}" after ${((Date.now() - started) / 1000).toFixed(1)} s:`, e.message);
    await page.screenshot({ path: path.join(outDir, 'recorded-ui-failure.png') }).catch(() => {});
  } finally {
    await close();
  }
  process.exit(failed ? 1 : 0);
})();
