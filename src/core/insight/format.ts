// Turns canonical quantities (mm, degrees, seconds) into the short strings the
// editor shows, in the plan file's own length unit so hovers read like the plan.
import type { LengthUnitName, WheelPair } from '../types';
import { normaliseHeading } from '../solve/frame';
import { LENGTH_UNIT_MM } from '../units/evaluate';

import { DIGITS, formatNumber } from '../format';

export { formatNumber };

/** Metres and inches need more decimals than millimetres to say the same thing. */
const LENGTH_DIGITS: Record<LengthUnitName, number> = { mm: 1, cm: 2, m: 4, in: 3 };

export function formatLength(mm: number, unit: LengthUnitName): string {
  return `${formatNumber(mm / LENGTH_UNIT_MM[unit], LENGTH_DIGITS[unit])} ${unit}`;
}

export function formatAngle(deg: number): string {
  return `${formatNumber(deg, DIGITS.angle)}°`;
}

export function formatTime(seconds: number): string {
  return Number.isFinite(seconds) ? `${formatNumber(seconds, DIGITS.time)} s` : 'unknown time';
}

/**
 * Field headings are shown in [0, 360), as the command line's JSON does.
 * Rounded before wrapping, so -0.01 shows as 0°, never as 360°.
 */
export function formatHeading(deg: number): string {
  return formatAngle(normaliseHeading(Number(deg.toFixed(1))));
}

export function formatWheels(pair: WheelPair): string {
  return `L ${formatAngle(pair.left)}, R ${formatAngle(pair.right)}`;
}
