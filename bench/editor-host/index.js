// Editor benchmarks that must run inside the real extension host, started by
// bench/editor.mjs through `real-editor.sh ext-test WS EXT_DIR bench/editor-host`:
//
//   activate: load + activate of the extension bundle, measured by requiring a
//     fresh copy of dist/extension.js and calling activate() with a context
//     carrying what activate uses. It runs first, while no plan is open, so
//     the editor has not activated the extension itself (its only activation
//     events are a plan opening and a restored preview).
//   keystroke: on the 1,000-segment plan VEER_BENCH_PLAN (in the workspace),
//     one-character WorkspaceEdits that make an error appear and go again,
//     each timed from the change reaching the extension host (as a typed key
//     does: onDidChangeTextDocument) to the new diagnostics being in place
//     (read with languages.getDiagnostics, polled every turn of the event
//     loop), minus `veer.check.delay`. Reported too: the same from the
//     applyEdit call (which adds the WorkspaceEdit's round trip through the
//     workbench, a trip a typed key does not make), and the time of the
//     onDidChangeDiagnostics event, which the editor holds back 50 ms.
//
// The figures go to the JSON file named by VEER_BENCH_OUT; the Promise of
// run() rejects when anything fails, so ext-test exits non-zero.
const fs = require('fs');
const path = require('path');
const vscode = require('vscode');
const { median, round } = require('../stats');

const EXTENSION_ID = 'veer-dev.veer';
const ACTIVATE_ROUNDS = 15;
const KEYSTROKE_WARM_UP = 3;
const KEYSTROKE_ROUNDS = 20;
/** Deadline of each wait for an editor event: generous, for loaded machines. */
const EVENT_TIMEOUT_MS = 30000;


function fakeContext(extensionPath) {
  const extensionUri = vscode.Uri.file(extensionPath);
  return {
    subscriptions: [],
    extensionUri,
    extensionPath,
    asAbsolutePath: (relative) => path.join(extensionPath, relative),
  };
}

function activateTimes(extensionPath) {
  const bundle = require.resolve(path.join(extensionPath, 'dist', 'extension.js'));
  const times = [];
  const eventTimes = [];
  const totalTimes = [];
  const errorCount = () => vscode.languages.getDiagnostics(planUri).filter((d) => d.severity === vscode.DiagnosticSeverity.Error).length;
  for (let i = 0; i < ACTIVATE_ROUNDS; i++) {
    delete require.cache[bundle];
    const context = fakeContext(extensionPath);
    const started = performance.now();
    require(bundle).activate(context);
    times.push(performance.now() - started);
    // Commands and serializers can be registered once only: undo everything before the next round.
    for (const subscription of context.subscriptions) subscription.dispose();
  }
  delete require.cache[bundle];
  return times;
}

/** Resolves at the next onDidChangeDiagnostics event naming `uri`. */
function nextDiagnosticsChange(uri) {
  return new Promise((resolve, reject) => {
    const subscription = vscode.languages.onDidChangeDiagnostics((event) => {
      if (!event.uris.some((u) => u.toString() === uri.toString())) return;
      done();
      resolve(performance.now());
    });
    const timer = setTimeout(() => {
      done();
      reject(new Error(`no diagnostics event for ${uri} within ${EVENT_TIMEOUT_MS} ms`));
    }, EVENT_TIMEOUT_MS);
    const done = () => {
      subscription.dispose();
      clearTimeout(timer);
    };
  });
}

