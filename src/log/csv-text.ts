/**
 * The text layer of log reading: byte-order mark, line endings, delimiter
 * detection and strict decimal cells.
 *
 * Hand-written rather than csv-parse: step-test logs are plain numeric tables
 * (no quoted delimiters or embedded line breaks), and a one-hour 100 Hz log
 * (360,000 rows) must read in well under 2 s. bench/log.bench.ts measures both
 * on the same file: csv-parse alone took ≈ 4 s there, this reader ≈ 0.3 s
 * (it scans the text in place and parses plain decimals from character codes).
 */

export type Delimiter = ',' | ';' | '\t';

/** The delimiter used most often in a header line: comma, semicolon or tab (comma when none occurs). */
export function detectDelimiter(headerLine: string): Delimiter {
  const counts: Record<Delimiter, number> = { ',': 0, ';': 0, '\t': 0 };
  for (const character of headerLine) if (character === ',' || character === ';' || character === '\t') counts[character] += 1;
  let best: Delimiter = ',';
  for (const delimiter of [';', '\t'] as const) if (counts[delimiter] > counts[best]) best = delimiter;
  return best;
}

/** Header cell text: trimmed, surrounding double quotes removed. */
export function cleanHeaderCell(cell: string): string {
  const trimmed = cell.trim();
  return trimmed.length >= 2 && trimmed.startsWith('"') && trimmed.endsWith('"') ? trimmed.slice(1, -1).trim() : trimmed;
}

/** A decimal number: optional sign, digits with an optional point, optional exponent; surrounding blanks and one pair of double quotes allowed. */
const DECIMAL = /^\s*"?\s*[+-]?(?:\d+\.?\d*|\.\d+)(?:[eE][+-]?\d+)?\s*"?\s*$/;
const NON_FINITE = /^\s*"?\s*[+-]?(?:nan|inf|infinity)\s*"?\s*$/i;
const DECIMAL_COMMA = /^\s*[+-]?\d+,\d+\s*$/;

export type CellProblem = 'empty' | 'nonFinite' | 'decimalComma' | 'nonNumeric';

/**
 * Parse one cell as a decimal number. Returns the number, or NaN when the cell
 * is not a plain finite decimal (use `cellProblem` to say why). Hexadecimal,
 * blanks, NaN and Infinity are not numbers here.
 */
export function parseDecimalCell(cell: string): number {
  if (!DECIMAL.test(cell)) return NaN;
  const value = Number(cell.indexOf('"') >= 0 ? cell.replace(/"/g, '') : cell);
  return Number.isFinite(value) ? value : NaN;
}

/** Exact powers of ten (10^k is exactly representable for k ≤ 22). */
const POWERS_OF_TEN = Array.from({ length: 23 }, (_, k) => Number(`1e${k}`));

/**
 * Parse text[from, to) as a decimal number without creating a string: optional
 * blanks and double quotes around an optional sign, digits and an optional
 * fraction. With at most 15 significant digits the value is mantissa / 10^k,
 * a correctly rounded division of two exact doubles, so it equals `Number()`
 * of the same text (Clinger's fast path); anything longer or with an exponent
 * goes through `parseDecimalCell`. Returns NaN when the cell is not a finite decimal.
 */
export function parseDecimalRange(text: string, from: number, to: number): number {
  let i = from;
  let code = text.charCodeAt(i);
  while (i < to && (code === 32 || code === 9 || code === 34)) code = text.charCodeAt(++i);
  let negative = false;
  if (code === 45 || code === 43) {
    negative = code === 45;
    code = text.charCodeAt(++i);
  }
  let mantissa = 0;
  let digits = 0;
  let fractionDigits = 0;
  while (i < to && code >= 48 && code <= 57) {
    mantissa = mantissa * 10 + (code - 48);
    digits += 1;
    code = text.charCodeAt(++i);
  }
  if (i < to && code === 46) {
    code = text.charCodeAt(++i);
    while (i < to && code >= 48 && code <= 57) {
      mantissa = mantissa * 10 + (code - 48);
      digits += 1;
      fractionDigits += 1;
      code = text.charCodeAt(++i);
    }
  }
  let end = i;
  while (end < to && (code === 32 || code === 9 || code === 34)) code = text.charCodeAt(++end);
  if (digits === 0 || end !== to || digits > 15) return parseDecimalCell(text.slice(from, to));
  const magnitude = fractionDigits === 0 ? mantissa : mantissa / POWERS_OF_TEN[fractionDigits];
  return negative ? -magnitude : magnitude;
}

/** Why a cell is not a decimal number. */
export function cellProblem(cell: string): CellProblem {
  if (cell.trim() === '' || cell.trim() === '""') return 'empty';
  if (NON_FINITE.test(cell) || DECIMAL.test(cell)) return 'nonFinite';
  if (DECIMAL_COMMA.test(cell)) return 'decimalComma';
  return 'nonNumeric';
}
