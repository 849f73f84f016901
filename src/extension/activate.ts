// Entry point of the VS Code extension: wires each feature adapter to the
// shared per-document analysis.
import * as vscode from 'vscode';
import { registerAnalysis } from './analysis';
import { registerCalibration } from './calibrate';
import { registerCodeActions } from './codeActions';
import { registerCompletion } from './completion';
import { registerDiagnostics } from './diagnostics';
import { registerHelp, registerReference } from './help';
import { registerHover } from './hover';
import { registerInlayHints } from './inlayHints';
import { registerNewPlan } from './newPlan';
import { registerPreview } from './preview';
import { registerRecordedRun } from './recordedRun';
import { registerSampling } from './sampling';
import { registerStatusBar } from './statusBar';
import { registerSymbols } from './symbols';

export async function activate(context: vscode.ExtensionContext): Promise<void> {
  // The reference's headings first, so the first problems already link to their sections.
  await registerHelp(context);
  // Subscribers first, so the analyses of already open plans reach them.
  registerDiagnostics(context);
  registerInlayHints(context);
  registerStatusBar(context);
  registerPreview(context);
  registerRecordedRun(context);
  registerSampling(context);
  registerHover(context);
  registerSymbols(context);
  registerCompletion(context);
  registerCodeActions(context);
  registerNewPlan(context);
  registerCalibration(context);
  registerReference(context);
  registerAnalysis(context);
}
