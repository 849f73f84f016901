// Calibration in a real editor: the command that writes the runs, the hover
// and the edits on the plan's setup lines from the record next to it, and the
// record's own problems.
const assert = require('assert');
const vscode = require('vscode');
const { fixtureUri, diagnosticsWhere, hoverText } = require('./helpers');

const PLAN = 'calibration-check.veer';
const RECORD = 'calibration-check.calib';
const WHEEL_LINE = 4;
const TRACK_LINE = 5;

/** Code actions at a line, asked again while the editor drops superseded answers. */
async function codeActions(uri, line) {
  let actions = [];
  for (let attempt = 0; attempt < 5 && actions.length === 0; attempt++) {
    actions = await vscode.commands.executeCommand('vscode.executeCodeActionProvider', uri, new vscode.Range(line, 0, line, 0));
  }
  return actions;
}

describe('Veer calibration', () => {
  let plan;

  before(async () => {
    plan = await vscode.workspace.openTextDocument(fixtureUri(PLAN));
    await vscode.window.showTextDocument(plan);
  });

  it('"Veer: Write Calibration Runs" opens the runs for the active plan beside it, and they check without errors', async () => {
    await vscode.window.showTextDocument(plan);
    await vscode.commands.executeCommand('veer.writeCalibrationRuns');
    const runs = vscode.window.activeTextEditor.document;
    assert.notEqual(runs.uri.toString(), plan.uri.toString());
    assert.equal(runs.languageId, 'veer');
    assert.match(runs.getText(), /^plan "Calibration runs for Calibration check"/);
    assert.match(runs.getText(), /lap clockwise \d+ mm ahead ___ left ___/);
    const diagnostics = await diagnosticsWhere(runs.uri, () => true);
    assert.deepEqual(diagnostics.filter((d) => d.severity === vscode.DiagnosticSeverity.Error).map((d) => d.message), []);
  });

  it('the plan\'s track line: a hover with the record\'s effective track, and the value as an edit', async () => {
    await vscode.window.showTextDocument(plan);
    const hovers = await vscode.commands.executeCommand('vscode.executeHoverProvider', plan.uri, new vscode.Position(TRACK_LINE, 1));
    // The spins of lines 3 and 5 (3588, 3588, 3590 for 3600) on the new 59.1 mm wheel: 120 × mean(3600/x) × 0.985.
    assert.match(hoverText(hovers), /effective track \(spins by encoders, 3 trials\)/);
    const actions = await codeActions(plan.uri, TRACK_LINE);
    const track = actions.find((a) => /^Set the effective track to 118\.\d+ mm/.test(a.title));
    assert.ok(track, actions.map((a) => a.title).join(' | '));
    const [edit] = track.edit.get(plan.uri);
    assert.match(edit.newText, /^ effective 118\.\d+$/);
  });

  it('the wheel line offers the wheel from the drives, and every value at once', async () => {
    const actions = await codeActions(plan.uri, WHEEL_LINE);
    const titles = actions.map((a) => a.title);
    // By hand: 60 × 985/1000 = 59.1 mm.
    assert.ok(titles.some((t) => t.startsWith('Set the wheel to 59.1 mm')), titles.join(' | '));
    const all = actions.find((a) => a.title.startsWith('Set every calibrated value'));
    assert.ok(all && all.isPreferred);
    const texts = all.edit.get(plan.uri).map((e) => e.newText);
    assert.ok(texts.includes('59.1 mm'));
    // By hand: the record's gyro line, 3612 read for 3600 deg: 3612/3600 = 1.00333.
    assert.ok(texts.includes('gyro scale 1.00333\n'));
  });

  it('the record: a hover per line with its result', async () => {
    const record = await vscode.workspace.openTextDocument(fixtureUri(RECORD));
    await vscode.window.showTextDocument(record);
    assert.equal(record.languageId, 'veer-calibration');
    const hovers = await vscode.commands.executeCommand('vscode.executeHoverProvider', record.uri, new vscode.Position(3, 2));
    // By hand: 3612/3600 = 1.00333; both trials read the same, so the interval is ± 0.
    assert.match(hoverText(hovers), /gyro reads 1\.00333 ± 0\.00000 times the true angle/);
  });

  it('a record\'s problem is underlined on its line, and goes when the line is mended', async () => {
    const record = await vscode.workspace.openTextDocument({ language: 'veer-calibration', content: 'drive 1000 mm measured 985 deg, 986\n' });
    await vscode.window.showTextDocument(record);
    const [problem] = await diagnosticsWhere(record.uri, (ds) => ds.length > 0);
    assert.equal(problem.range.start.line, 0);
    assert.match(problem.message, /`985 deg` is an angle, but a measured distance is a length/);
    const editor = vscode.window.activeTextEditor;
    await editor.edit((e) => e.replace(new vscode.Range(0, 27, 0, 30), 'mm'));
    await diagnosticsWhere(record.uri, (ds) => ds.length === 0);
  });
});
