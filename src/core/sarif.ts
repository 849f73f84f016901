// The checker's diagnostics as a SARIF 2.1.0 log (OASIS Static Analysis
// Results Interchange Format), the form code-scanning services and editors
// read: one rule per diagnostic code, results with 1-based regions in UTF-16
// code units, related locations, and the path-keeping fixes as SARIF fixes.
import type { CheckResult, Diagnostic, DiagnosticCode, Fix, Range, Severity } from './types';

/** One line on what each code means, for the rules' short descriptions. */
export const CODE_SUMMARIES: Record<DiagnosticCode, string> = {
  syntax: 'A line that cannot be read.',
  unit: 'A value of the wrong kind, or an unknown unit.',
  name: 'An unknown name, or a name bound twice.',
  setup: 'A setup value is missing or out of its range.',
  'wrap-cross': 'A yaw target outside the sensor\'s range: the robot never settles.',
  'wrap-edge': 'A yaw target within 5 degrees of the wrap point.',
  'long-way': 'A turn to a reading that goes the long way round.',
  'heading-jump': 'A heading hold that starts with a sudden swerve.',
  'off-field': 'Part of the robot leaves the field.',
  collision: 'The robot touches an obstacle.',
  'no-wall': 'A square that meets no wall, or meets it badly.',
  'over-time': 'A run takes longer than the time limit.',
  miss: 'A mark is missed.',
  approximate: 'A path or time that is an estimate.',
  overshoot: 'The simulated robot turns past the stop band.',
  stall: 'The simulated robot stops for want of power and waits for ever.',
  endless: 'The simulated motion has not ended after 20 seconds.',
};

const DEFAULT_LEVEL: Record<DiagnosticCode, SarifLevel> = {
  syntax: 'error', unit: 'error', name: 'error', setup: 'error', 'wrap-cross': 'error', 'wrap-edge': 'warning',
  'long-way': 'warning', 'heading-jump': 'warning', 'off-field': 'error', collision: 'error', 'no-wall': 'error',
  'over-time': 'warning', miss: 'warning', approximate: 'note', overshoot: 'warning', stall: 'error', endless: 'error',
};

type SarifLevel = 'error' | 'warning' | 'note';

export interface SarifInput {
  /** The path as given; written as a URI reference. */
  file: string;
  result: CheckResult;
  /** Fixes to offer per diagnostic (already proven to keep the path). */
  fixesFor?: (d: Diagnostic) => Fix[];
}

export interface SarifOptions {
  toolVersion: string;
  /** Where each code's help lives: `${helpBase}#${code}`. */
  helpBase?: string;
}

const LEVEL: Record<Severity, SarifLevel> = { error: 'error', warning: 'warning', information: 'note' };

function uriOf(file: string): string {
  return encodeURI(file.replace(/\\/g, '/'));
}

function region(r: Range): Record<string, number> {
  return { startLine: r.start.line + 1, startColumn: r.start.character + 1, endLine: r.end.line + 1, endColumn: r.end.character + 1 };
}

export function toSarif(inputs: readonly SarifInput[], options: SarifOptions): Record<string, unknown> {
  const codes = Object.keys(CODE_SUMMARIES) as DiagnosticCode[];
  const rules = codes.map((code) => ({
    id: code,
    name: code.replace(/-(.)/g, (_, c: string) => c.toUpperCase()).replace(/^./, (c) => c.toUpperCase()),
    shortDescription: { text: CODE_SUMMARIES[code] },
    ...(options.helpBase ? { helpUri: `${options.helpBase}#${code}` } : {}),
    defaultConfiguration: { level: DEFAULT_LEVEL[code] },
  }));
  const results = inputs.flatMap(({ file, result, fixesFor }) => result.diagnostics.map((d) => {
    const artifactLocation = { uri: uriOf(file) };
    const out: Record<string, unknown> = {
      ruleId: d.code,
      ruleIndex: codes.indexOf(d.code),
      level: LEVEL[d.severity],
      message: { text: d.message },
      locations: [{ physicalLocation: { artifactLocation, region: region(d.range) } }],
    };
    if (d.related?.length) {
      out.relatedLocations = d.related.map((rel, id) => ({
        id, message: { text: rel.message }, physicalLocation: { artifactLocation, region: region(rel.range) },
      }));
    }
    const fixes = fixesFor?.(d) ?? [];
    if (fixes.length) {
      out.fixes = fixes.map((fix) => ({
        description: { text: fix.title },
        artifactChanges: [{
          artifactLocation,
          replacements: fix.edits.map((e) => ({ deletedRegion: region(e.range), insertedContent: { text: e.newText } })),
        }],
      }));
    }
    return out;
  }));
  return {
    $schema: 'https://json.schemastore.org/sarif-2.1.0.json',
    version: '2.1.0',
    runs: [{
      tool: { driver: { name: 'veer', version: options.toolVersion, informationUri: options.helpBase, rules } },
      columnKind: 'utf16CodeUnits',
      artifacts: inputs.map(({ file }) => ({ location: { uri: uriOf(file) }, mimeType: 'text/plain' })),
      results,
    }],
  };
}
