// Splits one line of a plan into tokens. Expressions are kept as source text and
// evaluated elsewhere, so the lexer only needs the boundaries the parser acts on:
// words, numbers, strings, parentheses, commas, `=` and runs of other symbols.

export type TokenKind = 'ident' | 'number' | 'string' | 'symbol';

export interface Token {
  kind: TokenKind;
  /** Source text; for strings, including the quotes. */
  text: string;
  /** 0-based UTF-16 columns, half-open. */
  start: number;
  end: number;
  /** Unescaped value of a string. */
  value?: string;
}

export interface LexError {
  start: number;
  end: number;
  message: string;
}

export interface LexedLine {
  tokens: Token[];
  /** The first problem on the line; tokens before it are still listed. */
  error?: LexError;
}

const SPACE = 0x20, TAB = 0x09, CR = 0x0d, FORM_FEED = 0x0c, VERTICAL_TAB = 0x0b, NO_BREAK_SPACE = 0xa0;
const QUOTE = 0x22, BACKSLASH = 0x5c, HASH = 0x23, DOT = 0x2e;

/** Characters that always stand alone, because the parser looks at each one. */
const SINGLE_SYMBOLS = new Set(['(', ')', ',', '=']);

const LETTER = /\p{L}/u;

function isSpace(code: number): boolean {
  return code === SPACE || code === TAB || code === CR || code === FORM_FEED || code === VERTICAL_TAB
    || code === NO_BREAK_SPACE || code === 0xfeff;
}

function isDigit(code: number): boolean {
  return code >= 0x30 && code <= 0x39;
}

/** Identifier letters as math.js reads them closely enough: ASCII letters, `_`, `$`, other letters. */
function isIdentStart(text: string, index: number): boolean {
  const code = text.charCodeAt(index);
  if ((code >= 0x41 && code <= 0x5a) || (code >= 0x61 && code <= 0x7a) || code === 0x5f || code === 0x24) return true;
  return code >= 0x80 && LETTER.test(text[index]);
}

function isIdentPart(text: string, index: number): boolean {
  return isIdentStart(text, index) || isDigit(text.charCodeAt(index));
}

function startsNumber(text: string, index: number): boolean {
  const code = text.charCodeAt(index);
  return isDigit(code) || (code === DOT && isDigit(text.charCodeAt(index + 1)));
}

function endOfNumber(text: string, index: number): number {
  let i = index;
  while (isDigit(text.charCodeAt(i))) i++;
  if (text.charCodeAt(i) === DOT) {
    i++;
    while (isDigit(text.charCodeAt(i))) i++;
  }
  const e = text.charCodeAt(i);
  if (e === 0x65 || e === 0x45) {
    let j = i + 1;
    const sign = text.charCodeAt(j);
    if (sign === 0x2b || sign === 0x2d) j++;
    if (isDigit(text.charCodeAt(j))) {
      i = j;
      while (isDigit(text.charCodeAt(i))) i++;
    }
  }
  return i;
}

function isOtherSymbol(text: string, index: number): boolean {
  const code = text.charCodeAt(index);
  return !isSpace(code) && code !== QUOTE && code !== HASH && !SINGLE_SYMBOLS.has(text[index])
    && !isIdentStart(text, index) && !startsNumber(text, index);
}

/** Tokens of one line (without its line break); stops at a `#` comment outside strings. */
export function lexLine(text: string): LexedLine {
  const tokens: Token[] = [];
  let i = 0;
  while (i < text.length) {
    const code = text.charCodeAt(i);
    if (isSpace(code)) {
      i++;
      continue;
    }
    if (code === HASH) break;
    const start = i;
    if (code === QUOTE) {
      const string = readString(text, start);
      if ('message' in string) return { tokens, error: string };
      tokens.push({ kind: 'string', text: text.slice(start, string.end), start, end: string.end, value: string.value });
      i = string.end;
      continue;
    }
    if (isIdentStart(text, i)) {
      i++;
      while (i < text.length && isIdentPart(text, i)) i++;
      tokens.push({ kind: 'ident', text: text.slice(start, i), start, end: i });
      continue;
    }
    if (startsNumber(text, i)) {
      i = endOfNumber(text, i);
      tokens.push({ kind: 'number', text: text.slice(start, i), start, end: i });
      continue;
    }
    if (SINGLE_SYMBOLS.has(text[i])) {
      i++;
    } else {
      // Runs such as `*-` or `^` stay one token: the parser only asks what they end with.
      i++;
      while (i < text.length && isOtherSymbol(text, i)) i++;
    }
    tokens.push({ kind: 'symbol', text: text.slice(start, i), start, end: i });
  }
  return { tokens };
}

function readString(text: string, start: number): { value: string; end: number } | LexError {
  let value = '';
  let i = start + 1;
  while (i < text.length) {
    const code = text.charCodeAt(i);
    if (code === QUOTE) return { value, end: i + 1 };
    if (code === BACKSLASH) {
      const next = text[i + 1];
      if (next === '"' || next === '\\') {
        value += next;
        i += 2;
        continue;
      }
      const escapeEnd = next === undefined ? i + 1 : i + 2;
      return {
        start: i,
        end: escapeEnd,
        message: next === undefined
          ? 'this string is not closed: add `"` at its end (a string cannot span lines)'
          : `unknown escape \`\\${next}\` in a string: only \`\\"\` and \`\\\\\` are allowed`,
      };
    }
    value += text[i];
    i++;
  }
  return {
    start,
    end: text.length,
    message: 'this string is not closed: add `"` at its end (a string cannot span lines)',
  };
}
