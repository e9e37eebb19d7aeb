import type { Argv } from 'yargs';
import type { ColumnMap } from '../log/column-map.js';

/** The column-map options every command that reads logs shares: a log-profile file and per-channel overrides. */
export function withLogColumnOptions<T>(yargs: Argv<T>) {
  return yargs
    .option('log-profile', {
      type: 'string',
      describe: 'JSON file naming the log columns and their units, e.g. {"columns": {"speed_mps": {"from": "v", "unit": "km/h"}}}',
    })
    .option('column', {
      type: 'string',
      array: true,
      describe:
        "Map one channel, CHANNEL=HEADER[:UNIT] (overrides the profile; repeatable). Channels: time_s, speed_mps, steer_cmd_rad, yaw_rate_radps, steer_angle_rad, lat_accel_mps2. UNIT: any unit of the channel's quantity as mathjs writes it — time s, ms, min; speed m/s, km/h, mi/h (or mph), ft/s; angle rad, deg, grad; angular rate rad/s, deg/s; acceleration m/s^2, ft/s^2, g (standard gravity) — or steering-wheel-deg / steering-wheel-rad (divided by the vehicle's steering ratio)",
    });
}

/** The column map of --log-profile and --column (the options win), units converted, or undefined when neither is given. */
/** The options of withLogColumnOptions as a command reads them. */
export interface LogColumnArgs {
  readonly column?: readonly string[];
  readonly 'log-profile'?: string;
}

export async function logColumnsFromArgs(args: LogColumnArgs): Promise<ColumnMap | undefined> {
  const columnOptions = args.column ?? [];
  if (args['log-profile'] === undefined && columnOptions.length === 0) return undefined;
  const { loadLogProfile, parseColumnOptions } = await import('../log/profile.js');
  const { mergeColumnMaps } = await import('../log/column-map.js');
  const profile = args['log-profile'] === undefined ? undefined : await loadLogProfile(args['log-profile']);
  return mergeColumnMaps(profile?.columns, await parseColumnOptions(columnOptions));
}

/** The input files named by the given options (those that were given), with their role, for checkOutputPaths. */
export function optionalInputs<A extends object>(args: A, options: readonly (readonly [string, string])[]): { path: string; role: string }[] {
  return options
    .filter(([option]) => (args as Record<string, unknown>)[option] !== undefined)
    .map(([option, role]) => ({ path: String((args as Record<string, unknown>)[option]), role }));
}
