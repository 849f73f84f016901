import { strict as assert } from 'node:assert';
import { existsSync, readdirSync, readFileSync, statSync } from 'node:fs';
import { join, posix } from 'node:path';

// package.json is the extension's contract with the editor: these tests catch a
// contributed command nobody registers, a `when` clause naming a context key
// that never exists (the menu item then silently never shows), and paths that
// are missing or left out of the package.

const root = join(__dirname, '..', '..');
const pkg = JSON.parse(readFileSync(join(root, 'package.json'), 'utf8'));

function sourceFiles(dir: string): string[] {
  return readdirSync(dir).flatMap((name) => {
    const full = join(dir, name);
    return statSync(full).isDirectory() ? sourceFiles(full) : /\.ts$/.test(name) ? [full] : [];
  });
}
const source = sourceFiles(join(root, 'src')).map((f) => readFileSync(f, 'utf8')).join('\n');

/** Command ids passed to registerCommand, written literally or through a string constant. */
const registeredCommands = new Set(
  [...source.matchAll(/registerCommand\(\s*(?:'([^']+)'|"([^"]+)"|([A-Za-z_$][\w$]*))/g)].flatMap((m) => {
    if (!m[3]) return [m[1] ?? m[2]];
    const constant = new RegExp(`const\\s+${m[3]}\\s*=\\s*['"]([^'"]+)['"]`).exec(source);
    return constant ? [constant[1]] : [];
  }),
);

/** Every value under `key` anywhere inside `node`. */
function collect(node: unknown, key: string): unknown[] {
  if (Array.isArray(node)) return node.flatMap((n) => collect(n, key));
  if (node && typeof node === 'object') {
    return Object.entries(node).flatMap(([k, v]) => (k === key ? [v, ...collect(v, key)] : collect(v, key)));
  }
  return [];
}

/**
 * Context keys VS Code itself sets that a plan extension may sensibly use
 * (from the "when clause contexts" reference of the VS Code documentation).
 */
const BUILT_IN_CONTEXT_KEYS = new Set([
  'editorLangId', 'resourceLangId', 'resourceExtname', 'resourceFilename', 'resourceScheme', 'resource',
  'editorTextFocus', 'editorFocus', 'textInputFocus', 'editorReadonly', 'activeEditor', 'activeEditorIsDirty',
  'activeWebviewPanelId', 'activeCustomEditorId', 'webviewId', 'isWorkspaceTrusted', 'virtualWorkspace',
  'editorIsOpen', 'isInDiffEditor', 'view', 'viewItem', 'focusedView', 'config', 'true', 'false',
]);

