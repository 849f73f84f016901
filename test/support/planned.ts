// Tests of the planned path leave out what the controller simulation finds
// (overshoot, stall, endless motions, and the predicted path's collisions)
// and the marks the spread makes a gamble: those have tests of their own
// (test/core/sim.test.ts, test/core/spread.test.ts).
import type { Diagnostic } from '../../src/core/types';

const SIMULATION_CODES: ReadonlySet<string> = new Set(['overshoot', 'stall', 'endless']);

export function isSimulationFinding(d: Pick<Diagnostic, 'code' | 'message'>): boolean {
  return SIMULATION_CODES.has(d.code) || d.message.startsWith('The predicted path') || (d.code === 'miss' && d.message.startsWith('Only '));
}

export function plannedOnly<T extends Pick<Diagnostic, 'code' | 'message'>>(diagnostics: readonly T[]): T[] {
  return diagnostics.filter((d) => !isSimulationFinding(d));
}
