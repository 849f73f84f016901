// Bundles the three faces of Veer with esbuild:
//   dist/cli.js        the `veer` command (Node)
//   dist/extension.js  the VS Code extension host code (`vscode` external)
//   media/preview.js   the path preview's own browser bundle
import * as esbuild from 'esbuild';
import { existsSync } from 'node:fs';

const production = process.argv.includes('--production');
const watch = process.argv.includes('--watch');

const common = {
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
