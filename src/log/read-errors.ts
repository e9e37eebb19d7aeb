/**
 * The errors of log reading: each names the file, the 1-based line and the
 * column (number and header name), says what was found and what to do.
 */
import type { ErrorCode } from '../core/error-codes.js';
import { SpeedbandError } from '../core/errors.js';
import { CHANNEL_DEFINITIONS } from './columns.js';
import type { ResolvedColumn } from './column-map.js';
import { cellProblem } from './csv-text.js';
import { QUOTED_TEXT_MAX, cutText, escapeControlCharacters, quoted } from '../core/quote.js';

function columnLabel(index: number, name: string): string {
  return `${index + 1} (${cutText(escapeControlCharacters(name), QUOTED_TEXT_MAX)})`;
}

export function rowLengthError(found: number, header: readonly string[], line: number, file: string): SpeedbandError {
  const short = found < header.length;
  const index = short ? found : header.length;
  return new SpeedbandError(
    short ? 'log.missingCell' : 'log.extraCell',
    short
      ? `the row has ${found} cells but the header has ${header.length}; ${quoted(header[index])} is missing — complete or remove the row`
      : `the row has ${found} cells but the header has ${header.length} — remove the extra cells or add a header name for them`,
    { location: { file, line, column: short ? columnLabel(index, header[index]) : index + 1 }, details: { found, expected: header.length } },
  );
}

export function cellError(cell: string, column: ResolvedColumn, line: number, file: string): SpeedbandError {
  const problem = cellProblem(cell);
  const location = { file, line, column: columnLabel(column.index, column.header) };
  const messages: Record<typeof problem, [ErrorCode, string]> = {
    empty: ['log.emptyCell', `the ${column.channel} cell is empty — every row needs a number in every used column; fill it or remove the row`],
    nonFinite: [
      'log.nonFinite',
      `${column.channel} is ${quoted(cell.trim())}, not a finite number — the logger recorded no valid value here; remove the row or cut the log around it`,
    ],
    decimalComma: ['log.nonNumeric', `${column.channel} is ${quoted(cell.trim())}: a decimal comma — write numbers with a decimal point (e.g. 12.5)`],
    nonNumeric: ['log.nonNumeric', `${column.channel} is ${quoted(cell.trim())}, expected a decimal number (e.g. 0.0125 or 1.2e-3) — fix or remove the row`],
  };
  const [code, message] = messages[problem];
  return new SpeedbandError(code, message, { location, details: { channel: column.channel, cell: cutText(cell, QUOTED_TEXT_MAX) } });
}

/** A value outside its channel's plausible range, and where it stands (implausibleError). */
export interface ImplausibleValue {
  /** The value in SI units. */
  readonly value: number;
  /** The value as written, in the column's unit. */
  readonly raw: number;
  /** The column it stands in (channel, unit, index and header name). */
  readonly column: ResolvedColumn;
  /** 1-based line of the file. */
  readonly line: number;
  /** The log file, as the user named it. */
  readonly file: string;
}

export function implausibleError(found: ImplausibleValue): SpeedbandError {
  const { value, raw, column, line, file } = found;
  const definition = CHANNEL_DEFINITIONS[column.channel];
  const { min, max } = definition.plausible;
  const range = `${min === null ? '−∞' : min.toFixed(3)} … ${max === null ? '∞' : max.toFixed(3)} ${definition.siUnit}`;
  return new SpeedbandError(
    'log.implausibleValue',
    `${column.channel} is ${raw} ${column.unit}${column.unit === definition.siUnit ? '' : ` (${value.toPrecision(4)} ${definition.siUnit})`}, outside the plausible ${range} — ${definition.implausibleHint}`,
    { location: { file, line, column: columnLabel(column.index, column.header) }, details: { channel: column.channel, value, min, max } },
  );
}

/** Two times in a row that do not increase, and where they stand (timeOrderError). */
export interface TimeOrder {
  /** The earlier row's time, s. */
  readonly previous_s: number;
  /** This row's time, s: equal to or below `previous_s`. */
  readonly current_s: number;
  /** 1-based line of the earlier row. */
  readonly previousLine: number;
  /** 1-based line of this row. */
  readonly line: number;
  /** The time column. */
  readonly column: ResolvedColumn;
  /** The log file, as the user named it. */
  readonly file: string;
}

/** The error for a time that does not increase (the reader throws it when `current_s > previous_s` fails): a duplicate or a step back. */
export function timeOrderError(order: TimeOrder): SpeedbandError {
  const { previous_s: previous, current_s: current, previousLine, line, column, file } = order;
  const location = { file, line, column: columnLabel(column.index, column.header) };
  if (current === previous) {
    return new SpeedbandError('log.duplicateTime', `time_s ${current} appears twice (lines ${previousLine} and ${line}) — remove the duplicate sample`, {
      location,
      details: { time_s: current, previousLine },
    });
  }
  // Enough decimals to tell the two times apart (12.40 then 12.39), at least two.
  let decimals = 2;
  while (decimals < 9 && previous.toFixed(decimals) === current.toFixed(decimals)) decimals += 1;
  return new SpeedbandError(
    'log.timeNotIncreasing',
    `time_s must increase: ${previous.toFixed(decimals)} then ${current.toFixed(decimals)} at line ${line} — sort the log or split it`,
    { location, details: { previous_s: previous, current_s: current, previousLine } },
  );
}
