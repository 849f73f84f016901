// Bundles the three faces of Veer with esbuild:
//   dist/cli.js        the `veer` command (Node)
//   dist/extension.js  the VS Code extension host code (`vscode` external)
//   media/preview.js   the path preview's own browser bundle
//   dist/sampleWorker.js  the Monte Carlo worker of "Veer: Sample the Runs"
//   media/uplot.css    the chart library's own style sheet, copied for the preview
import * as esbuild from 'esbuild';
import { copyFileSync, existsSync } from 'node:fs';
import { createRequire } from 'node:module';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';

const production = process.argv.includes('--production');
const watch = process.argv.includes('--watch');

// math.js's main entry builds a complete default instance as it loads (about a
// second on a slow machine); the core only needs `create` and the factory list
// for its own sandboxed instance, so bundles import just those.
const require = createRequire(import.meta.url);
const mathjsRoot = dirname(require.resolve('mathjs/package.json'));
// The preview's CSP admits style sheets from its own media folder only.
copyFileSync(join(dirname(require.resolve('uplot/package.json')), 'dist', 'uPlot.min.css'),
  join(dirname(fileURLToPath(import.meta.url)), '..', 'media', 'uplot.css'));
const leanMathjs = {
  name: 'lean-mathjs',
  setup(build) {
    build.onResolve({ filter: /^mathjs$/ }, () => ({ path: 'mathjs', namespace: 'lean-mathjs' }));
    build.onLoad({ filter: /.*/, namespace: 'lean-mathjs' }, () => ({
      contents: [
        `export { create } from ${JSON.stringify(join(mathjsRoot, 'lib/esm/core/create.js'))};`,
        `export { all } from ${JSON.stringify(join(mathjsRoot, 'lib/esm/entry/allFactoriesAny.js'))};`,
      ].join('\n'),
      resolveDir: mathjsRoot,
    }));
  },
};

const common = {
  plugins: [leanMathjs],
  bundle: true,
  sourcemap: !production,
  minify: production,
  logLevel: 'warning',
  legalComments: 'none',
};

const targets = [
  { entryPoints: ['src/cli/main.ts'], outfile: 'dist/cli.js', platform: 'node', format: 'cjs', target: 'node20' },
  { entryPoints: ['src/extension/activate.ts'], outfile: 'dist/extension.js', platform: 'node', format: 'cjs', target: 'node20', external: ['vscode'] },
  { entryPoints: ['src/preview/main.ts'], outfile: 'media/preview.js', platform: 'browser', format: 'iife', target: 'es2022' },
  // The Monte Carlo of "Veer: Sample the Runs", run in a worker thread off the extension host's.
  { entryPoints: ['src/extension/sampleWorker.ts'], outfile: 'dist/sampleWorker.js', platform: 'node', format: 'cjs', target: 'node20' },
];

for (const t of targets) {
  if (!existsSync(t.entryPoints[0])) {
    console.error(`build: missing entry point ${t.entryPoints[0]}`);
    process.exit(1);
  }
}

if (watch) {
  for (const t of targets) {
    const ctx = await esbuild.context({ ...common, ...t });
    await ctx.watch();
  }
  console.log('build: watching for changes');
} else {
  await Promise.all(targets.map((t) => esbuild.build({ ...common, ...t })));
}
