/**
 * Log profiles: a small JSON file that describes how a logger names and scales
 * its columns, so that logs from any recorder read without editing them.
 *
 *   {
 *     "description": "test-track logger, firmware 3.2",
 *     "columns": {
 *       "time_s":        { "from": "t",   "unit": "ms" },
 *       "speed_mps":     { "from": "v",   "unit": "km/h" },
 *       "steer_cmd_rad": { "from": "SWA", "unit": "steering-wheel-deg" }
 *     }
 *   }
 *
 * Channels not listed keep their default header name and SI unit.
 */
import { SpeedbandError } from '../core/errors.js';
import { readTextFile } from '../core/files.js';
import { validateLogProfile } from '../core/precompiled-validators.js';
import { makeValidator, parseJsonText } from '../core/schema.js';
import { CHANNELS, LOG_UNITS, isChannelName, isLogUnit, type ChannelName, type LogUnit } from './columns.js';
import type { ColumnMap } from './column-map.js';
import { quoted } from '../core/quote.js';

export interface LogProfile {
  readonly description?: string;
  readonly columns: ColumnMap;
}

const columnSourceSchema = {
  type: 'object',
  properties: {
    from: { type: 'string', minLength: 1, description: 'header name of the column in the log file' },
    unit: { enum: [...LOG_UNITS], description: 'unit the column was recorded in' },
  },
  additionalProperties: false,
};

/** JSON Schema of a log profile. */
export const LOG_PROFILE_SCHEMA = {
  type: 'object',
  properties: {
    description: { type: 'string' },
    columns: {
      type: 'object',
      properties: Object.fromEntries(CHANNELS.map((channel) => [channel, columnSourceSchema])),
      additionalProperties: false,
    },
  },
  required: ['columns'],
  additionalProperties: false,
} as const;

const validateProfile = makeValidator<LogProfile>(LOG_PROFILE_SCHEMA, 'log.profileInvalid', 'log profile', validateLogProfile);

/** Parse and validate log-profile JSON text; `file` names it in errors. */
export function parseLogProfile(text: string, file: string): LogProfile {
  return validateProfile(parseJsonText(text, file), file);
}

/** Read and validate a log-profile file. Throws `file.unreadable`, `json.syntax` or `log.profileInvalid`. */
export function loadLogProfile(path: string): LogProfile {
  return parseLogProfile(readTextFile(path), path);
}

/**
 * Parse command-line column options of the form `CHANNEL=HEADER[:UNIT]` or
 * `CHANNEL=:UNIT` (keep the header name, change the unit), e.g.
 * `speed_mps=v:km/h`, `steer_cmd_rad=SWA:steering-wheel-deg`.
 * The unit is whatever follows the last colon when it names a known unit.
 */
export function parseColumnOptions(options: readonly string[]): ColumnMap {
  const map: Partial<Record<ChannelName, { from?: string; unit?: LogUnit }>> = {};
  for (const option of options) {
    const equals = option.indexOf('=');
    const channel = equals < 0 ? option : option.slice(0, equals);
    if (equals < 0 || !isChannelName(channel)) {
      throw new SpeedbandError(
        'log.badColumnOption',
        `--column ${quoted(option)} is not CHANNEL=HEADER[:UNIT] with CHANNEL one of ${CHANNELS.join(', ')} — e.g. --column speed_mps=v:km/h`,
        { details: { option } },
      );
    }
    const rest = option.slice(equals + 1);
    const colon = rest.lastIndexOf(':');
    let from = rest;
    let unit: LogUnit | undefined;
    if (colon >= 0) {
      const candidate = rest.slice(colon + 1);
      if (!isLogUnit(candidate)) {
        throw new SpeedbandError(
          'log.unknownUnit',
          `--column ${quoted(option)}: unknown unit ${quoted(candidate)} — use one of ${LOG_UNITS.join(', ')}`,
          { details: { option, unit: candidate } },
        );
      }
      unit = candidate;
      from = rest.slice(0, colon);
    }
    map[channel] = { ...(from === '' ? {} : { from }), ...(unit === undefined ? {} : { unit }) };
  }
  return map;
}
