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

function isSafeReference(value: string): boolean {
  // Only references inside the drawing itself (#id) and inline images.
  const v = value.trim().toLowerCase();
  return v.startsWith('#') || v.startsWith('data:image/png') || v.startsWith('data:image/jpeg');
}

/** Removes from `root` (in place) every element and attribute that could execute or load something. */
export function sanitiseSvg(root: Element): void {
  // One flat pass over a static list: a recursive walk copying every child list
  // cost more than the parse itself on a 1,000-segment drawing. Elements inside
  // a doomed one are still visited; they go with it.
  const doomed: Element[] = [];
  for (const el of [root, ...Array.from(root.querySelectorAll('*'))]) {
    if (el.namespaceURI !== SVG_NS || FORBIDDEN_ELEMENTS.has(el.localName.toLowerCase())) {
      doomed.push(el);
      continue;
    }
    for (const attr of Array.from(el.attributes)) {
      const name = attr.localName.toLowerCase();
      const isEvent = name.startsWith('on');
      const isLink = name === 'href' && (attr.namespaceURI === null || attr.namespaceURI === XLINK_NS);
      const isStyleWithUrl = name === 'style' && /url\s*\(|expression\s*\(|javascript:/i.test(attr.value);
      if (isEvent || isStyleWithUrl || (isLink && !isSafeReference(attr.value))) el.removeAttributeNode(attr);
    }
  }
  for (const el of doomed) el.remove();
}

/**
 * Whether the text holds anything the sanitiser would act on. Names of
 * elements and attributes are never written with character references, so an
 * event handler, a link, a script or another forbidden element always shows in
 * the text itself; the renderer escapes every `<` of plan text. When none
 * shows, the per-attribute walk (a third of the time on a 1,000-segment
 * drawing) is skipped.
 */
const MAYBE_UNSAFE = /(^|[^a-z0-9_-])on[a-z]+\s*=|href|javascript:|url\s*\(|<\s*[a-z]*:?(script|foreignobject|iframe|object|embed|handler|listener|style|set|animate|discard)/i;

/**
 * Parses `text` with the HTML parser inside an inert <template> (nothing in
 * it runs or loads while there, and it parses several times faster than the
 * XML parser), cleans it and moves it into `doc`. Undefined when the text is
 * not an SVG drawing.
 */
export function importSvg(text: string, doc: Document): SVGSVGElement | undefined {
  const template = doc.createElement('template');
  template.innerHTML = text;
  const root = template.content.firstElementChild;
  if (!root || root.namespaceURI !== SVG_NS || root.localName !== 'svg' || template.content.childElementCount !== 1) {
    return undefined;
  }
  if (MAYBE_UNSAFE.test(text)) sanitiseSvg(root);
  return doc.adoptNode(root) as unknown as SVGSVGElement;
}
