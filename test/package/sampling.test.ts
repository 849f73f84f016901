// "Veer: Sample the Runs" needs its worker bundle beside the extension's: the
// build must write it, the package must carry it (the .vscodeignore
// allow-list, as vsce reads it), and the extension must load it from there.
import { strict as assert } from 'node:assert';
import { execFileSync } from 'node:child_process';
import { readFileSync } from 'node:fs';
import { join } from 'node:path';

const root = join(__dirname, '..', '..');

describe('package: the sampling worker', function () {
  this.timeout(60000);

  it('is built to dist/sampleWorker.js, which the extension loads', () => {
    const build = readFileSync(join(root, 'scripts', 'build.mjs'), 'utf8');
    assert.match(build, /entryPoints: \['src\/extension\/sampleWorker\.ts'\], outfile: 'dist\/sampleWorker\.js', platform: 'node'/);
    const sampling = readFileSync(join(root, 'src', 'extension', 'sampling.ts'), 'utf8');
    assert.match(sampling, /joinPath\(context\.extensionUri, 'dist', 'sampleWorker\.js'\)/);
  });

  it('goes into the package (vsce ls)', () => {
    const files = execFileSync(join(root, 'node_modules', '.bin', 'vsce'), ['ls', '--no-dependencies'], { cwd: root, encoding: 'utf8' })
      .split(/\r?\n/).map((l) => l.trim());
    assert.ok(files.includes('dist/extension.js'), files.join(', '));
    assert.ok(files.includes('dist/sampleWorker.js'), files.join(', '));
  });
});
