// A hostile plan open in the editor changes nothing for the other plans: the
// clean plan opened after it has the diagnostics and hovers it has alone.
const assert = require('assert');
const vscode = require('vscode');
const { fixtureUri, diagnosticsWhere, codeOf, hoverText } = require('./helpers');

describe('Veer with a hostile plan open', () => {
  it('reports the hostile plan\'s lines as problems, and the clean plan opened next is unharmed', async () => {
    const hostile = await vscode.workspace.openTextDocument(fixtureUri('hostile.veer'));
    await vscode.window.showTextDocument(hostile);
    // Every line that reaches beyond numbers and units has its own problem.
    const problems = await diagnosticsWhere(hostile.uri, (d) => d.length >= 6);
    const lines = new Set(problems.map((d) => d.range.start.line));
    for (const line of [3, 4, 5, 6, 7, 8]) assert.ok(lines.has(line), `no problem on line ${line}: ${JSON.stringify(problems.map((d) => [d.range.start.line, codeOf(d)]))}`);
    assert.ok(problems.every((d) => d.message.length < 600), 'messages quote briefly');

    const clean = await vscode.workspace.openTextDocument(fixtureUri('settings-check.veer'));
    await vscode.window.showTextDocument(clean);
    await diagnosticsWhere(clean.uri, (d) => d.length === 0, 15000);
    // max(100 mm, 300 mm) is 300 mm (the definition of max), whatever the hostile plan tried with the tolerances.
    const onWide = hoverText(await vscode.commands.executeCommand('vscode.executeHoverProvider', clean.uri, new vscode.Position(3, 6)));
    assert.ok(onWide.includes('`wide` = **300 mm**'), onWide);
    const onTiny = hoverText(await vscode.commands.executeCommand('vscode.executeHoverProvider', clean.uri, new vscode.Position(4, 6)));
    assert.ok(onTiny.includes('`tiny` = **0.3**'), onTiny);
    // The drive is drawn where 300 mm takes it: its hover gives the end pose.
    const onDrive = hoverText(await vscode.commands.executeCommand('vscode.executeHoverProvider', clean.uri, new vscode.Position(6, 1)));
    assert.ok(/1[,]?300/.test(onDrive), onDrive);
  });
});
