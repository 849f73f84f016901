// Turns the host's SVG text into DOM nodes without ever running anything in
// it. The core escapes plan text already and the CSP forbids inline script,
// forms and frames; this is the third layer, on every drawing that reaches the
// page: an allow-list of the SVG elements and attributes the renderer writes.
// Anything else (script, HTML inside a <title>, foreign content, links,
// animations, event handlers, styles, external paint) is removed before the
// drawing is shown.
//
// Written here rather than taken from a general sanitiser: DOMPurify's SVG
// profile, measured on the 1,000-segment benchmark drawing, added 40 ms to a
// render whose budget is 50 ms; this pass costs a few.

import { ALLOWED_ATTRIBUTES, ALLOWED_ELEMENTS } from '../shared/svgAllowList';

const SVG_NS = 'http://www.w3.org/2000/svg';

/** Paint may refer to something in the drawing (`url(#id)`), never to anything outside it. */
function externalReference(value: string): boolean {
  return /url\s*\(\s*(?!#)/i.test(value) || /javascript:|data:/i.test(value);
}

/** Removes from `root` (in place) every element and attribute not on the allow-lists. */
export function sanitiseSvg(root: Element): void {
  const doomed: Node[] = [];
  // Comments and processing instructions carry nothing the drawing needs.
  const walker = root.ownerDocument.createTreeWalker(root, 0x80 /* SHOW_COMMENT */ | 0x40 /* SHOW_PROCESSING_INSTRUCTION */);
  for (let n = walker.nextNode(); n; n = walker.nextNode()) doomed.push(n);
  for (const el of [root, ...Array.from(root.querySelectorAll('*'))]) {
    if (el.namespaceURI !== SVG_NS || !ALLOWED_ELEMENTS.has(el.localName)) {
      doomed.push(el);
      continue;
    }
    const attributes = el.attributes;
    for (let i = attributes.length - 1; i >= 0; i--) {
      const a = attributes[i];
      const name = a.name.toLowerCase();
      if (name === 'xmlns' || name.startsWith('xmlns:')) continue;
      if (a.namespaceURI !== null || !ALLOWED_ATTRIBUTES.has(name) || externalReference(a.value)) el.removeAttributeNode(a);
    }
  }
  for (const n of doomed) n.parentNode?.removeChild(n);
}

/**
 * Parses `text` with the HTML parser inside an inert <template> (nothing in
 * it runs or loads while there, and it parses several times faster than the
 * XML parser), cleans it and moves it into `doc`. Undefined when the text is
 * not one SVG drawing.
 */
export function importSvg(text: string, doc: Document): SVGSVGElement | undefined {
  const template = doc.createElement('template');
  template.innerHTML = text;
  const root = template.content.firstElementChild;
  if (!root || root.namespaceURI !== SVG_NS || root.localName !== 'svg' || template.content.childElementCount !== 1) return undefined;
  sanitiseSvg(root);
  return doc.adoptNode(root) as unknown as SVGSVGElement;
}
