/**
 * A column map says, for each channel, which header names the column and the
 * unit it was recorded in. Resolving it against a file's header gives, per
 * channel, the column number and the factor to SI.
 */
import { SpeedbandError } from '../core/errors.js';
import { closestName } from '../core/closest-name.js';
import { QUOTED_TEXT_MAX, cutText, escapeControlCharacters, quoted } from '../core/quote.js';
import { builtInConversion, checkUnitQuantity, resolveColumnUnit, type UnitConversion, type UnitOrigin } from './column-units.js';
import { CHANNELS, CHANNEL_DEFINITIONS, REQUIRED_CHANNELS, type ChannelName } from './columns.js';

/**
 * Where one channel comes from: the header name (default: the channel name) and its unit as written
 * (default: the channel's SI unit). `conversion` is filled in by `resolveColumnUnits` for units outside
 * the built-in table (they need mathjs); the log reader converts built-in units by itself.
 */
export interface ColumnSource {
  readonly from?: string;
  readonly unit?: string;
  readonly conversion?: UnitConversion;
}

/** Per channel (time_s, speed_mps, steer_cmd_rad, …): the header it is read from and its unit. */
export type ColumnMap = Readonly<Partial<Record<ChannelName, ColumnSource>>>;

/** One channel found in the header. */
export interface ResolvedColumn {
  readonly channel: ChannelName;
  /** Header name in the file. */
  readonly header: string;
  /** 0-based index into a row's cells. */
  readonly index: number;
  readonly unit: string;
  /** Multiply a recorded value by this to get SI (includes 1/steering ratio for steering-wheel units). */
  readonly toSi: number;
}

export interface ResolvedColumns {
  readonly columns: readonly ResolvedColumn[];
  /** Header names that map to no channel (read past, listed in warnings). */
  readonly ignored: readonly string[];
}

/** Later maps override earlier ones channel by channel (e.g. profile, then command-line options). */
export function mergeColumnMaps(...maps: readonly (ColumnMap | undefined)[]): ColumnMap {
  const merged: Partial<Record<ChannelName, ColumnSource>> = {};
  for (const map of maps) {
    if (map === undefined) continue;
    for (const channel of CHANNELS) {
      const source = map[channel];
      if (source === undefined) continue;
      const { conversion: _replaced, ...kept } = merged[channel] ?? {};
      // A unit given again brings its own conversion (or none until resolved); the earlier one goes with the earlier unit.
      merged[channel] = source.unit === undefined ? { ...merged[channel], ...source } : { ...kept, ...source };
    }
  }
  return merged;
}

/**
 * Give every unit of a column map its conversion (built-in, or through mathjs, loaded here): the
 * step between a map as written (a log profile, --column options, code) and reading logs with it.
 * `origin(channel)` says where each unit was written, for errors (`log.unknownUnit`, `log.unitMismatch`).
 */
export async function resolveColumnUnits(map: ColumnMap, origin: (channel: ChannelName) => UnitOrigin = () => ({})): Promise<ColumnMap> {
  const resolved: Partial<Record<ChannelName, ColumnSource>> = {};
  for (const channel of CHANNELS) {
    const source = map[channel];
    if (source === undefined) continue;
    resolved[channel] = source.unit === undefined ? source : { ...source, conversion: await resolveColumnUnit(channel, source.unit, origin(channel)) };
  }
  return resolved;
}

/**
 * Match a column map to a header. Required channels must be present; optional
 * ones are used when present (or must be present when the map names them).
 * `steeringRatio` (steering-wheel angle per road-wheel angle) is needed only
 * for steering-wheel units. Throws `log.missingColumn` (with "did you mean"),
 * `log.duplicateColumn`, `log.unitMismatch`, `log.unitNotResolved` (a unit outside the
 * built-in table given without its conversion) or `log.steeringRatioRequired`.
 */
