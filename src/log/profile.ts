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
 * Channels not listed keep their default header name and SI unit. A unit is any unit
 * of the channel's quantity (column-units.ts): built-in ones at once, others through mathjs.
 */
import { SpeedbandError } from '../core/errors.js';
import { readTextFile } from '../core/files.js';
import { validateLogProfile } from '../core/precompiled-validators.js';
import { makeValidator, parseJsonText } from '../core/schema.js';
import { quoted } from '../core/quote.js';
import { MAXIMUM_UNIT_LENGTH } from '../core/unit-expressions.js';
import { CHANNELS, isChannelName, type ChannelName } from './columns.js';
import { resolveColumnUnits, type ColumnMap } from './column-map.js';

/** A log-profile file: the log columns of a logger and their units, as `{ "columns": { CHANNEL: { "from", "unit" } } }`. */
export interface LogProfile {
  readonly description?: string;
  readonly columns: ColumnMap;
}

const columnSourceSchema = {
  type: 'object',
  properties: {
    from: { type: 'string', minLength: 1, description: 'header name of the column in the log file' },
    unit: {
      type: 'string',
      minLength: 1,
      maxLength: MAXIMUM_UNIT_LENGTH,
      description: "unit the column was recorded in: any unit of the channel's quantity (km/h, mi/h, deg, deg/s, ms, g, steering-wheel-deg…)",
    },
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

const validateProfile = makeValidator<LogProfile>({
  schema: LOG_PROFILE_SCHEMA,
  code: 'log.profileInvalid',
  what: 'log profile',
  precompiled: validateLogProfile,
});

/**
 * Parse and validate log-profile JSON text and convert its units (`file` names it in errors).
 * Throws `json.syntax`, `log.profileInvalid`, or `log.unknownUnit` / `log.unitMismatch` at the unit's JSON path.
 */
export async function parseLogProfile(text: string, file: string): Promise<LogProfile> {
  const profile = validateProfile(parseJsonText(text, file), file);
  const columns = await resolveColumnUnits(profile.columns, (channel) => ({ location: { file, jsonPath: `/columns/${channel}/unit` } }));
  return { ...profile, columns };
}

/** Read a log-profile file, validate it and convert its units. Throws `file.unreadable` and the errors of `parseLogProfile`. */
export function loadLogProfile(path: string): Promise<LogProfile> {
  return parseLogProfile(readTextFile(path), path);
}

/**
 * Parse command-line column options of the form `CHANNEL=HEADER[:UNIT]` or
 * `CHANNEL=:UNIT` (keep the header name, change the unit), e.g.
 * `speed_mps=v:km/h`, `speed_mps=v:mi/h`, `steer_cmd_rad=SWA:steering-wheel-deg`,
 * and convert their units. The unit is whatever follows the last colon.
 * Throws `log.badColumnOption`, `log.unknownUnit` or `log.unitMismatch` naming the option.
 */
export async function parseColumnOptions(options: readonly string[]): Promise<ColumnMap> {
  const map: Partial<Record<ChannelName, { from?: string; unit?: string }>> = {};
  const written: Partial<Record<ChannelName, string>> = {};
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
    const from = colon < 0 ? rest : rest.slice(0, colon);
    const unit = colon < 0 ? undefined : rest.slice(colon + 1).trim();
    if (unit === '') {
      throw new SpeedbandError(
        'log.badColumnOption',
        `--column ${quoted(option)} ends with ":" but gives no unit — write CHANNEL=HEADER:UNIT (e.g. speed_mps=v:km/h) or drop the colon`,
        {
          details: { option },
        },
      );
    }
    map[channel] = { ...(from === '' ? {} : { from }), ...(unit === undefined ? {} : { unit }) };
    written[channel] = option;
  }
  return resolveColumnUnits(map, (channel) => ({ label: `--column ${quoted(written[channel] ?? '')}`, location: {} }));
}
