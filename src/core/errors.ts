/**
 * The one error type of speedband. Errors are data: a stable `code` from the
 * registry in src/core/error-codes.ts (`log.missingColumn`, `tuning.ruleNotApplicable`...),
 * a location (file, line, column or JSON path), the numbers involved, and a
 * message that says what was found, what was expected and what to do.
 * The CLI turns it into words on stderr and a non-zero exit code.
 */
import type { ErrorCode } from './error-codes.js';
import { safeMessageText } from './quote.js';

/** Where in an input an error is: file, 1-based line and column, or a JSON path. */
export interface ErrorLocation {
  readonly file?: string;
  /** 1-based line number in a text file. */
  readonly line?: number;
  /** 1-based column number, or a column name for CSV files. */
  readonly column?: number | string;
  /** JSON pointer or dotted path inside a JSON file. */
  readonly jsonPath?: string;
}

/** The one error type of speedband: a `code` from ERROR_CODES, a message saying what was found, what was expected and what to do, a location and the numbers involved. */
export class SpeedbandError extends Error {
  readonly code: ErrorCode;
  readonly location: ErrorLocation;
  readonly details: Readonly<Record<string, unknown>>;

  constructor(code: ErrorCode, message: string, options: { location?: ErrorLocation; details?: Record<string, unknown>; cause?: unknown } = {}) {
    super(message, options.cause === undefined ? undefined : { cause: options.cause });
    this.name = 'SpeedbandError';
    this.code = code;
    this.location = options.location ?? {};
    this.details = options.details ?? {};
  }
}

/** Whether a caught value is a SpeedbandError (bad input, exit 2) rather than a bug. */
export function isSpeedbandError(value: unknown): value is SpeedbandError {
  return value instanceof SpeedbandError;
}

/** "file:line:column" prefix for a location, or an empty string. */
export function formatLocation(location: ErrorLocation): string {
  const parts: string[] = [];
  if (location.file !== undefined) parts.push(location.file);
  if (location.line !== undefined) parts.push(`line ${location.line}`);
  if (location.column !== undefined) parts.push(`column ${location.column}`);
  if (location.jsonPath !== undefined) parts.push(`at ${location.jsonPath}`);
  return parts.join(', ');
}

/**
 * The full user-facing text of an error: location, then message — control characters escaped and
 * over-long lines cut (src/core/quote.ts), whatever text from an input the message carries.
 */
export function describeError(error: SpeedbandError): string {
  const where = formatLocation(error.location);
  return safeMessageText(where === '' ? error.message : `${where}: ${error.message}`);
}
