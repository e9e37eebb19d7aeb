/**
 * The text layer of log reading: byte-order mark, line endings, delimiter
 * detection and strict decimal cells.
 *
 * Hand-written rather than csv-parse: step-test logs are plain numeric tables
 * (no quoted delimiters or embedded line breaks), and a one-hour 100 Hz log
 * (360,000 rows) must read in well under 2 s. bench/log.bench.ts measures both
 * on the same file; the hand-written path is several times faster there.
 */

export type Delimiter = ',' | ';' | '\t';

/** Remove a UTF-8 byte-order mark, if any. */
export function stripByteOrderMark(text: string): string {
  return text.charCodeAt(0) === 0xfeff ? text.slice(1) : text;
}

/** Split text into lines, accepting LF and CRLF endings (the CR is removed). */
export function splitLines(text: string): string[] {
  const lines = text.split('\n');
  for (let i = 0; i < lines.length; i += 1) {
    const line = lines[i];
    if (line.charCodeAt(line.length - 1) === 13) lines[i] = line.slice(0, -1);
  }
  return lines;
}

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

/** Why a cell is not a decimal number. */
export function cellProblem(cell: string): CellProblem {
  if (cell.trim() === '' || cell.trim() === '""') return 'empty';
  if (NON_FINITE.test(cell) || DECIMAL.test(cell)) return 'nonFinite';
  if (DECIMAL_COMMA.test(cell)) return 'decimalComma';
  return 'nonNumeric';
}
