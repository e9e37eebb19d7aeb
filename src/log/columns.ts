/**
 * The channels a step-test log carries, the quantity each holds (the units a column
 * may be recorded in are in column-units.ts), and the physical limits beyond which a
 * value is taken as a unit or wiring mistake rather than a measurement. SI inside,
 * ISO 8855 signs (positive steer and yaw rate to the left).
 */
import type { PhysicalQuantity } from '../core/unit-expressions.js';

/** Channel names in the default CSV header; they are also the keys of a column map. */
export const CHANNELS = ['time_s', 'speed_mps', 'steer_cmd_rad', 'yaw_rate_radps', 'steer_angle_rad', 'lat_accel_mps2'] as const;
export type ChannelName = (typeof CHANNELS)[number];

export const REQUIRED_CHANNELS: readonly ChannelName[] = ['time_s', 'speed_mps', 'steer_cmd_rad', 'yaw_rate_radps'];

export type Quantity = PhysicalQuantity;

export interface ChannelDefinition {
  readonly quantity: Quantity;
  /** The SI unit the channel holds inside the program (its default unit in a log). */
  readonly siUnit: string;
  readonly describe: string;
  /** Smallest and largest plausible SI value; outside is a unit or wiring mistake. Null: no bound. */
  readonly plausible: { readonly min: number | null; readonly max: number | null };
  /** What to suggest when a value is outside the plausible range. */
  readonly implausibleHint: string;
}

/**
 * Plausibility limits (common practice for road and off-road vehicles; chosen
 * wide so that only unit or wiring mistakes trip them):
 * |road-wheel angle| ≤ π/2 rad (90°: no road wheel turns further),
 * speed in [−0.1, 100] m/s (small negative readings from a speed sensor at standstill are tolerated),
 * |yaw rate| ≤ 5 rad/s (≈ 290°/s, far beyond any vehicle on tyres),
 * |lateral acceleration| ≤ 30 m/s² (≈ 3 g).
 */
export const CHANNEL_DEFINITIONS: Readonly<Record<ChannelName, ChannelDefinition>> = {
  time_s: {
    quantity: 'time',
    siUnit: 's',
    describe: 'time',
    plausible: { min: null, max: null },
    implausibleHint: '',
  },
  speed_mps: {
    quantity: 'speed',
    siUnit: 'm/s',
    describe: 'vehicle speed',
    plausible: { min: -0.1, max: 100 },
    implausibleHint: 'speed must be forward and at most 100 m/s; if the column is in km/h or mph, give its unit (e.g. speed_mps=NAME:km/h)',
  },
  steer_cmd_rad: {
    quantity: 'angle',
    siUnit: 'rad',
    describe: 'road-wheel angle command',
    plausible: { min: -Math.PI / 2, max: Math.PI / 2 },
    implausibleHint:
      'a road-wheel angle beyond ±π/2 rad is probably degrees or a steering-wheel angle in a radian column; give its unit (e.g. steer_cmd_rad=NAME:deg or NAME:steering-wheel-deg)',
  },
  yaw_rate_radps: {
    quantity: 'angularRate',
    siUnit: 'rad/s',
    describe: 'yaw rate',
    plausible: { min: -5, max: 5 },
    implausibleHint: 'a yaw rate beyond ±5 rad/s is probably deg/s in a rad/s column; give its unit (e.g. yaw_rate_radps=NAME:deg/s)',
  },
  steer_angle_rad: {
    quantity: 'angle',
    siUnit: 'rad',
    describe: 'measured road-wheel angle',
    plausible: { min: -Math.PI / 2, max: Math.PI / 2 },
    implausibleHint:
      'a road-wheel angle beyond ±π/2 rad is probably degrees or a steering-wheel angle in a radian column; give its unit (e.g. steer_angle_rad=NAME:deg)',
  },
  lat_accel_mps2: {
    quantity: 'acceleration',
    siUnit: 'm/s2',
    describe: 'lateral acceleration',
    plausible: { min: -30, max: 30 },
    implausibleHint: 'a lateral acceleration beyond ±30 m/s² (3 g) is probably a wrong unit or channel',
  },
};

export function isChannelName(name: string): name is ChannelName {
  return (CHANNELS as readonly string[]).includes(name);
}
