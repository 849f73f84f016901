// PNG export: the drawing is styled by media/preview.css and the editor theme,
// which an <img> of the bare SVG would not see. So the computed styles are
// copied onto a clone before it is drawn into a canvas. The cursor highlight
// and the scrubber's robot are left out: they belong to the editor, not the plan.
import type { ViewBox } from './viewport';
import { formatViewBox } from './viewport';

const STYLE_PROPERTIES = [
  'fill', 'fill-opacity', 'stroke', 'stroke-width', 'stroke-opacity', 'stroke-dasharray', 'stroke-linecap',
  'stroke-linejoin', 'opacity', 'visibility', 'display', 'font-family', 'font-size', 'font-weight',
  'font-style', 'text-anchor', 'dominant-baseline', 'paint-order', 'vector-effect',
];

/** Longest side of the exported image, pixels: sharp on a printout, small enough for a chat message. */
const LONG_SIDE_PX = 2400;

function inlineComputedStyles(source: Element, target: Element): void {
  const computed = getComputedStyle(source);
  const declarations = STYLE_PROPERTIES.map((p) => `${p}:${computed.getPropertyValue(p)}`).join(';');
  target.setAttribute('style', declarations);
  const sourceChildren = source.children;
  const targetChildren = target.children;
  for (let i = 0; i < sourceChildren.length && i < targetChildren.length; i++) {
    inlineComputedStyles(sourceChildren[i]!, targetChildren[i]!);
  }
}

function loadImage(url: string): Promise<HTMLImageElement> {
  return new Promise((resolve, reject) => {
    const img = new Image();
    img.onload = () => resolve(img);
    img.onerror = () => reject(new Error('the drawing could not be rasterised'));
    img.src = url;
  });
}

/**
 * Draws `svg` (the whole drawing, `fit`) on a canvas filled with `background`,
 * and returns the PNG as base64 without the data: prefix.
 */
export async function rasterise(svg: SVGSVGElement, fit: ViewBox, background: string): Promise<string> {
  // The cursor highlight is the editor's, not the drawing's: taken off while the styles are copied.
  const current = Array.from(svg.querySelectorAll('.is-current'));
  for (const el of current) el.classList.remove('is-current');
  const clone = svg.cloneNode(true) as SVGSVGElement;
  try {
    inlineComputedStyles(svg, clone);
  } finally {
    for (const el of current) el.classList.add('is-current');
  }
  // The scrubber's robot is the preview's, drawn over the drawing: not part of the export.
  for (const el of Array.from(clone.querySelectorAll('.scrub-robot'))) el.remove();
  const scale = LONG_SIDE_PX / Math.max(fit.width, fit.height);
  const width = Math.round(fit.width * scale);
  const height = Math.round(fit.height * scale);
  clone.setAttribute('viewBox', formatViewBox(fit));
  clone.setAttribute('width', String(width));
  clone.setAttribute('height', String(height));
  const text = new XMLSerializer().serializeToString(clone);
  const img = await loadImage(`data:image/svg+xml;charset=utf-8,${encodeURIComponent(text)}`);
  const canvas = document.createElement('canvas');
  canvas.width = width;
  canvas.height = height;
  const ctx = canvas.getContext('2d');
  if (!ctx) throw new Error('no 2D canvas available');
  ctx.fillStyle = background;
  ctx.fillRect(0, 0, width, height);
  ctx.drawImage(img, 0, 0, width, height);
  return canvas.toDataURL('image/png').replace(/^data:image\/png;base64,/, '');
}
