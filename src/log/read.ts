/**
 * Read a step-test log (CSV with a header) into a validated `SteerLog`:
 * channels mapped and converted to SI, every row checked, the log split at
 * time gaps, every unused line counted by reason.
 */
import { SpeedbandError } from '../core/errors.js';
import { readTextFile } from '../core/files.js';
import { CHANNEL_DEFINITIONS, type ChannelName } from './columns.js';
import { resolveColumns, type ColumnMap } from './column-map.js';
import { cleanHeaderCell, detectDelimiter, parseDecimalRange, type Delimiter } from './csv-text.js';
import { cellError, implausibleError, rowLengthError, timeOrderError } from './read-errors.js';
import { countIrregularSteps, medianStep, splitAtGaps } from './time-gaps.js';
import type { SteerLog } from './types.js';

/** Defaults of reading a log: a time step longer than `gapFactor` median periods splits it. */
export const READ_DEFAULTS = {
  /** A time step longer than this many median sample periods splits the log into segments. */
  gapFactor: 5,
} as const;

/** How to read a log: column names and units (a column map), the steering ratio for steering-wheel columns, the gap factor. */
export interface ReadLogOptions {
  /** Header names and units per channel; channels not listed use their default name and SI unit. */
  readonly columns?: ColumnMap;
  /** Steering-wheel angle per road-wheel angle; needed only for steering-wheel units. */
  readonly steeringRatio?: number;
  /** See READ_DEFAULTS.gapFactor. */
  readonly gapFactor?: number;
}

/** Read and validate a log file. See `parseSteerLog`. */
export function readSteerLog(path: string, options: ReadLogOptions = {}): SteerLog {
  return parseSteerLog(readTextFile(path), path, options);
}

/**
 * Parse and validate log text (`file` names it in errors and in the result).
 * Accepts a UTF-8 byte-order mark, LF or CRLF, comma/semicolon/tab delimiters
 * (detected from the header), any column order and extra columns (ignored,
 * listed in `warnings`). Blank lines and lines starting with `#` are skipped and
 * counted in `droppedRows`. Values are converted to SI (s, m/s, rad, rad/s, m/s²).
 * Throws `SpeedbandError` (file, 1-based line, column number and name) for an
 * empty or header-only file, a missing column, a missing/extra/non-numeric/
 * non-finite cell, time not strictly increasing, or an implausible magnitude.
 */
