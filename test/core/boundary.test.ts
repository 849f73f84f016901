import { strict as assert } from 'node:assert';
import { readdirSync, readFileSync, statSync } from 'node:fs';
import { join, relative } from 'node:path';

// The core takes text and returns plain data: it must never reach for the
// editor, the DOM or the file system, so it can run in the CLI, the extension
// host, a worker or a browser alike.
const FORBIDDEN = [/^vscode$/, /^(node:)?(fs|fs\/promises|path|child_process|os|net|http|https|worker_threads)$/];
const DOM_GLOBALS = /\b(document|window|navigator|localStorage)\s*\./;

function files(dir: string): string[] {
  return readdirSync(dir).flatMap((n) => {
    const p = join(dir, n);
    return statSync(p).isDirectory() ? files(p) : p.endsWith('.ts') ? [p] : [];
  });
}

describe('core boundary', () => {
  const root = join(__dirname, '..', '..', 'src', 'core');
  const all = files(root);

  it('finds the core sources', () => {
    assert.ok(all.length >= 10, `only ${all.length} files under src/core`);
  });

  it('no core file imports vscode, Node built-ins or uses DOM globals', () => {
    const problems: string[] = [];
    for (const f of all) {
      const text = readFileSync(f, 'utf8');
      for (const m of text.matchAll(/(?:import|export)[^'"]*?from\s*['"]([^'"]+)['"]|require\(\s*['"]([^'"]+)['"]\s*\)|import\(\s*['"]([^'"]+)['"]\s*\)/g)) {
        const spec = m[1] ?? m[2] ?? m[3];
        if (FORBIDDEN.some((re) => re.test(spec))) problems.push(`${relative(root, f)} imports ${spec}`);
      }
      const code = text.replace(/\/\/.*$/gm, '').replace(/\/\*[\s\S]*?\*\//g, '');
      if (DOM_GLOBALS.test(code)) problems.push(`${relative(root, f)} uses a DOM global`);
    }
    assert.deepEqual(problems, []);
  });
});
