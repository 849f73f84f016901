// Language features in a real editor: diagnostics, hovers, inlay hints, quick
// fixes, the source action, the outline, completion and the New Plan command.
const assert = require('assert');
const vscode = require('vscode');
const { fixtureUri, diagnosticsWhere, codeOf, scratchCopy, hoverText } = require('./helpers');

const FIXTURE = 'wrap-check.veer';
const WRAP_LINE = 11; // the second `turn 90 by gyro`: reading 90 + 90 = target 180, outside [-180, 180)

// Wheel and motor degrees of a 90° spin on 58 mm wheels: each wheel runs the arc
// s = (W/2)·θ (arc length formula), i.e. W·θ/D wheel degrees; W = 121 mm measured
// (gyro turns), 123 mm effective (encoder turns, spec section 5).
const GYRO_SPIN_WHEEL_DEG = ((121 * 90) / 58).toFixed(1); // 187.8
const ENCODER_SPIN_MOTOR_DEG = ((123 * 90) / 58).toFixed(1); // 190.9

const hasWrapCross = (diagnostics) => diagnostics.some((d) => codeOf(d) === 'wrap-cross');

/**
 * The editor's code actions at a range. The editor drops a request's answer
 * when a newer request for the same editor supersedes it (the light bulb asks
 * on its own as a document opens), so an empty answer is asked again, a few times.
 */
async function codeActions(uri, range, kind) {
  let actions = [];
  for (let attempt = 0; attempt < 5 && actions.length === 0; attempt++) {
    actions = await vscode.commands.executeCommand('vscode.executeCodeActionProvider', uri, range, kind);
  }
  return actions;
}

