/**
 * Text from input files quoted in messages: cut to a sensible length and with control characters
 * escaped, so that a 100 MB cell or a name carrying terminal escape sequences cannot flood or drive
 * the user's terminal. Escaped: C0 and C1 control characters, DEL, the Unicode line and paragraph
 * separators and the bidirectional overrides (which can make text read differently than it is).
 */

/** Longest quoted input text, in characters, before it is cut (common practice: a line of a terminal). */
export const QUOTED_TEXT_MAX = 80;
/** Longest line of a whole message, in characters, before it is cut (a last guard for long lists). */
export const MESSAGE_LINE_MAX = 2000;

const ESCAPED = /[\u0000-\u001f\u007f-\u009f\u2028\u2029\u202a-\u202e\u2066-\u2069]/g;
const NAMED: Readonly<Record<string, string>> = { '\n': '\\n', '\r': '\\r', '\t': '\\t', '\u001b': '\\e' };

const escapeCharacter = (character: string): string => NAMED[character] ?? `\\u${character.charCodeAt(0).toString(16).padStart(4, '0')}`;

/** `text` with control characters written as escapes (\n, \t, \e, \u0007 …). */
export function escapeControlCharacters(text: string): string {
  return text.replace(ESCAPED, escapeCharacter);
}

/** `text` cut to `max` characters (code points), saying how long it was. */
export function cutText(text: string, max: number): string {
  if (text.length <= max) return text;
  const kept = Array.from(text.slice(0, max + 1))
    .slice(0, max)
    .join('');
  return `${kept}… (${text.length} characters in all)`;
}

/** Input text as it appears inside a message: in double quotes, cut to `max` characters, control characters escaped. */
export function quoted(text: string, max: number = QUOTED_TEXT_MAX): string {
  const cut = text.length > max ? text.slice(0, max) : text;
  const shown = escapeControlCharacters(cut).replace(/"/g, '\\"');
  return text.length > max ? `"${shown}…" (${text.length} characters in all)` : `"${shown}"`;
}

/** Longest message of another library (mathjs's parse errors…) kept inside one of ours, in characters. */
export const LIBRARY_MESSAGE_MAX = 300;

/**
 * A library's message that may echo input text (mathjs: `Syntax error in part "…"`, `Unit "…" not found`):
 * each double-quoted part re-quoted with `quoted`, control characters escaped, the whole cut to LIBRARY_MESSAGE_MAX.
 */
export function libraryMessage(text: string): string {
  return escapeControlCharacters(
    cutText(
      text.replace(/"([^"]*)"/g, (_whole, inner: string) => quoted(inner)),
      LIBRARY_MESSAGE_MAX,
    ),
  );
}

/**
 * A whole message made safe for a terminal: control characters other than line feeds escaped and
 * every line cut to MESSAGE_LINE_MAX characters. The last guard; messages quote input text with `quoted`.
 */
export function safeMessageText(text: string): string {
  return text
    .split('\n')
    .map((line) => escapeControlCharacters(cutText(line, MESSAGE_LINE_MAX)))
    .join('\n');
}
