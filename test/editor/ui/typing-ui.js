// Typing a plan as a person would, in the real editor's UI:
//   EXTENSIONS=veer.vsix real-editor.sh ui test/editor/workspace test/editor/ui/typing-ui.js [OUT_DIR]
// Enter at the end of a complete line starts a new line (completion never
// swallows it), after a unit, a name and a closed word alike.
const fs = require('fs');
const path = require('path');
const { openEditor, openFile } = require(path.join(
  process.env.REAL_EDITOR_DIR || path.join(__dirname, '..', '..', '..', '..', 'shared', 'tools', 'real-editor'),
  'editor-page.js',
));

const outDir = path.resolve(process.argv[2] || 'test-output');
const WAIT_MS = Number(process.env.UI_WAIT_MS || 120000);

(async () => {
  fs.mkdirSync(outDir, { recursive: true });
  const { page, close } = await openEditor();
  page.setDefaultTimeout(WAIT_MS);
  let failed = false;
  try {
    await openFile(page, 'settings-check.veer');
    await page.waitForSelector('.statusbar-item .codicon-compass');
    await page.locator('.monaco-editor .view-lines').first().click();
    await page.keyboard.press('Control+End');
    await page.keyboard.press('Enter');
    // Typed at a person's pace, so completion has every chance to open.
    for (const line of ['limit 30 s', 'let leg = 550 mm', 'turn 90 pivot left']) {
      await page.keyboard.type(line, { delay: 60 });
      // Give a suggestion list that would open the time to show (a condition, not a sleep: the typed text is on screen).
      await page.waitForSelector(`.view-line:has-text("${line}")`);
      await page.keyboard.press('Enter');
    }
    await page.keyboard.type('wait 1', { delay: 60 });
    await page.waitForSelector('.view-line:has-text("wait 1")');
    // The text of each line, without the inlay hint that follows a motion (`→ heading ...`).
    const lines = (await page.locator('.monaco-editor .view-line').allTextContents()).map((l) => l.replace(/\u00a0/g, ' ').split('→')[0].trim());
    for (const expected of ['limit 30 s', 'let leg = 550 mm', 'turn 90 pivot left', 'wait 1']) {
      if (!lines.includes(expected)) throw new Error(`no line "${expected}" on its own: ${JSON.stringify(lines)}`);
    }
    await page.screenshot({ path: path.join(outDir, 'typing-ui.png') });
    console.log('typing-ui: Enter after a complete line made a new line each time');
  } catch (e) {
    failed = true;
    console.error('typing-ui FAILED:', e.message);
    await page.screenshot({ path: path.join(outDir, 'typing-ui-failure.png') }).catch(() => {});
  } finally {
    await close();
  }
  process.exit(failed ? 1 : 0);
})();
