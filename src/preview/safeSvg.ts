// Turns the host's SVG text into DOM nodes without ever running anything in it.
// The core escapes plan text already and the CSP forbids inline script; this is
// the third layer, in case either of those ever slips.

const SVG_NS = 'http://www.w3.org/2000/svg';
const XLINK_NS = 'http://www.w3.org/1999/xlink';

/**
 * Elements that can run script, embed other documents or HTML, or (animations)
 * set an attribute such as an event handler later; `style` too, because the
 * CSP refuses inline styles anyway and media/preview.css styles every class
 * the renderer uses.
 */
const FORBIDDEN_ELEMENTS = new Set([
  'script', 'foreignobject', 'iframe', 'object', 'embed', 'handler', 'listener', 'style',
  'set', 'animate', 'animatetransform', 'animatemotion', 'discard',
]);

function withSvgNamespace(text: string): string {
  return /^\s*<svg\b[^>]*\bxmlns=/.test(text) ? text : text.replace(/^(\s*<svg)\b/, `$1 xmlns="${SVG_NS}"`);
}

function isSafeReference(value: string): boolean {
  // Only references inside the drawing itself (#id) and inline images.
  const v = value.trim().toLowerCase();
  return v.startsWith('#') || v.startsWith('data:image/png') || v.startsWith('data:image/jpeg');
}

/** Removes from `root` (in place) every element and attribute that could execute or load something. */
export function sanitiseSvg(root: Element): void {
  const doomed: Element[] = [];
  const walk = (el: Element): void => {
    if (el.namespaceURI !== SVG_NS || FORBIDDEN_ELEMENTS.has(el.localName.toLowerCase())) {
      doomed.push(el);
      return;
    }
    for (const attr of Array.from(el.attributes)) {
      const name = attr.localName.toLowerCase();
      const isEvent = name.startsWith('on');
      const isLink = name === 'href' && (attr.namespaceURI === null || attr.namespaceURI === XLINK_NS);
      const isStyleWithUrl = name === 'style' && /url\s*\(|expression\s*\(|javascript:/i.test(attr.value);
      if (isEvent || isStyleWithUrl || (isLink && !isSafeReference(attr.value))) el.removeAttributeNode(attr);
    }
    for (const child of Array.from(el.children)) walk(child);
  };
  walk(root);
  for (const el of doomed) el.remove();
}

/**
 * Parses `text` as an SVG document (a parser that never runs scripts), cleans it
 * and imports it into `doc`. Undefined when the text is not a well-formed SVG.
 */
export function importSvg(text: string, doc: Document): SVGSVGElement | undefined {
  const parsed = new DOMParser().parseFromString(withSvgNamespace(text), 'image/svg+xml');
  const root = parsed.documentElement;
  if (root.namespaceURI !== SVG_NS || root.localName !== 'svg' || parsed.getElementsByTagName('parsererror').length > 0) {
    return undefined;
  }
  sanitiseSvg(root);
  return doc.importNode(root, true) as unknown as SVGSVGElement;
}
