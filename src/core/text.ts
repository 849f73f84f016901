// Plan text as the core reads it: line breaks, and user text shown in messages.

/**
 * The next line break at or after `from`: `\n`, `\r\n` or a lone `\r` (as the
 * editor counts lines). `end` is where the line's content ends, `next` where
 * the next line starts; undefined on the last line.
 */
export function nextLineBreak(text: string, from: number): { end: number; next: number } | undefined {
  for (let i = from; i < text.length; i++) {
    const c = text.charCodeAt(i);
    if (c === 10) return { end: i, next: i + 1 };
    if (c === 13) return { end: i, next: text.charCodeAt(i + 1) === 10 ? i + 2 : i + 1 };
  }
  return undefined;
}

/** Offsets where each line starts. */
export function lineStartOffsets(text: string): number[] {
  const starts = [0];
  for (let at = nextLineBreak(text, 0); at; at = nextLineBreak(text, at.next)) starts.push(at.next);
  return starts;
}

/** Characters that do not show, or change how text around them shows: control, zero-width and bidirectional ones. */
const INVISIBLE = /[\u0000-\u0008\u000b-\u001f\u007f-\u009f\u00ad\u061c\u180e\u200b-\u200f\u2028-\u202e\u2060-\u2064\u2066-\u206f\ufeff\ufff9-\ufffb]/u;
const INVISIBLE_ALL = new RegExp(INVISIBLE.source, 'gu');

/** The first invisible character in `text`, as `U+XXXX`, or undefined. */
export function invisibleIn(text: string): string | undefined {
  const m = INVISIBLE.exec(text);
  return m ? codePoint(m[0]) : undefined;
}

function codePoint(ch: string): string {
  return `U+${ch.codePointAt(0)!.toString(16).toUpperCase().padStart(4, '0')}`;
}

/**
 * User text as a message shows it: invisible characters written as
 * `<U+XXXX>`, tabs as spaces, and at most `max` characters (the rest as `…`).
 */
export function showText(text: string, max = 80): string {
  const cut = text.length > max ? `${text.slice(0, max - 1)}…` : text;
  return cut.replace(/\t/g, ' ').replace(INVISIBLE_ALL, (ch) => `<${codePoint(ch)}>`);
}
