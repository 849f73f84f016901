// The preview page's Content Security Policy, one definition for the
// extension host and the browser tests' stand-in host: nothing loads but the
// preview's own script (by nonce), styles and images from its own source; no
// forms, frames or base URL.
export function previewCsp(source: string, nonce: string): string {
  return [
    "default-src 'none'",
    `img-src ${source} data:`,
    `style-src ${source}`,
    `script-src 'nonce-${nonce}'`,
    "form-action 'none'",
    "frame-src 'none'",
    "base-uri 'none'",
  ].join('; ');
}