export function parseSteerLog(text: string, file: string, options: ReadLogOptions = {}): SteerLog {
  const gapFactor = options.gapFactor ?? READ_DEFAULTS.gapFactor;
  if (!(Number.isFinite(gapFactor) && gapFactor > 1)) {
    throw new SpeedbandError(
      'log.badOption',
      `the gap factor is ${gapFactor} — it must be a number above 1 (default ${READ_DEFAULTS.gapFactor} sample periods)`,
      {
        details: { option: 'gapFactor', value: gapFactor },
      },
    );
  }
  const droppedRows: Record<string, number> = {};
  const drop = (reason: string): void => {
    droppedRows[reason] = (droppedRows[reason] ?? 0) + 1;
  };

  // The text is scanned in place, line by line, without splitting it into strings (see csv-text.ts).
  let position = text.charCodeAt(0) === 0xfeff ? 1 : 0;
  let lineNumber = 0;
  let header: string[] | null = null;
  let headerLine = 0;
  let delimiter: Delimiter = ',';
  while (position < text.length && header === null) {
    const { contentEnd, next } = lineBounds(text, position);
    lineNumber += 1;
    const kind = lineKind(text, position, contentEnd);
    if (kind === 'data') {
      headerLine = lineNumber;
      const headerText = text.slice(position, contentEnd);
      delimiter = detectDelimiter(headerText);
      header = headerText.split(delimiter).map(cleanHeaderCell);
    } else {
      drop(kind);
    }
    position = next;
  }
  if (header === null) {
    throw new SpeedbandError('log.empty', 'the file is empty — expected a header line (e.g. time_s,speed_mps,steer_cmd_rad,yaw_rate_radps) and data rows', {
      location: { file },
    });
  }
  const delimiterCode = delimiter.charCodeAt(0);
  const { columns, ignored } = resolveColumns(header, options.columns ?? {}, options.steeringRatio, file);

  // Upper bound on the number of rows: the number of line feeds left, plus one.
  let capacity = 1;
  for (let at = text.indexOf('\n', position); at >= 0; at = text.indexOf('\n', at + 1)) capacity += 1;
  const values = columns.map(() => new Float64Array(capacity));
  const slotOfColumn = new Int32Array(header.length).fill(-1);
  columns.forEach((column, slot) => {
    slotOfColumn[column.index] = slot;
  });
  const toSi = Float64Array.from(columns, (column) => column.toSi);
  const lowest = Float64Array.from(columns, (column) => CHANNEL_DEFINITIONS[column.channel].plausible.min ?? -Infinity);
  const highest = Float64Array.from(columns, (column) => CHANNEL_DEFINITIONS[column.channel].plausible.max ?? Infinity);
  const lineOfRow = new Int32Array(capacity);
  const timeSlot = columns.findIndex((column) => column.channel === 'time_s');
  const timeValues = values[timeSlot];
  let rowCount = 0;
  let rows = 0;
  while (position < text.length) {
    const { contentEnd, next } = lineBounds(text, position);
    lineNumber += 1;
    const lineStart = position;
    position = next;
    const kind = lineKind(text, lineStart, contentEnd);
    if (kind !== 'data') {
      rowCount += 1;
      drop(kind);
      continue;
    }
    rowCount += 1;
    let cellStart = lineStart;
    let cellCount = 0;
    for (;;) {
      let cellEnd = text.indexOf(delimiter, cellStart);
      if (cellEnd < 0 || cellEnd > contentEnd) cellEnd = contentEnd;
      const slot = cellCount < slotOfColumn.length ? slotOfColumn[cellCount] : -1;
      if (slot >= 0) {
        const raw = parseDecimalRange(text, cellStart, cellEnd);
        // biome-ignore lint/suspicious/noSelfCompare: the reader's NaN test, in the hot loop without a call
        if (raw !== raw) throw cellError(text.slice(cellStart, cellEnd), columns[slot], lineNumber, file);
        const value = raw * toSi[slot];
        if (!(value >= lowest[slot] && value <= highest[slot])) throw implausibleError({ value, raw, column: columns[slot], line: lineNumber, file });
        values[slot][rows] = value;
      }
      cellCount += 1;
      if (cellEnd >= contentEnd || text.charCodeAt(cellEnd) !== delimiterCode) break;
      cellStart = cellEnd + 1;
    }
    if (cellCount !== header.length) throw rowLengthError(cellCount, header, lineNumber, file);
    if (rows > 0 && !(timeValues[rows] > timeValues[rows - 1])) {
      throw timeOrderError({
        previous_s: timeValues[rows - 1],
        current_s: timeValues[rows],
        previousLine: lineOfRow[rows - 1],
        line: lineNumber,
        column: columns[timeSlot],
        file,
      });
    }
    lineOfRow[rows] = lineNumber;
    rows += 1;
  }
  if (rows < 2) {
    throw new SpeedbandError(
      'log.headerOnly',
      `the file has ${rows === 0 ? 'a header but no data rows' : 'only one data row'} — a step-test log needs samples over time; check that the logger wrote its data`,
      { location: { file, line: headerLine }, details: { rows } },
    );
  }

  const channel = (name: ChannelName): Float64Array | undefined => {
    const c = columns.findIndex((column) => column.channel === name);
    return c < 0 ? undefined : values[c];
  };
  const time_s = channel('time_s') as Float64Array;
  const samplePeriod_s = medianStep(time_s, rows);
  const { segments, splits } = splitAtGaps({ file, rows, lineOfRow, maxStep_s: samplePeriod_s * gapFactor, channel });

  const warnings: string[] = [];
  const irregular = countIrregularSteps(time_s, rows, samplePeriod_s, gapFactor);
  if (irregular > 0) {
    warnings.push(
      `${irregular} time step${irregular === 1 ? '' : 's'} longer than 1.5 median sample periods (but not long enough to split the log): the logger missed samples or its clock jitters`,
    );
  }
  if (ignored.length > 0) warnings.push(`columns not used: ${ignored.join(', ')}`);
  if (splits.length > 0) {
    warnings.push(
      `the log has ${splits.length} time gap${splits.length === 1 ? '' : 's'} longer than ${gapFactor} sample periods and was split into ${segments.length} segments`,
    );
  }
  for (const [reason, count] of Object.entries(droppedRows))
    warnings.push(`${count} ${reason === 'blankLine' ? 'blank' : 'comment'} line${count === 1 ? '' : 's'} skipped`);

  return {
    file,
    segments,
    rowCount,
    droppedRows,
    splits,
    samplePeriod_s,
    warnings,
    delimiter,
    ignoredColumns: ignored,
    channels: columns.map((column) => ({
      channel: column.channel,
      header: column.header,
      columnNumber: column.index + 1,
      unit: column.unit,
      toSi: column.toSi,
    })),
  };
}

/** End of the line's content (before CR LF or LF) and the start of the next line. */
function lineBounds(text: string, from: number): { contentEnd: number; next: number } {
  const feed = text.indexOf('\n', from);
  const end = feed < 0 ? text.length : feed;
  const contentEnd = end > from && text.charCodeAt(end - 1) === 13 ? end - 1 : end;
  return { contentEnd, next: end + 1 };
}

/** A line with only blanks, a comment line (first non-blank character '#'), or data. */
function lineKind(text: string, from: number, to: number): 'blankLine' | 'commentLine' | 'data' {
  for (let i = from; i < to; i += 1) {
    const code = text.charCodeAt(i);
    if (code === 32 || code === 9 || code === 13) continue;
    return code === 35 ? 'commentLine' : 'data';
  }
  return 'blankLine';
}
