// The drawing's coordinate system: which part of the field is shown, how large
// a CSS pixel is in field millimetres, and the y flip from the field frame
// (y up) to SVG (y down).
import type { LengthUnitName, Point } from '../types';

/** Grows to hold every finite point added; non-finite values (from incomplete segments) are ignored. */
export class Bounds {
  minX = Infinity;
  minY = Infinity;
  maxX = -Infinity;
  maxY = -Infinity;

  add(x: number, y: number): void {
    if (!Number.isFinite(x) || !Number.isFinite(y)) return;
    if (x < this.minX) this.minX = x;
    if (x > this.maxX) this.maxX = x;
    if (y < this.minY) this.minY = y;
    if (y > this.maxY) this.maxY = y;
  }

  /** A square of half-size `reach` around `p`: enough to hold a circle or footprint there. */
  addAround(p: Point, reach: number): void {
    this.add(p.x - reach, p.y - reach);
    this.add(p.x + reach, p.y + reach);
  }

  get empty(): boolean {
    return this.minX > this.maxX;
  }
}

export interface View {
  /** Field millimetres per CSS pixel at the target width: every on-screen size is `n * px`. */
  px: number;
  /** Size of the whole drawing in user units (field millimetres). */
  width: number;
  height: number;
  /** Width of the empty band around the content, user units. */
  margin: number;
  /** SVG y of the top and bottom edges of the content area (below the header, above the footer). */
  contentTop: number;
  contentBottom: number;
  x(fieldX: number): number;
  y(fieldY: number): number;
}

/** A drawing of at least this size, so a single point or an empty plan still gets a sensible view. */
const MIN_EXTENT_MM = 200;

export function makeView(content: Bounds, targetWidthPx: number, headerPx: (px: number, width: number) => number, footerPx: number): View {
  const box = content.empty ? { minX: 0, minY: 0, maxX: 1000, maxY: 1000 } : content;
  const cx = (box.minX + box.maxX) / 2;
  const cy = (box.minY + box.maxY) / 2;
  const w = Math.max(box.maxX - box.minX, MIN_EXTENT_MM);
  const h = Math.max(box.maxY - box.minY, MIN_EXTENT_MM);
  const margin = 0.04 * Math.max(w, h);
  const width = w + 2 * margin;
  const px = width / targetWidthPx;
  const header = headerPx(px, width) * px;
  const left = cx - w / 2 - margin;
  const top = cy + h / 2 + margin;
  const contentBottom = header + h + 2 * margin;
  return {
    px,
    width,
    height: contentBottom + footerPx * px,
    margin,
    contentTop: header,
    contentBottom,
    x: (fieldX) => fieldX - left,
    y: (fieldY) => header + (top - fieldY),
  };
}

const MM_PER_UNIT: Record<LengthUnitName, number> = { mm: 1, cm: 10, m: 1000, in: 25.4 };

/** A length in the plan's own unit, as a reader of that plan would write it. */
export function formatLength(mm: number, unit: LengthUnitName): string {
  const value = Math.round((mm / MM_PER_UNIT[unit]) * 100) / 100;
  return `${value} ${unit}`;
}

/**
 * The longest 1-2-5 step length (in the plan's unit, returned in mm) not longer
 * than `maxMm`: round numbers make a scale bar readable at a glance.
 */
export function scaleBarLength(maxMm: number, unit: LengthUnitName): number {
  const perUnit = MM_PER_UNIT[unit];
  const limit = maxMm / perUnit;
  const decade = 10 ** Math.floor(Math.log10(limit));
  const step = [5, 2, 1].find((m) => m * decade <= limit) ?? 1;
  return step * decade * perUnit;
}