async function keystrokeTimes(planUri) {
  await vscode.workspace.getConfiguration('veer').update('check.delay', 0, vscode.ConfigurationTarget.Global);
  const delay = vscode.workspace.getConfiguration('veer').get('check.delay');
  const opened = nextDiagnosticsChange(planUri);
  const document = await vscode.workspace.openTextDocument(planUri);
  await vscode.window.showTextDocument(document);
  await opened;
  const errors = vscode.languages.getDiagnostics(planUri).filter((d) => d.severity === vscode.DiagnosticSeverity.Error);
  if (errors.length) throw new Error(`the benchmark plan has errors: ${errors.slice(0, 3).map((d) => d.message).join('; ')}`);

  // The first digit of a speed in the middle of the plan, toggled between `6`
  // (60 %, fine) and `-` (-0 %, an error: the robot would not move), so every
  // edit changes the diagnostics.
  const line = document.getText().split('\n').findIndex((l, i) => i > document.lineCount / 2 && /^drive .*speed 60%/.test(l));
  if (line < 0) throw new Error('no `drive ... speed 60%` line in the second half of the plan');
  const column = document.lineAt(line).text.indexOf('60%');
  const range = new vscode.Range(line, column, line, column + 1);

  const times = [];
  const eventTimes = [];
  const totalTimes = [];
  const errorCount = () => vscode.languages.getDiagnostics(planUri).filter((d) => d.severity === vscode.DiagnosticSeverity.Error).length;
  // The editor's own share: the edit's round trip through the workbench until
  // the extension host sees the change (onDidChangeTextDocument).
  const echoes = [];
  for (let i = 0; i < KEYSTROKE_WARM_UP + KEYSTROKE_ROUNDS; i++) {
    const edit = new vscode.WorkspaceEdit();
    const expectError = i % 2 === 0;
    edit.replace(planUri, range, expectError ? '-' : '6');
    const changed = nextDiagnosticsChange(planUri);
    let echoed;
    const echo = vscode.workspace.onDidChangeTextDocument((event) => {
      if (echoed === undefined && event.document.uri.toString() === planUri.toString()) echoed = performance.now();
    });
    const started = performance.now();
    if (!(await vscode.workspace.applyEdit(edit))) throw new Error('the editor refused the edit');
    let inPlace = performance.now();
    while ((errorCount() === 1) !== expectError) {
      if (inPlace - started > EVENT_TIMEOUT_MS) throw new Error('the diagnostics did not change after an edit');
      await new Promise((resolve) => setImmediate(resolve));
      inPlace = performance.now();
    }
    const ended = await changed;
    echo.dispose();
    if (echoed === undefined) throw new Error('the diagnostics event came before the document change event');
    if (i >= KEYSTROKE_WARM_UP) {
      times.push(inPlace - echoed - delay);
      totalTimes.push(inPlace - started - delay);
      eventTimes.push(ended - started - delay);
      echoes.push(echoed - started);
    }
  }
  await vscode.commands.executeCommand('workbench.action.revertAndCloseActiveEditor');
  return { times, totalTimes, eventTimes, echoes, delay };
}

async function run() {
  const out = process.env.VEER_BENCH_OUT;
  const plan = process.env.VEER_BENCH_PLAN;
  if (!out || !plan) throw new Error('VEER_BENCH_OUT and VEER_BENCH_PLAN must be set');
  const extension = vscode.extensions.getExtension(EXTENSION_ID);
  if (!extension) throw new Error(`${EXTENSION_ID} is not loaded`);
  if (extension.isActive) throw new Error(`${EXTENSION_ID} is already active: the activation figure would share its modules`);

  const activate = activateTimes(extension.extensionPath);
  const keystroke = await keystrokeTimes(vscode.Uri.file(plan));
  const figures = {
    activate_ms: round(median(activate)),
    activate_first_ms: round(activate[0]),
    keystroke_diag_ms: round(median(keystroke.times)),
    keystroke_diag_total_ms: round(median(keystroke.totalTimes)),
    keystroke_diag_event_ms: round(median(keystroke.eventTimes)),
    keystroke_edit_echo_ms: round(median(keystroke.echoes)),
    keystroke_check_delay_ms: keystroke.delay,
  };
  console.log(`editor-host bench: ${JSON.stringify(figures)}`);
  fs.writeFileSync(out, `${JSON.stringify(figures, null, 2)}\n`);
}

module.exports = { run };
