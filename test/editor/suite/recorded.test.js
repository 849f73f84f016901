// "Veer: Overlay a Recorded Run" in a real editor: the command reads a log of
// the active plan's run (a copy of examples/parcel-table.log.csv, made by
// scripts/recorded-run.ts), lays it over the plan in the preview, and answers
// with what it found; a bad log gets a message naming its line and column;
// "Veer: Clear the Recorded Run" forgets it.
const assert = require('assert');
const vscode = require('vscode');
const { fixtureUri } = require('./helpers');

function previewTabs() {
  return vscode.window.tabGroups.all.flatMap((group) => group.tabs
    .filter((tab) => tab.input instanceof vscode.TabInputWebview && tab.input.viewType.endsWith('veer.preview')));
}

/** Resolves once a preview tab is listed (the tab list changes by event; a deadline fails the test instead of hanging it). */
function previewShown(timeoutMs = 15000) {
  return new Promise((resolve, reject) => {
    const check = () => {
      if (previewTabs().length === 1) {
        done();
        resolve();
      }
    };
    const subscriptions = [vscode.window.tabGroups.onDidChangeTabs(check), vscode.window.tabGroups.onDidChangeTabGroups(check)];
    const timer = setTimeout(() => {
      done();
      reject(new Error(`no preview tab; tabs: ${vscode.window.tabGroups.all.flatMap((g) => g.tabs.map((t) => t.label)).join(', ')}`));
    }, timeoutMs);
    const done = () => {
      subscriptions.forEach((d) => d.dispose());
      clearTimeout(timer);
    };
    check();
  });
}

describe('Veer: Overlay a Recorded Run', () => {
  before(async () => {
    await vscode.extensions.getExtension('veer-dev.veer').activate();
    const document = await vscode.workspace.openTextDocument(fixtureUri('recorded-check.veer'));
    await vscode.window.showTextDocument(document, vscode.ViewColumn.One);
  });

  after(async () => {
    const tabs = previewTabs();
    if (tabs.length) await vscode.window.tabGroups.close(tabs);
  });

  it('contributes the overlay and the clear commands', async () => {
    const commands = await vscode.commands.getCommands(true);
    assert.ok(commands.includes('veer.overlayRecordedRun'));
    assert.ok(commands.includes('veer.clearRecordedRun'));
  });

  it('imports the log, finds every moving motion by its line column, and shows it in the preview', async () => {
    const outcome = await vscode.commands.executeCommand('veer.overlayRecordedRun', fixtureUri('recorded-check.log.csv'));
    assert.equal(outcome.status, 'shown', JSON.stringify(outcome));
    assert.equal(outcome.run, 'to the dock');
    assert.equal(outcome.motions, 4, 'drive, gyro turn, drive, pivot');
    assert.equal(outcome.alignedBy, 'line');
    // The log's true robot has 1 % smaller wheels and a 2 % wider track (the log's header): its reconstructed end
    // lies some tens of millimetres from the planned one (30.0 mm by `veer replay`).
    assert.ok(outcome.endOffPlanMm > 10 && outcome.endOffPlanMm < 60, `${outcome.endOffPlanMm} mm`);
    assert.ok(outcome.fixes >= 1, 'the fitted values are offered as setup edits');
    await previewShown();
  });

  it('a log with time running backwards: an error naming its line and column, nothing drawn', async () => {
    const outcome = await vscode.commands.executeCommand('veer.overlayRecordedRun', fixtureUri('recorded-bad.log.csv'));
    assert.equal(outcome.status, 'error');
    assert.match(outcome.message, /recorded-bad\.log\.csv: line 4, column 1 \(time_s\): time 0\.005 is before the row before's \(0\.01\)/);
    assert.equal(outcome.line, 4);
    assert.equal(outcome.column, 1);
  });

  it('clears the remembered log', async () => {
    assert.equal(await vscode.commands.executeCommand('veer.clearRecordedRun'), true);
    assert.equal(await vscode.commands.executeCommand('veer.clearRecordedRun'), false);
  });
});
