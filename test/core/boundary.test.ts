import { strict as assert } from 'node:assert';
import { readdirSync, readFileSync, statSync } from 'node:fs';
import { join, relative } from 'node:path';

// The core takes text and returns plain data: it must never reach for the
// editor, the DOM or the file system, so it can run in the CLI, the extension
// host, a worker or a browser alike.
const FORBIDDEN = [/^vscode$/, /^(node:)?(fs|fs\/promises|path|child_process|os|net|http|https|worker_threads)$/];

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

  it('the core is type-checked without the DOM library, so DOM globals fail `npm run typecheck`', () => {
    const tsconfig = JSON.parse(readFileSync(join(__dirname, '..', '..', 'tsconfig.json'), 'utf8'));
    const libs: string[] = tsconfig.compilerOptions.lib.map((l: string) => l.toLowerCase());
    assert.ok(!libs.some((l) => l.startsWith('dom')), `tsconfig.json lib includes the DOM: ${libs}`);
    assert.ok(tsconfig.include.includes('src/core/**/*.ts'));
  });

  it('no core file imports vscode or Node built-ins', () => {
    const problems: string[] = [];
    for (const f of all) {
      const text = readFileSync(f, 'utf8');
      for (const m of text.matchAll(/(?:import|export)[^'"]*?from\s*['"]([^'"]+)['"]|require\(\s*['"]([^'"]+)['"]\s*\)|import\(\s*['"]([^'"]+)['"]\s*\)/g)) {
        const spec = m[1] ?? m[2] ?? m[3];
        if (FORBIDDEN.some((re) => re.test(spec))) problems.push(`${relative(root, f)} imports ${spec}`);
      }
    }
    assert.deepEqual(problems, []);
  });
});
