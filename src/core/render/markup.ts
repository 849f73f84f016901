// Small text helpers for writing SVG as strings (the renderer never builds a DOM,
// so it runs the same in the command line, the extension host and a worker).

const XML_ESCAPES: Record<string, string> = {
  '&': '&amp;',
  '<': '&lt;',
  '>': '&gt;',
  '"': '&quot;',
  // `&#39;` rather than `&apos;`: the preview may insert the markup into an HTML
  // page, and the numeric form means the same thing in XML and HTML.
  "'": '&#39;',
};

/**
 * Escapes user text for element content and attribute values. Characters that
 * XML 1.0 forbids outright become U+FFFD, because escaping cannot make them legal
 * and one of them would make the whole file unreadable.
 */
export function escapeXml(text: string): string {
  return text
    .replace(/[\u0000-\u0008\u000B\u000C\u000E-\u001F\uFFFE\uFFFF]/g, '\uFFFD')
    .replace(/[&<>"']/g, (c) => XML_ESCAPES[c]);
}

/**
 * A coordinate rounded to 2 decimals: sub-pixel precision at any sensible scale,
 * short files. Built from integers because converting a fractional double to
 * text is several times slower, and a large plan writes hundreds of thousands.
 */
export function num(value: number): string {
  const hundredths = Math.round(value * 100);
  if (hundredths % 100 === 0) return String(hundredths / 100);
  const abs = Math.abs(hundredths);
  const cents = abs % 100;
  const fraction = cents < 10 ? `0${cents}` : cents % 10 === 0 ? String(cents / 10) : String(cents);
  return `${hundredths < 0 ? '-' : ''}${(abs - cents) / 100}.${fraction}`;
}
