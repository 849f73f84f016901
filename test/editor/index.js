// Entry point for the tests that run inside a real VS Code extension host
// (real-editor.sh ext-test, or @vscode/test-electron via scripts/test-electron.mjs).
// Loads every *.test.js in ./suite, so other features add their own files.
const path = require('path');
const fs = require('fs');
const Mocha = require('mocha').Mocha || require('mocha');

function run() {
  const mocha = new Mocha({ ui: 'bdd', color: false, timeout: 30000 });
  const suiteDir = path.join(__dirname, 'suite');
  for (const file of fs.readdirSync(suiteDir).filter((f) => f.endsWith('.test.js')).sort()) {
    mocha.addFile(path.join(suiteDir, file));
  }
  return new Promise((resolve, reject) => {
    mocha.run((failures) => (failures > 0 ? reject(new Error(`${failures} editor test(s) failed`)) : resolve()));
  });
}

module.exports = { run };
