// "Veer: Sample the Runs (Monte Carlo)" through the real editor's UI, on the
// installed production .vsix (so the worker bundle must be in the package):
//   EXTENSIONS=veer.vsix real-editor.sh ui test/editor/workspace test/editor/ui/sampling-ui.js [OUT_DIR]
// Opens a plan, chooses "Spread: every motion" in the preview, runs the
// command from the palette, sees the progress notification, the cloud of dots
// and the sampled share in the preview, then types in the plan and sees the
// dots go. Screenshots in OUT_DIR (default test-output/).
const fs = require('fs');
const path = require('path');
const { openEditor, openFile, runCommand, webview } = require(path.join(
  process.env.REAL_EDITOR_DIR || path.join(__dirname, '..', '..', '..', '..', 'shared', 'tools', 'real-editor'),
  'editor-page.js',
));

const outDir = path.resolve(process.argv[2] || 'test-output');
const PLAN = 'seed-trays.veer';
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
    console.log(`sampling-ui: ${stage} done at ${((Date.now() - started) / 1000).toFixed(1)} s`);
    stage = next;
  };
  const { page, close } = await openEditor();
  page.setDefaultTimeout(WAIT_MS);
  let failed = false;
  try {
    reached('open the plan');
    await openFile(page, PLAN);
    await page.waitForSelector('.statusbar-item:has-text("Veer plan")');
    reached('preview with the spread after every motion');
    await page.locator('.monaco-editor .view-lines').first().click();
    await runCommand(page, 'Veer: Open Path Preview to the Side');
    const view = webview(page);
    await view.locator('svg.drawing path.seg').first().waitFor();
    await view.locator('select.spread-select').selectOption('all');
    await view.locator('svg.drawing .spread-end').first().waitFor();

    reached('sample from the palette');
    await page.locator('.monaco-editor .view-lines').first().click();
    await runCommand(page, 'Veer: Sample the Runs (Monte Carlo)');
    // The summary names the runs sampled once the preview has drawn them.
    await page.waitForSelector('.notification-toast:has-text("Sampled 1,000 runs of seed-trays.veer")');
    await view.locator('.toolbar .cloud-note:has-text("1,000 sampled runs")').waitFor();
    const places = await view.locator('svg.drawing .cloud').count();
    check(places === 2, `${places} clouds drawn (the mark and the run's end expected)`);
    const share = await view.locator('svg.drawing .sampled-share').textContent();
    check(/^sampled (> 99|< 1|\d+) %$/.test(share), `sampled share: ${share}`);
    await page.screenshot({ path: path.join(outDir, 'sampling-ui.png') });

    reached('the next edit clears the dots');
    await page.locator('.monaco-editor .view-lines').first().click();
    await page.keyboard.press('Control+End');
    await page.keyboard.type('\nwait 1 s');
    await view.locator('svg.drawing .cloud').first().waitFor({ state: 'detached' });
    check(await view.locator('.toolbar .cloud-note').isHidden(), 'the toolbar still names a cloud');
    await page.screenshot({ path: path.join(outDir, 'sampling-ui-edited.png') });
    reached('done');
    console.log(`sampling-ui: ${places} clouds drawn, ${share}; cleared by the next edit; screenshots in ${outDir}`);
  } catch (e) {
    failed = true;
    console.error(`sampling-ui FAILED at "${stage}" after ${((Date.now() - started) / 1000).toFixed(1)} s:`, e.message);
    await page.screenshot({ path: path.join(outDir, 'sampling-ui-failure.png') }).catch(() => {});
  } finally {
    await close();
  }
  process.exit(failed ? 1 : 0);
})();
