// The SVG the preview shows: the elements and attributes the renderer writes
// (src/core/render/svg.ts), and a few plain shapes. The preview removes
// everything else; a core test checks that the renderer writes nothing else.

export const ALLOWED_ELEMENTS: ReadonlySet<string> = new Set([
  'svg', 'g', 'path', 'rect', 'circle', 'ellipse', 'line', 'polyline', 'polygon', 'text', 'tspan', 'title', 'desc',
]);

/** Presentation and geometry only (lower case): nothing that can hold a script, a link or a style sheet. */
export const ALLOWED_ATTRIBUTES: ReadonlySet<string> = new Set([
  'class', 'd', 'x', 'y', 'dx', 'dy', 'cx', 'cy', 'r', 'rx', 'ry', 'x1', 'y1', 'x2', 'y2', 'points', 'width', 'height',
  'viewbox', 'transform', 'fill', 'fill-opacity', 'stroke', 'stroke-width', 'stroke-opacity', 'stroke-dasharray',
  'stroke-linecap', 'stroke-linejoin', 'opacity', 'text-anchor', 'dominant-baseline', 'font-size', 'font-weight',
  'font-family', 'preserveaspectratio', 'version', 'data-line', 'data-segment', 'data-code', 'data-run', 'data-frame',
]);