/** Keys the extension sets itself with `setContext`. */
const ownContextKeys = new Set(
  [...source.matchAll(/executeCommand\(\s*['"]setContext['"]\s*,\s*['"]([^'"]+)['"]/g)].map((m) => m[1]),
);

/** The context keys a when clause reads: left of each comparison, and both sides of `in`. */
function contextKeysOf(when: string): string[] {
  const withoutLiterals = when.replace(/'[^']*'|"[^"]*"|=~\s*\/(?:\\.|[^/])*\/[a-z]*/g, ' ');
  const keys: string[] = [];
  for (const clause of withoutLiterals.split(/&&|\|\||[()!]/)) {
    const comparison = /^\s*([\w.:-]+)\s*(?:(==|!=|<=|>=|<|>)\s*\S*|\s+(not\s+)?in\s+([\w.:-]+))?\s*$/.exec(clause);
    if (!clause.trim()) continue;
    assert.ok(comparison, `cannot read when clause part "${clause.trim()}" of "${when}"`);
    keys.push(comparison[1]);
    if (comparison[4]) keys.push(comparison[4]);
  }
  return keys;
}

describe('package.json', () => {
  it('registers every contributed command in the source', () => {
    const commands: string[] = (pkg.contributes?.commands ?? []).map((c: { command: string }) => c.command);
    assert.ok(commands.includes('veer.newPlan'));
    for (const command of commands) {
      assert.ok(registeredCommands.has(command), `${command} is contributed but never registered`);
    }
  });

  it('gives every command the Veer category and the veer. prefix', () => {
    for (const command of pkg.contributes.commands) {
      assert.equal(command.category, 'Veer', command.command);
      assert.match(command.command, /^veer\./);
    }
  });

  it('uses only real context keys in when clauses', () => {
    const clauses = collect(pkg.contributes, 'when').filter((w): w is string => typeof w === 'string');
    for (const when of clauses) {
      for (const key of contextKeysOf(when)) {
        const known = BUILT_IN_CONTEXT_KEYS.has(key) || key.startsWith('config.') || ownContextKeys.has(key);
        assert.ok(known, `when clause "${when}" uses unknown context key "${key}"`);
      }
    }
  });

  it('reads context keys out of when clauses', () => {
    assert.deepEqual(contextKeysOf("editorLangId == veer && !isInDiffEditor || resourceExtname =~ /\\.veer$/"), [
      'editorLangId', 'isInDiffEditor', 'resourceExtname',
    ]);
    assert.deepEqual(contextKeysOf('resourceLangId in veer.planLanguages'), ['resourceLangId', 'veer.planLanguages']);
  });

  it('points at files that exist and that the package includes', () => {
    const globToRegExp = (glob: string) =>
      new RegExp(`^${glob.replace(/[.+^${}()|[\]\\]/g, '\\$&').replace(/\*\*\/?|\*/g, (m) => (m === '*' ? '[^/]*' : '.*'))}$`);
    const allowList = readFileSync(join(root, '.vscodeignore'), 'utf8')
      .split(/\r?\n/).filter((l) => l.startsWith('!')).map((l) => globToRegExp(l.slice(1)));
    const paths = [...collect(pkg.contributes, 'path'), ...collect(pkg.contributes, 'configuration')]
      .filter((p): p is string => typeof p === 'string');
    const icons = collect(pkg.contributes, 'icon').flatMap((i) =>
      typeof i === 'string' ? [i] : i && typeof i === 'object' ? Object.values(i as Record<string, string>) : [],
    ).filter((i) => !/^\$\(/.test(i));
    // The walkthrough's media (markdown and images) and the extension's own icon.
    const media = [...collect(pkg.contributes, 'markdown'), ...collect(pkg.contributes, 'image')].filter((m): m is string => typeof m === 'string');
    assert.ok(media.length >= 4, 'every walkthrough step has its media');
    assert.equal(typeof pkg.icon, 'string', 'the extension has an icon');
    assert.ok(paths.length >= 3, 'grammar, snippets and language configuration are contributed');
    for (const file of [...paths, ...icons, ...media, pkg.icon]) {
      const relative = posix.normalize(file);
      assert.ok(existsSync(join(root, relative)), `${file} does not exist`);
      assert.ok(
        allowList.some((allowed) => allowed.test(relative)),
        `${file} is not in the .vscodeignore allow-list`,
      );
    }
  });

  it('ships a page for the Extensions view with no image or link that could break there, and no build commands', () => {
    // vsce packages the file named by --readme-path as the extension's README.
    const script: string = pkg.scripts.package;
    const readmePath = /--readme-path (\S+)/.exec(script)?.[1];
    assert.ok(readmePath, 'npm run package names the extension page');
    const page = readFileSync(join(root, readmePath!), 'utf8');
    // Relative links and images are not resolved on the Extensions view's page (seen in the real editor).
    assert.doesNotMatch(page, /!\[[^\]]*\]\(/, 'no images');
    assert.doesNotMatch(page, /\]\((?!https?:)[^)]*\)/, 'no relative links');
    assert.doesNotMatch(page, /npm (install|test|run)/, 'no build commands for a user who installed the extension');
    // The commands it names exist.
    for (const [, title] of page.matchAll(/\*\*Veer: ([^*]+)\*\*/g)) {
      assert.ok(pkg.contributes.commands.some((c: { title: string }) => c.title === title), `no command "Veer: ${title}"`);
    }
  });

  it('builds its main entry point and keeps the editor version it promises', () => {
    const build = readFileSync(join(root, 'scripts', 'build.mjs'), 'utf8');
    assert.ok(build.includes(`outfile: '${posix.normalize(pkg.main)}'`), `scripts/build.mjs does not produce ${pkg.main}`);
    // The real-editor tool runs VS Code 1.100; vsce refuses @types/vscode newer than engines.vscode.
    const minimum = (range: string) => range.replace(/^[\^~>=]+/, '').split('.').map(Number);
    const [major, minor] = minimum(pkg.engines.vscode);
    assert.ok(major === 1 && minor <= 100, `engines.vscode ${pkg.engines.vscode} must allow 1.100`);
    const [typesMajor, typesMinor] = minimum(pkg.devDependencies['@types/vscode']);
    assert.ok(typesMajor === major && typesMinor <= minor, '@types/vscode must not be newer than engines.vscode');
  });

  it('declares untrusted and virtual workspace support', () => {
    assert.equal(pkg.capabilities.untrustedWorkspaces.supported, true);
    assert.equal(pkg.capabilities.virtualWorkspaces, true);
  });

  it('describes every setting', () => {
    const properties = pkg.contributes.configuration.properties as Record<string, { description?: string; markdownDescription?: string }>;
    assert.ok('veer.inlayHints.enabled' in properties && 'veer.check.delay' in properties);
    for (const [name, property] of Object.entries(properties)) {
      assert.ok(property.description || property.markdownDescription, `${name} has no description`);
    }
  });
});
