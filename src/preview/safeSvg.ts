// Turns the host's SVG text into DOM nodes without ever running anything in
// it. The core escapes plan text already and the CSP forbids inline script and
// forms; this is the third layer: every drawing that reaches the page goes
// through DOMPurify's SVG profile (an allow-list of SVG elements and
// attributes), whatever the text looks like.
import DOMPurify from 'dompurify';

const SVG_NS = 'http://www.w3.org/2000/svg';

/**
 * Beyond the profile: no styles (the CSP refuses inline styles, and
 * media/preview.css styles every class the renderer uses), nothing that
 * pulls in other content.
 */
const CONFIG: Parameters<typeof DOMPurify.sanitize>[1] & { RETURN_DOM_FRAGMENT: true } = {
  USE_PROFILES: { svg: true },
  FORBID_TAGS: ['style', 'foreignObject', 'use', 'image', 'a', 'animate', 'set', 'animateMotion', 'animateTransform'],
  FORBID_ATTR: ['style', 'href', 'xlink:href'],
  RETURN_DOM_FRAGMENT: true,
};

/** The sanitised drawing moved into `doc`, or undefined when the text is not one SVG drawing. */
export function importSvg(text: string, doc: Document): SVGSVGElement | undefined {
  const fragment = DOMPurify.sanitize(text, CONFIG);
  const root = fragment.firstElementChild;
  if (!root || root.namespaceURI !== SVG_NS || root.localName !== 'svg' || fragment.childElementCount !== 1) return undefined;
  return doc.adoptNode(root) as unknown as SVGSVGElement;
}
