// "Veer: Sample the Runs (Monte Carlo)" in a real editor: the command samples
// the active plan in a worker thread, the preview draws the cloud and says how
// many dots it shows, and the extension host keeps answering meanwhile.
const assert = require('assert');
const vscode = require('vscode');
const { fixtureUri } = require('./helpers');

const FIXTURE = 'seed-trays.veer';
// 0-based line of the mark in seed-trays.veer, read off the file.
const MARK_LINE = 17;

function previewTabs() {
  return vscode.window.tabGroups.all.flatMap((group) => group.tabs
    .filter((tab) => tab.input instanceof vscode.TabInputWebview && tab.input.viewType.endsWith('veer.preview')));
}

describe('Veer: Sample the Runs (Monte Carlo)', () => {
  let document;
  const config = () => vscode.workspace.getConfiguration('veer');

  before(async () => {
    document = await vscode.workspace.openTextDocument(fixtureUri(FIXTURE));
    await vscode.window.showTextDocument(document, vscode.ViewColumn.One);
  });

  after(async () => {
    await config().update('sampling.count', undefined, vscode.ConfigurationTarget.Global);
    const tabs = previewTabs();
    if (tabs.length) await vscode.window.tabGroups.close(tabs);
  });

  it('is a contributed command with a count setting of 1000 by default', async () => {
    const commands = await vscode.commands.getCommands(true);
    assert.ok(commands.includes('veer.sampleRuns'));
    assert.equal(config().inspect('sampling.count').defaultValue, 1000);
  });

  it('opens the preview when none shows the plan', async function () {
    // A new webview loads in a few seconds, longer on a busy machine; the command waits for it to draw the cloud.
    this.timeout(90000);
    await config().update('sampling.count', 10, vscode.ConfigurationTarget.Global);
    assert.equal(previewTabs().length, 0);
    const began = Date.now();
    const outcome = await vscode.commands.executeCommand('veer.sampleRuns');
    console.log(`      a new preview drew the cloud ${Date.now() - began} ms after the command started (sampling ${outcome && outcome.ms.toFixed(0)} ms)`);
    assert.equal(outcome.status, 'done');
    assert.equal(outcome.dots, 20, `10 sampled runs at the mark and at the run's end: ${JSON.stringify(outcome)}`);
    assert.equal(previewTabs().length, 1);
  });

  it('samples in a worker while the host keeps answering, and the preview draws every dot of the cloud', async () => {
    await config().update('sampling.count', 15000, vscode.ConfigurationTarget.Global);
    // The host's event loop while the command runs: a 5 ms timer's longest pause.
    let last = Date.now();
    let worst = 0;
    const timer = setInterval(() => {
      const now = Date.now();
      worst = Math.max(worst, now - last);
      last = now;
    }, 5);
    const began = Date.now();
    let outcome;
    try {
      outcome = await vscode.commands.executeCommand('veer.sampleRuns');
    } finally {
      clearInterval(timer);
    }
    const took = Date.now() - began;
    assert.ok(outcome, 'the command ran');
    assert.equal(outcome.status, 'done');
    assert.equal(outcome.count, 15000);
    // The preview drew the mark's cloud and the run's end (150 mm on), 2,000 dots each (render/cloud.ts MAX_DRAWN_POINTS).
    assert.equal(outcome.dots, 4000, 'the preview reports every dot on screen');
    const mark = outcome.marks.find((m) => m.line === MARK_LINE);
    assert.ok(mark, JSON.stringify(outcome.marks));
    assert.equal(mark.label, 'misted');
    // The sampled share against the linear model's chance: 3 binomial standard errors √(p(1−p)/N), plus the
    // controller simulation's small offset of the sampled runs (the linear model is about the planned pose):
    // 0.02, common practice, no published source.
    const p = mark.linear;
    assert.ok(Math.abs(mark.sampled - p) <= 3 * Math.sqrt((p * (1 - p)) / 15000) + 0.02, `sampled ${mark.sampled} vs linear ${p}`);
    // The host's longest pause is well short of the sampling's time, which it would be all of, had the host sampled
    // (a relation, not a time limit, so that a busy machine cannot fail it; the pause is printed for the record).
    console.log(`      sampled 15,000 runs in ${outcome.ms.toFixed(0)} ms (command ${took} ms); the host's longest pause: ${worst} ms`);
    assert.ok(worst < outcome.ms / 2, `the host's longest pause (${worst} ms) is most of the sampling's ${outcome.ms.toFixed(0)} ms`);
  });

  it('runs one sampling at a time: a second request while one runs is turned away', async () => {
    await config().update('sampling.count', 15000, vscode.ConfigurationTarget.Global);
    const first = vscode.commands.executeCommand('veer.sampleRuns');
    const second = await vscode.commands.executeCommand('veer.sampleRuns');
    assert.equal(second, undefined);
    assert.equal((await first).status, 'done');
  });

  it('refuses a count outside 10 to 100,000 without sampling', async () => {
    await config().update('sampling.count', 3, vscode.ConfigurationTarget.Global);
    const outcome = await vscode.commands.executeCommand('veer.sampleRuns');
    assert.equal(outcome, undefined);
  });
});
