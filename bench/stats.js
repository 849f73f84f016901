// Small statistics shared by the benchmarks (CommonJS, so the extension-host
// suite, the .mjs driver and the TypeScript benchmark can all load it).
'use strict';

/** The median of a list of numbers. */
function median(xs) {
  const s = [...xs].sort((a, b) => a - b);
  const m = Math.floor(s.length / 2);
  return s.length % 2 ? s[m] : (s[m - 1] + s[m]) / 2;
}

/** Rounded to 3 decimals, for the results file. */
function round(v) {
  return Math.round(v * 1000) / 1000;
}

module.exports = { median, round };