describe('Veer language features', () => {
  let document;

  before(async () => {
    const extension = vscode.extensions.all.find((e) => e.packageJSON.name === 'veer');
    assert.ok(extension, 'the Veer extension is loaded');
    document = await vscode.workspace.openTextDocument(fixtureUri(FIXTURE));
    await vscode.window.showTextDocument(document);
    assert.equal(document.languageId, 'veer');
  });

  it('reports the wrap crossing with its range, related docs link and no other problem', async () => {
    const diagnostics = await diagnosticsWhere(document.uri, hasWrapCross);
    assert.deepEqual(diagnostics.map(codeOf), ['wrap-cross']);
    const [wrap] = diagnostics;
    assert.equal(wrap.severity, vscode.DiagnosticSeverity.Error);
    assert.deepEqual(
      [wrap.range.start.line, wrap.range.start.character, wrap.range.end.line, wrap.range.end.character],
      [WRAP_LINE, 0, WRAP_LINE, 'turn 90 by gyro'.length],
    );
    assert.equal(wrap.source, 'veer');
    assert.equal(wrap.code.value, 'wrap-cross');
  });

  it('the problem code\'s link opens the reference at that code\'s section, read-only', async () => {
    const [wrap] = await diagnosticsWhere(document.uri, hasWrapCross);
    // What the editor does when the link is followed (hover or Problems panel).
    await vscode.commands.executeCommand('vscode.open', wrap.code.target);
    const editor = vscode.window.activeTextEditor;
    assert.ok(editor);
    assert.equal(editor.document.uri.scheme, 'veer-help', 'served by the extension, not the editable file');
    assert.equal(editor.document.lineAt(editor.selection.active.line).text, '## wrap-cross');
    await vscode.commands.executeCommand('workbench.action.closeActiveEditor');
  });

  it('hovers a motion line with its wheel degrees and yaw target', async () => {
    const hovers = await vscode.commands.executeCommand('vscode.executeHoverProvider', document.uri, new vscode.Position(10, 1));
    const text = hoverText(hovers);
    assert.match(text, /\*\*turn\*\* · spin · by gyro/);
    assert.ok(text.includes(`wheel degrees: L ${GYRO_SPIN_WHEEL_DEG}°, R -${GYRO_SPIN_WHEEL_DEG}°`), text);
    assert.ok(text.includes('yaw target: 90°'), text);
    assert.ok(text.includes('| heading | 0° | 90° |'), text);
  });

  it('hovers a name and a value with units', async () => {
    const onName = hoverText(await vscode.commands.executeCommand('vscode.executeHoverProvider', document.uri, new vscode.Position(9, 12)));
    assert.ok(onName.includes('`lane` = **250 mm**'), onName);
    const onValue = hoverText(await vscode.commands.executeCommand('vscode.executeHoverProvider', document.uri, new vscode.Position(9, 6)));
    assert.ok(onValue.includes('**750 mm**'), onValue); // 3 × 250 mm
  });

  it('shows end heading, yaw reading and encoder motor degrees as inlay hints', async () => {
    const range = new vscode.Range(0, 0, document.lineCount, 0);
    const hints = await vscode.commands.executeCommand('vscode.executeInlayHintProvider', document.uri, range);
    const label = (line) => {
      const hint = hints.find((h) => h.position.line === line);
      return hint && (typeof hint.label === 'string' ? hint.label : hint.label.map((p) => p.value).join(''));
    };
    assert.equal(label(10), `→ 90° · yaw 90° · L ${Math.round(GYRO_SPIN_WHEEL_DEG)}° R -${Math.round(GYRO_SPIN_WHEEL_DEG)}°`);
    // 0 + 3 × 90 = 270° on the field; the yaw reading wrapped at 180 reads -180 + 90 = -90.
    assert.equal(label(12), `→ 270° · yaw -90° · L ${Math.round(ENCODER_SPIN_MOTOR_DEG)}° R -${Math.round(ENCODER_SPIN_MOTOR_DEG)}°`);
    assert.equal(hints.find((h) => h.position.line === 12).position.character, 'turn 90 by encoders'.length);
  });

  it('lists the runs, their motion lines and marks in the outline', async () => {
    const symbols = await vscode.commands.executeCommand('vscode.executeDocumentSymbolProvider', document.uri);
    assert.deepEqual(symbols.map((s) => s.name), ['loop', 'second']);
    assert.deepEqual(symbols[0].children.map((c) => c.name), [
      'start (200, 200) heading 0', 'drive 3 * lane speed 60% hold 0', 'turn 90 by gyro', 'turn 90 by gyro',
      'turn 90 by encoders', 'end',
    ]);
    assert.equal(symbols[0].children[5].kind, vscode.SymbolKind.Key);
  });

  for (const [title, expectedLine, expectedNextLine] of [
    ['Add reset to this turn', 'turn 90 by gyro reset', 'turn 90 by encoders'],
    ['Insert "reset yaw" before this line', 'reset yaw', 'turn 90 by gyro'],
  ]) {
    it(`quick fix "${title}" removes the wrap crossing`, async () => {
      const scratch = await scratchCopy(FIXTURE);
      const [wrap] = await diagnosticsWhere(scratch.uri, hasWrapCross);
      const actions = await codeActions(scratch.uri, wrap.range, vscode.CodeActionKind.QuickFix.value);
      const action = actions.find((a) => a.title.startsWith(title));
      assert.ok(action, `no "${title}" among ${actions.map((a) => a.title).join(' | ')}`);
      assert.equal(actions.filter((a) => a.isPreferred).length, 1, 'exactly one preferred fix');
      assert.ok(await vscode.workspace.applyEdit(action.edit));
      assert.equal(scratch.lineAt(WRAP_LINE).text, expectedLine);
      assert.equal(scratch.lineAt(WRAP_LINE + 1).text, expectedNextLine);
      await diagnosticsWhere(scratch.uri, (d) => !hasWrapCross(d));
      await vscode.commands.executeCommand('workbench.action.revertAndCloseActiveEditor');
    });
  }

  it('an overshooting gyro turn gets a quick fix the simulation shows works, and applying it clears the warning', async () => {
    // The default motor (80 ms lag) at 50 % power coasts past a 1° stop band.
    const content = ['# An invented bench test: one gyro turn.', 'wheel 56 mm', 'track 120 mm', 'start (500, 500) heading 0', 'turn 90 by gyro', ''].join('\n');
    const scratch = await vscode.workspace.openTextDocument({ language: 'veer', content });
    await vscode.window.showTextDocument(scratch);
    const hasOvershoot = (d) => d.some((x) => codeOf(x) === 'overshoot');
    const [warning] = (await diagnosticsWhere(scratch.uri, hasOvershoot)).filter((x) => codeOf(x) === 'overshoot');
    assert.match(warning.message, /overshoots: it is predicted to end [\d.]+° past the target/);
    const actions = await codeActions(scratch.uri, warning.range, vscode.CodeActionKind.QuickFix.value);
    const preferred = actions.find((a) => a.isPreferred);
    assert.ok(preferred, `no preferred fix among ${actions.map((a) => a.title).join(' | ')}`);
    assert.match(preferred.title, /\(predicted: [\d.]+° (past|short of) the target, [\d.]+ s\)$/);
    assert.ok(await vscode.workspace.applyEdit(preferred.edit));
    assert.match(scratch.lineAt(4).text, /^turn 90 by gyro (stop [\d.]+ deg|min [\d.]+%|gain [\d.]+|speed [\d.]+%|ramp)$/);
    await diagnosticsWhere(scratch.uri, (d) => !hasOvershoot(d));
    await vscode.commands.executeCommand('workbench.action.revertAndCloseActiveEditor');
  });

  it('source action inserts the fewest yaw resets', async () => {
    const scratch = await scratchCopy(FIXTURE);
    await diagnosticsWhere(scratch.uri, hasWrapCross);
    const whole = new vscode.Range(0, 0, scratch.lineCount, 0);
    const actions = await codeActions(scratch.uri, whole, 'source.veer.fewestResets');
    assert.equal(actions.length, 1, actions.map((a) => a.title).join(' | '));
    const resets = () => scratch.getText().split(/\r?\n/).filter((l) => /\breset\b/.test(l)).length;
    const before = resets();
    assert.ok(await vscode.workspace.applyEdit(actions[0].edit));
    const after = resets();
    assert.equal(after - before, 1, 'one reset is enough for one crossing');
    await diagnosticsWhere(scratch.uri, (d) => !hasWrapCross(d));
    await vscode.commands.executeCommand('workbench.action.revertAndCloseActiveEditor');
  });

  // The coach's plan of the fix engine's tests: a turn to 180 followed by `hold 180`.
  // Each fix must keep the path, so the hold is rewritten to the same heading counted
  // from the new zero (90), never left as a 90° swerve or made a hold of 450.
  const SWERVE = 'swerve-check.veer';
  const swerveLines = (replace) => {
    const lines = ['# Editor test fixture: an invented hallway run whose second gyro turn aims at 180.', 'motor 900 deg/s lag 20 ms', 'wheel 60 mm',
      'track 130 mm', 'start (150, 150) heading 0', 'drive 550 hold 0', 'turn 90 by gyro min 10%', 'drive 900 hold 90',
      'turn 90 by gyro min 10%', 'drive 300 hold 180', 'turn -90 arc 200', ''];
    return replace(lines).join('\n');
  };
  for (const [title, expected] of [
    ['Add reset to this turn', swerveLines((l) => [...l.slice(0, 8), 'turn 90 by gyro min 10% reset', 'drive 300 hold 90', ...l.slice(10)])],
    ['Insert "reset yaw" before this line', swerveLines((l) => [...l.slice(0, 8), 'reset yaw', 'turn 90 by gyro min 10%', 'drive 300 hold 90', ...l.slice(10)])],
  ]) {
    it(`on a hold of 180 after the crossing, "${title}" rewrites the hold and leaves no problem`, async () => {
      const scratch = await scratchCopy(SWERVE);
      const diagnostics = await diagnosticsWhere(scratch.uri, hasWrapCross);
      // One root cause, one problem: the hold is related information, not a second error.
      assert.deepEqual(diagnostics.map(codeOf), ['wrap-cross']);
      assert.deepEqual(diagnostics[0].relatedInformation.map((r) => r.location.range.start.line), [9]);
      const actions = await codeActions(scratch.uri, diagnostics[0].range, vscode.CodeActionKind.QuickFix.value);
      const action = actions.find((a) => a.title.startsWith(title));
      assert.ok(action, `no "${title}" among ${actions.map((a) => a.title).join(' | ')}`);
      assert.ok(await vscode.workspace.applyEdit(action.edit));
      assert.equal(scratch.getText(), expected);
      await diagnosticsWhere(scratch.uri, (d) => d.length === 0);
      await vscode.commands.executeCommand('workbench.action.revertAndCloseActiveEditor');
    });
  }

  it('on the same plan, the fewest-resets source action inserts one reset and rewrites the holds', async () => {
    const scratch = await scratchCopy(SWERVE);
    await diagnosticsWhere(scratch.uri, hasWrapCross);
    const whole = new vscode.Range(0, 0, scratch.lineCount, 0);
    const actions = await codeActions(scratch.uri, whole, 'source.veer.fewestResets');
    assert.equal(actions.length, 1, actions.map((a) => a.title).join(' | '));
    assert.match(actions[0].title, /^Insert the fewest yaw resets that remove the wrap crossings \(1 reset; the path stays the same\)$/);
    assert.ok(await vscode.workspace.applyEdit(actions[0].edit));
    // One reset anywhere from before the drive of 900 to before the turn removes the crossing; the one just before
    // the turn leaves the smaller spread at the run's end (the core's tests), so only the last hold is rewritten.
    assert.equal(scratch.getText(), swerveLines((l) => [...l.slice(0, 8), 'reset yaw', 'turn 90 by gyro min 10%', 'drive 300 hold 90', ...l.slice(10)]));
    assert.doesNotMatch(scratch.getText(), /hold 450/);
    await diagnosticsWhere(scratch.uri, (d) => d.length === 0);
    await vscode.commands.executeCommand('workbench.action.revertAndCloseActiveEditor');
  });

  it('the refactoring "Insert `reset yaw` before line N" inserts the reset that shrinks the run\'s final spread, keeping the path', async () => {
    // An invented shelf run: a reset after a long encoder drive puts its heading error into the reference; a reset
    // again just after squaring on the top wall gives the later gyro motions the square's small error instead.
    const lines = ['wheel 56 mm', 'track 120 mm', 'field 2000 by 2000', 'start (300, 300) heading 0', 'drive 1000', 'reset yaw', 'drive 500',
      'square front', 'drive -300', 'turn 90 by gyro', 'drive 800 hold 90', 'turn to 0 by gyro', 'drive 300', ''];
    const doc = await vscode.workspace.openTextDocument({ language: 'veer', content: lines.join('\n') });
    await vscode.window.showTextDocument(doc);
    await diagnosticsWhere(doc.uri, () => true);
    const actions = await codeActions(doc.uri, new vscode.Range(9, 0, 9, 0), 'refactor.veer.bestReset');
    assert.equal(actions.length, 1, actions.map((a) => a.title).join(' | '));
    assert.match(actions[0].title, /^Insert `reset yaw` before line 9: the run ends within \d+ mm instead of \d+ mm/);
    assert.ok(await vscode.workspace.applyEdit(actions[0].edit));
    assert.equal(doc.getText(), [...lines.slice(0, 8), 'reset yaw', ...lines.slice(8)].join('\n'));
    await vscode.commands.executeCommand('workbench.action.revertAndCloseActiveEditor');
  });

  it('completes turn options, the words after `pivot`, and units', async () => {
    const scratch = await vscode.workspace.openTextDocument({ language: 'veer', content: 'turn 90 pivot \ndrive 40 \ndrive 40 c' });
    const labels = async (line, character) => {
      const list = await vscode.commands.executeCommand('vscode.executeCompletionItemProvider', scratch.uri, new vscode.Position(line, character));
      return list.items.map((i) => (typeof i.label === 'string' ? i.label : i.label.label));
    };
    const afterPivot = await labels(0, 14);
    assert.ok(afterPivot.includes('left') && afterPivot.includes('right'), afterPivot.join(','));
    // After a number and a space: the drive's options; a unit only once one is being typed (and only lengths here).
    const afterNumber = await labels(1, 9);
    assert.ok(afterNumber.includes('speed') && afterNumber.includes('hold') && !afterNumber.includes('mm'), afterNumber.join(','));
    const typingUnit = await labels(2, 10);
    assert.ok(typingUnit.includes('cm') && !typingUnit.includes('deg'), typingUnit.join(','));
  });

  it('"Veer: Open the Plan Reference" shows the language reference', async () => {
    const opened = new Promise((resolve) => {
      const check = () => {
        const tab = vscode.window.tabGroups.all.flatMap((g) => g.tabs).find((t) => /language\.md/.test(t.label));
        if (tab) { sub.dispose(); resolve(tab); }
      };
      const sub = vscode.window.tabGroups.onDidChangeTabs(check);
      check();
    });
    await vscode.commands.executeCommand('veer.openReference');
    const tab = await opened;
    assert.match(tab.label, /language\.md/);
    await vscode.commands.executeCommand('workbench.action.closeAllEditors');
  });

  it('"Veer: New Plan" opens a template plan that checks cleanly', async () => {
    await vscode.commands.executeCommand('veer.newPlan');
    const editor = vscode.window.activeTextEditor;
    assert.ok(editor);
    assert.equal(editor.document.languageId, 'veer');
    assert.ok(editor.document.isUntitled);
    // A plain file name for the first save, not the plan's first line.
    assert.ok(editor.document.uri.path.endsWith('watering-round.veer'), editor.document.uri.toString());
    assert.match(editor.document.getText(), /^# A first plan/);
    const symbols = await vscode.commands.executeCommand('vscode.executeDocumentSymbolProvider', editor.document.uri);
    assert.deepEqual(symbols.map((s) => s.name), ['to the tap']);
    assert.deepEqual(vscode.languages.getDiagnostics(editor.document.uri).map(codeOf), []);
    await vscode.commands.executeCommand('workbench.action.revertAndCloseActiveEditor');
  });
});
