/**
 * Free text in the C header (vehicle name, cautions, units, equations — any text a schedule file
 * carries) goes into comments only through this whitelist, so that no input can end a comment or
 * splice a line and have what follows compiled as code. Kept: printable ASCII (0x20–0x7E, after
 * toAscii) except the backslash; tabs and line breaks become spaces, anything else '_'. Then the
 * sequences that mean something inside a C99 comment are broken with a space until none is left:
 * `*` `/` (ends the comment), `/` `*` (a nested opening; -Wcomment), `??` (trigraphs, which
 * -std=c99 translates before comments are recognised: `??/` is a backslash, so `*??/` + newline + `/`
 * would close the comment). Source: ISO/IEC 9899:1999 §5.1.1.2 (translation phases 1–3: trigraphs,
 * then line splicing, then comments) and §5.2.1.1 (trigraph sequences).
 */
import { toAscii } from './ascii.js';

/** Longest free text kept in one comment line, in characters (the rest is cut with "..."). */
export const C_COMMENT_TEXT_MAX = 400;

const FORBIDDEN_SEQUENCE = /\*\/|\/\*|\?\?/;

/** `text` made safe for the inside of a C comment (see the file comment). */
export function commentSafe(text: string, maxLength: number = C_COMMENT_TEXT_MAX): string {
  let safe = '';
  for (const character of toAscii(text)) {
    const code = character.charCodeAt(0);
    if (character === '\t' || character === '\n' || character === '\r') safe += ' ';
    else safe += code >= 0x20 && code <= 0x7e && character !== '\\' ? character : '_';
  }
  if (safe.length > maxLength) safe = `${safe.slice(0, maxLength)}...`;
  while (FORBIDDEN_SEQUENCE.test(safe)) safe = safe.replace(/\*\//g, '* /').replace(/\/\*/g, '/ *').replace(/\?\?/g, '? ?');
  return safe;
}

/** A block comment of lines, each through commentSafe. */
export function cComment(lines: readonly string[]): string {
  return `/*\n${lines.map((line) => ` * ${commentSafe(line)}`.trimEnd()).join('\n')}\n */`;
}