export function resolveColumns(header: readonly string[], map: ColumnMap, steeringRatio: number | undefined, file: string): ResolvedColumns {
  const columns: ResolvedColumn[] = [];
  const used = new Set<number>();
  for (const channel of CHANNELS) {
    const source = map[channel];
    const name = source?.from ?? channel;
    const unit = source?.unit ?? CHANNEL_DEFINITIONS[channel].siUnit;
    const index = header.indexOf(name);
    if (index < 0) {
      if (!REQUIRED_CHANNELS.includes(channel) && source?.from === undefined) continue;
      throw missingColumn(channel, name, header, file);
    }
    const second = header.indexOf(name, index + 1);
    if (second >= 0) {
      throw new SpeedbandError(
        'log.duplicateColumn',
        `the header names column ${quoted(name)} twice (columns ${index + 1} and ${second + 1}) — rename one so that ${channel} is unambiguous`,
        { location: { file, line: 1, column: `${second + 1} (${cutText(escapeControlCharacters(name), QUOTED_TEXT_MAX)})` }, details: { channel, name } },
      );
    }
    const conversion = columnConversion(channel, unit, source?.conversion, file);
    columns.push({ channel, header: name, index, unit, toSi: unitFactor(channel, conversion, steeringRatio, file) });
    used.add(index);
  }
  const ignored = header.filter((name, index) => !used.has(index) && name !== '');
  return { columns, ignored };
}

/** The conversion resolved for this unit, else the built-in one; a unit needing mathjs must have been resolved. */
function columnConversion(channel: ChannelName, unit: string, resolved: UnitConversion | undefined, file: string): UnitConversion {
  const conversion = resolved !== undefined && resolved.unit === unit ? resolved : builtInConversion(unit);
  if (conversion === undefined) {
    throw new SpeedbandError(
      'log.unitNotResolved',
      `unit ${quoted(unit)} of ${channel} is not a built-in unit and was not converted — pass the column map through resolveColumnUnits (log profiles and --column options are) before reading`,
      { location: { file }, details: { channel, unit } },
    );
  }
  return checkUnitQuantity(channel, conversion, { location: { file } });
}

function unitFactor(channel: ChannelName, conversion: UnitConversion, steeringRatio: number | undefined, file: string): number {
  if (!conversion.steeringWheel) return conversion.toSi;
  if (steeringRatio === undefined || !Number.isFinite(steeringRatio) || steeringRatio <= 0) {
    throw new SpeedbandError(
      'log.steeringRatioRequired',
      `${channel} is a steering-wheel angle (${conversion.unit}) and needs the steering ratio to become a road-wheel angle, but ${
        steeringRatio === undefined ? 'none was given' : `the ratio given is ${steeringRatio}`
      } — pass --vehicle FILE (its steeringRatio) or --steering-ratio N`,
      { location: { file }, details: { channel, unit: conversion.unit, steeringRatio } },
    );
  }
  return conversion.toSi / steeringRatio;
}

/** At most this many header names are listed in a message. */
const LISTED_HEADER_NAMES = 30;

/** Header names for a message: each cut and escaped, at most LISTED_HEADER_NAMES of them. */
function listOfNames(header: readonly string[]): string {
  const shown = header.slice(0, LISTED_HEADER_NAMES).map((name) => escapeControlCharacters(cutText(name, QUOTED_TEXT_MAX)));
  return header.length > LISTED_HEADER_NAMES ? `${shown.join(', ')}, … (${header.length} columns)` : shown.join(', ');
}

function missingColumn(channel: ChannelName, name: string, header: readonly string[], file: string): SpeedbandError {
  const suggestion = closestName(name, header);
  const hint =
    suggestion === null
      ? `add the column, or map it with --column ${channel}=HEADER[:UNIT] or a log profile`
      : `did you mean ${quoted(suggestion)}? If so, rename it or map it with --column ${channel}=${cutText(suggestion, QUOTED_TEXT_MAX)}[:UNIT]`;
  return new SpeedbandError(
    'log.missingColumn',
    `no column ${quoted(name)} (${CHANNEL_DEFINITIONS[channel].describe}) in the header; found: ${listOfNames(header)} — ${hint}`,
    {
      location: { file, line: 1 },
      details: {
        channel,
        name: cutText(name, QUOTED_TEXT_MAX),
        suggestion,
        header: header.slice(0, LISTED_HEADER_NAMES).map((entry) => cutText(entry, QUOTED_TEXT_MAX)),
      },
    },
  );
}
