// Runs the editor suite (test/editor) in a desktop VS Code downloaded by
// @vscode/test-electron: for machines that can reach the VS Code download
// service. Where it cannot be reached, use `npm run test:editor` instead.
//   node scripts/test-electron.mjs            (VS Code 1.100.3, the version engines.vscode allows)
//   VSCODE_VERSION=stable node scripts/test-electron.mjs
import { runTests } from '@vscode/test-electron';
import { execFileSync } from 'node:child_process';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';

const root = join(dirname(fileURLToPath(import.meta.url)), '..');
execFileSync(process.execPath, [join(root, 'scripts', 'build.mjs')], { stdio: 'inherit', cwd: root });

try {
  await runTests({
    version: process.env.VSCODE_VERSION ?? '1.100.3',
    extensionDevelopmentPath: root,
    extensionTestsPath: join(root, 'test', 'editor', 'index.js'),
    launchArgs: [join(root, 'test', 'editor', 'workspace'), '--disable-extensions', '--disable-workspace-trust'],
  });
} catch (error) {
  console.error('test-electron: the editor tests failed or VS Code could not start:', error);
  process.exit(1);
}
