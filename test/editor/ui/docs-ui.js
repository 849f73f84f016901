// The pictures in docs/, taken in the real editor as a coach would see it:
//   EXTENSIONS=veer.vsix real-editor.sh ui test/editor/workspace test/editor/ui/docs-ui.js [DOCS_DIR]
// The getting-started walkthrough, and the path preview beside a plan in a
// light and a dark theme. Each picture is taken once what it shows is on screen.
const fs = require('fs');
const path = require('path');
const { openEditor, openFile, runCommand, webview } = require(path.join(
  process.env.REAL_EDITOR_DIR || path.join(__dirname, '..', '..', '..', '..', 'shared', 'tools', 'real-editor'),
  'editor-page.js',
));

const docsDir = path.resolve(process.argv[2] || path.join(__dirname, '..', '..', '..', 'docs'));
const WAIT_MS = Number(process.env.UI_WAIT_MS || 120000);

(async () => {
  fs.mkdirSync(docsDir, { recursive: true });
  const { page, close } = await openEditor();
  page.setDefaultTimeout(WAIT_MS);
  let failed = false;
  try {
    await openFile(page, 'wrap-check.veer');
    await page.waitForSelector('.statusbar-item .codicon-compass');
    // The editor's own notices (a git repository found above the workspace) do not belong in the pictures.
    await runCommand(page, 'Notifications: Clear All Notifications');

    await runCommand(page, 'Welcome: Open Walkthrough...');
    await page.keyboard.type('Plan a robot run');
    await page.waitForSelector('.quick-input-list .monaco-list-row:has-text("Plan a robot run with Veer")');
    await page.keyboard.press('Enter');
    await page.waitForSelector('.getting-started-category .category-title:has-text("Plan a robot run with Veer"), .gettingStartedSlideDetails:has-text("Start a plan")');
    await page.waitForSelector('text=Create a first plan');
    await page.screenshot({ path: path.join(docsDir, 'walkthrough.png') });
    await page.keyboard.press('Control+W');

    await openFile(page, 'wrap-check.veer');
    await runCommand(page, 'Veer: Open Path Preview to the Side');
    const view = webview(page);
    await view.locator('svg.drawing path.seg').first().waitFor();
    const isDark = () => document.querySelector('.monaco-workbench')?.classList.contains('vs-dark') ?? false;
    const first = (await page.evaluate(isDark)) ? 'dark' : 'light';
    await page.screenshot({ path: path.join(docsDir, `preview-${first}.png`) });
    await runCommand(page, 'Preferences: Toggle between Light/Dark Themes');
    const second = first === 'dark' ? 'light' : 'dark';
    await page.waitForFunction((want) => (document.querySelector('.monaco-workbench')?.classList.contains('vs-dark') ?? false) === (want === 'dark'), second);
    // The webview takes the new theme's colours: wait until its body says so.
    await view.locator(`body.vscode-${second}`).waitFor();
    await view.locator('svg.drawing path.seg').first().waitFor();
    await page.screenshot({ path: path.join(docsDir, `preview-${second}.png`) });
    console.log(`docs-ui: walkthrough and preview (light and dark) pictures in ${docsDir}`);
  } catch (e) {
    failed = true;
    console.error('docs-ui FAILED:', e.message);
    await page.screenshot({ path: path.join(docsDir, '..', 'test-output', 'docs-ui-failure.png') }).catch(() => {});
  } finally {
    await close();
  }
  process.exit(failed ? 1 : 0);
})();
