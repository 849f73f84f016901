// Every conversion from the core's plain data to editor objects lives here, so
// the feature adapters stay thin and agree on positions and severities.
import * as vscode from 'vscode';
import type * as core from '../core';
import type { CompletionInfo, HoverInfo, InlayHintInfo, PlanSymbol } from '../core/insight';
import { helpUri } from './help';


export const DIAGNOSTIC_SOURCE = 'veer';

export function toPosition(pos: core.Pos): vscode.Position {
  return new vscode.Position(pos.line, pos.character);
}

export function toRange(range: core.Range): vscode.Range {
  return new vscode.Range(toPosition(range.start), toPosition(range.end));
}

export function fromPosition(position: vscode.Position): core.Pos {
  return { line: position.line, character: position.character };
}

export function toSeverity(severity: core.Severity): vscode.DiagnosticSeverity {
  switch (severity) {
    case 'error':
      return vscode.DiagnosticSeverity.Error;
    case 'warning':
      return vscode.DiagnosticSeverity.Warning;
    case 'information':
      return vscode.DiagnosticSeverity.Information;
  }
}



export function toDiagnostic(uri: vscode.Uri, diagnostic: core.Diagnostic): vscode.Diagnostic {
  const converted = new vscode.Diagnostic(toRange(diagnostic.range), diagnostic.message, toSeverity(diagnostic.severity));
  converted.source = DIAGNOSTIC_SOURCE;
  // The code links into the extension's own reference, read-only, at the code's section.
  converted.code = { value: diagnostic.code, target: helpUri(diagnostic.code) };
  if (diagnostic.related?.length) {
    converted.relatedInformation = diagnostic.related.map(
      (info) => new vscode.DiagnosticRelatedInformation(new vscode.Location(uri, toRange(info.range)), info.message),
    );
  }
  return converted;
}

/** The diagnostic's code as a plain string, whichever form the editor hands back. */
export function codeOf(diagnostic: vscode.Diagnostic): string | undefined {
  const code = diagnostic.code;
  if (code === undefined) return undefined;
  return typeof code === 'object' ? String(code.value) : String(code);
}

export function toTextEdit(edit: core.TextEdit): vscode.TextEdit {
  return new vscode.TextEdit(toRange(edit.range), edit.newText);
}

export function toWorkspaceEdit(uri: vscode.Uri, edits: core.TextEdit[]): vscode.WorkspaceEdit {
  const workspaceEdit = new vscode.WorkspaceEdit();
  workspaceEdit.set(uri, edits.map(toTextEdit));
  return workspaceEdit;
}

export function toCodeAction(
  uri: vscode.Uri,
  fix: core.Fix,
  kind: vscode.CodeActionKind,
  diagnostics: vscode.Diagnostic[],
): vscode.CodeAction {
  const action = new vscode.CodeAction(fix.title, kind);
  action.edit = toWorkspaceEdit(uri, fix.edits);
  action.isPreferred = fix.preferred ?? false;
  if (diagnostics.length) action.diagnostics = diagnostics;
  return action;
}

export function toHover(info: HoverInfo): vscode.Hover {
  return new vscode.Hover(new vscode.MarkdownString(info.markdown), toRange(info.range));
}

export function toInlayHint(info: InlayHintInfo): vscode.InlayHint {
  const hint = new vscode.InlayHint(toPosition(info.position), info.label);
  hint.paddingLeft = true;
  if (info.tooltip) hint.tooltip = info.tooltip;
  return hint;
}

const SYMBOL_KINDS: Record<PlanSymbol['kind'], vscode.SymbolKind> = {
  run: vscode.SymbolKind.Function,
  motion: vscode.SymbolKind.Event,
  mark: vscode.SymbolKind.Key,
};

export function toDocumentSymbol(symbol: PlanSymbol): vscode.DocumentSymbol {
  const converted = new vscode.DocumentSymbol(
    symbol.name, symbol.detail, SYMBOL_KINDS[symbol.kind], toRange(symbol.range), toRange(symbol.selectionRange),
  );
  converted.children = symbol.children.map(toDocumentSymbol);
  return converted;
}

const COMPLETION_KINDS: Record<CompletionInfo['kind'], vscode.CompletionItemKind> = {
  keyword: vscode.CompletionItemKind.Keyword,
  option: vscode.CompletionItemKind.Property,
  word: vscode.CompletionItemKind.EnumMember,
  unit: vscode.CompletionItemKind.Unit,
  name: vscode.CompletionItemKind.Variable,
  zone: vscode.CompletionItemKind.Value,
};

export function toCompletionItem(info: CompletionInfo): vscode.CompletionItem {
  const item = new vscode.CompletionItem(info.label, COMPLETION_KINDS[info.kind]);
  if (info.detail) item.detail = info.detail;
  if (info.insertText) item.insertText = info.insertText;
  item.sortText = `${info.sortGroup}${String(info.sortIndex ?? 0).padStart(3, '0')}${info.label}`;
  return item;
}
