// Zoom and pan act on the SVG's viewBox rather than a CSS transform, so the
// drawing stays sharp at any zoom and the core's coordinates stay untouched.

export interface ViewBox {
  x: number;
  y: number;
  width: number;
  height: number;
}

/** How far the user may zoom relative to the fitted drawing, both ways. */
const MAX_ZOOM_IN = 50;
const MAX_ZOOM_OUT = 10;

export function parseViewBox(attr: string | null): ViewBox | undefined {
  if (!attr) return undefined;
  const parts = attr.trim().split(/[\s,]+/).map(Number);
  if (parts.length !== 4 || parts.some((n) => !Number.isFinite(n))) return undefined;
  const [x, y, width, height] = parts as [number, number, number, number];
  return width > 0 && height > 0 ? { x, y, width, height } : undefined;
}

export function formatViewBox(v: ViewBox): string {
  return `${v.x} ${v.y} ${v.width} ${v.height}`;
}

/**
 * Zooms by `factor` (> 1 magnifies) keeping the user-space point (px, py)
 * where it is on screen, within limits relative to the fitted view `fit`.
 */
export function zoomAbout(view: ViewBox, fit: ViewBox, factor: number, px: number, py: number): ViewBox {
  const minWidth = fit.width / MAX_ZOOM_IN;
  const maxWidth = fit.width * MAX_ZOOM_OUT;
  const width = Math.min(maxWidth, Math.max(minWidth, view.width / factor));
  const applied = view.width / width;
  return {
    x: px - (px - view.x) / applied,
    y: py - (py - view.y) / applied,
    width,
    height: view.height / applied,
  };
}

/** Moves the view by (dx, dy) user units: the drawing follows the pointer, so the view moves the other way. */
export function panBy(view: ViewBox, dx: number, dy: number): ViewBox {
  return { ...view, x: view.x - dx, y: view.y - dy };
}

export function isViewBox(value: unknown): value is ViewBox {
  if (typeof value !== 'object' || value === null) return false;
  const v = value as Record<string, unknown>;
  return ['x', 'y', 'width', 'height'].every((k) => typeof v[k] === 'number' && Number.isFinite(v[k]))
    && (v.width as number) > 0 && (v.height as number) > 0;
}
