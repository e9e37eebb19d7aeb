/**
 * Logs checked against physics before identification: which channel, if any, is off by a factor — a
 * speed in km/h or mph read as m/s, a steering-wheel angle or degrees read as road-wheel radians —
 * and the `--column` that fixes it. From the kinematic ratios of channel-observations.ts, each 1 for
 * correct logs: one channel off by q moves each ratio by q, 1/q or not at all (the table below), so the
 * pattern of the ratios names the channel, and q names its likely unit.
 */
import { SpeedbandError } from '../core/errors.js';
import { quoted } from '../core/quote.js';
import { MPS_PER_KPH, MPS_PER_MPH, RADIANS_PER_DEGREE, STANDARD_GRAVITY_MPS2 } from '../core/units.js';
import type { LogChannelSource } from '../log/types.js';
import type { ChannelObservations } from './channel-observations.js';

type Observation = Exclude<keyof ChannelObservations, 'speedCount'>;
export type ScaledChannel = 'speed_mps' | 'steer_cmd_rad' | 'yaw_rate_radps' | 'steer_angle_rad' | 'lat_accel_mps2';

/** Ratios within this factor of 1 are consistent (noise, roll of the accelerometer, the extrapolation to standstill). */
export const CHANNEL_SCALE_TOLERANCE = 1.5;
/** One channel explains the ratios when each is within this factor of what it predicts. */
const EXPLAINED_TOLERANCE = 1.25;
/** A factor names a unit when within this factor of the unit's. */
const UNIT_TOLERANCE = 1.1;

/** How a channel recorded q times too high moves each ratio: ratio = q^power. */
const POWERS: Readonly<Record<ScaledChannel, Readonly<Record<Observation, number>>>> = {
  speed_mps: { kinematicCommand: 1, kinematicMeasured: 1, steadyTurning: 1, actuatorGain: 0 },
  steer_cmd_rad: { kinematicCommand: 1, kinematicMeasured: 0, steadyTurning: 0, actuatorGain: -1 },
  yaw_rate_radps: { kinematicCommand: -1, kinematicMeasured: -1, steadyTurning: 1, actuatorGain: 0 },
  steer_angle_rad: { kinematicCommand: 0, kinematicMeasured: 1, steadyTurning: 0, actuatorGain: 1 },
  lat_accel_mps2: { kinematicCommand: 0, kinematicMeasured: 0, steadyTurning: -1, actuatorGain: 0 },
};

/** Units a channel is often recorded in, with their factor to SI (steering-wheel ones divided by the steering ratio). */
function unitsOf(channel: ScaledChannel, steeringRatio: number): readonly { unit: string; toSi: number }[] {
  switch (channel) {
    case 'speed_mps':
      return [
        { unit: 'm/s', toSi: 1 },
        { unit: 'km/h', toSi: MPS_PER_KPH },
        { unit: 'mph', toSi: MPS_PER_MPH },
        { unit: 'ft/s', toSi: 0.3048 },
      ];
    case 'yaw_rate_radps':
      return [
        { unit: 'rad/s', toSi: 1 },
        { unit: 'deg/s', toSi: RADIANS_PER_DEGREE },
      ];
    case 'lat_accel_mps2':
      return [
        { unit: 'm/s^2', toSi: 1 },
        { unit: 'g', toSi: STANDARD_GRAVITY_MPS2 },
        { unit: 'ft/s^2', toSi: 0.3048 },
      ];
    default:
      return [
        { unit: 'rad', toSi: 1 },
        { unit: 'deg', toSi: RADIANS_PER_DEGREE },
        { unit: 'steering-wheel-rad', toSi: 1 / steeringRatio },
        { unit: 'steering-wheel-deg', toSi: RADIANS_PER_DEGREE / steeringRatio },
      ];
  }
}

/** One channel that explains the ratios: its factor (recorded/true, in SI) and the unit it was likely recorded in. */
export interface ChannelScaleFinding {
  readonly channel: ScaledChannel;
  readonly factor: number;
  /** The unit whose conversion gives the true values, or null when the factor matches none. */
  readonly likelyUnit: string | null;
}

export type ChannelScaleVerdict =
  | { readonly kind: 'consistent' }
  | { readonly kind: 'scaled'; readonly findings: readonly ChannelScaleFinding[] }
  | { readonly kind: 'inconsistent' };

const OBSERVATIONS: readonly Observation[] = ['kinematicCommand', 'kinematicMeasured', 'steadyTurning', 'actuatorGain'];

/**
 * What the ratios say: consistent (each within CHANNEL_SCALE_TOLERANCE of 1), one channel off (those that
 * explain the pattern, the ones whose factor matches a unit first), or inconsistent (no single channel).
 * `sources` gives each channel's recorded factor to SI (default 1).
 */
export function judgeChannelScales(observations: ChannelObservations, sources: readonly LogChannelSource[], steeringRatio: number): ChannelScaleVerdict {
  const logs = OBSERVATIONS.flatMap((name) => {
    const value = observations[name];
    return value === null || !(value > 0) ? [] : [{ name, log: Math.log(value) }];
  });
  if (logs.every((entry) => Math.abs(entry.log) < Math.log(CHANNEL_SCALE_TOLERANCE))) return { kind: 'consistent' };
  const findings: (ChannelScaleFinding & { misfit: number })[] = [];
  for (const channel of Object.keys(POWERS) as ScaledChannel[]) {
    const powers = POWERS[channel];
    const involved = logs.filter((entry) => powers[entry.name] !== 0);
    if (involved.length === 0) continue;
    const logFactor =
      involved.reduce((sum, entry) => sum + powers[entry.name] * entry.log, 0) / involved.reduce((sum, entry) => sum + powers[entry.name] ** 2, 0);
    const misfit = Math.max(...logs.map((entry) => Math.abs(entry.log - powers[entry.name] * logFactor)));
    if (misfit > Math.log(EXPLAINED_TOLERANCE) || Math.abs(logFactor) < Math.log(CHANNEL_SCALE_TOLERANCE)) continue;
    const factor = Math.exp(logFactor);
    findings.push({ channel, factor, likelyUnit: likelyUnit(channel, factor, sources, steeringRatio), misfit });
  }
  if (findings.length === 0) return { kind: 'inconsistent' };
  findings.sort((a, b) => Number(a.likelyUnit === null) - Number(b.likelyUnit === null) || a.misfit - b.misfit);
  return { kind: 'scaled', findings: findings.map(({ misfit: _misfit, ...finding }) => finding) };
}

/** The unit that turns the recorded values into the true ones: recorded factor / q, matched to a common unit. */
function likelyUnit(channel: ScaledChannel, factor: number, sources: readonly LogChannelSource[], steeringRatio: number): string | null {
  const recordedToSi = sources.find((source) => source.channel === channel)?.toSi ?? 1;
  const wanted = recordedToSi / factor;
  const match = unitsOf(channel, steeringRatio)
    .map((candidate) => ({ ...candidate, distance: Math.abs(Math.log(candidate.toSi / wanted)) }))
    .sort((a, b) => a.distance - b.distance)[0];
  return match !== undefined && match.distance < Math.log(UNIT_TOLERANCE) ? match.unit : null;
}

const shown = (value: number | null): string => (value === null ? '—' : value.toPrecision(3));

/** The ratios in words, for the message. */
function observationWords(observations: ChannelObservations, wheelbase_m: number): string {
  const parts = [
    `the steady yaw gain r/δ extrapolated to standstill is ${shown(observations.kinematicCommand)}× the kinematic v/L (L = ${wheelbase_m.toPrecision(3)} m from the vehicle file; ` +
      'understeer only lowers it at speed)',
  ];
  if (observations.kinematicMeasured !== null) parts.push(`with the measured road-wheel angle ${shown(observations.kinematicMeasured)}×`);
  if (observations.steadyTurning !== null)
    parts.push(`v·r is ${shown(observations.steadyTurning)}× the logged lateral acceleration (steady turning: a_y = v·r)`);
  if (observations.actuatorGain !== null) parts.push(`the measured road-wheel angle moves ${shown(observations.actuatorGain)}× the command`);
  return parts.join('; ');
}

/**
 * Throw `identify.channelScale` unless the ratios are consistent: the channel, the factor, its likely unit
 * and the `--column` that fixes it (or, with no single channel to blame, the ratios to look at).
 */
export function requireConsistentChannels(
  observations: ChannelObservations,
  sources: readonly LogChannelSource[],
  vehicle: { readonly wheelbase_m: number; readonly steeringRatio: number },
  logCount: number,
): void {
  const verdict = judgeChannelScales(observations, sources, vehicle.steeringRatio);
  if (verdict.kind === 'consistent') return;
  const words = observationWords(observations, vehicle.wheelbase_m);
  const check = 'if the logs are right, check the vehicle file (cgToFrontAxle_m + cgToRearAxle_m is the wheelbase L)';
  if (verdict.kind === 'inconsistent') {
    throw new SpeedbandError(
      'identify.channelScale',
      `the ${logCount} log(s) disagree with the vehicle's kinematics and no single channel explains it: ${words} (each should be 1) — check the units of speed_mps, steer_cmd_rad, yaw_rate_radps` +
        `${observations.steadyTurning === null ? '' : ' and lat_accel_mps2'} (--column CHANNEL=HEADER:UNIT); ${check}`,
      { details: { observations } },
    );
  }
  const [first, ...others] = verdict.findings;
  const source = sources.find((entry) => entry.channel === first.channel);
  const header = source?.header ?? first.channel;
  const recorded = source === undefined ? '' : ` (column ${quoted(header)} read as ${source.unit})`;
  const fix =
    first.likelyUnit === null
      ? `give its unit with --column ${first.channel}=${header}:UNIT`
      : `it looks like ${first.likelyUnit}: --column ${first.channel}=${header}:${first.likelyUnit} (or "unit": "${first.likelyUnit}" in the log profile)`;
  const alternatives =
    others.length === 0
      ? ''
      : ` The ratios fit ${others.map((other) => `${other.channel} off by ${shown(other.factor)}${other.likelyUnit === null ? '' : ` (${other.likelyUnit})`}`).join(' or ')} as well` +
        `${observations.steadyTurning === null || observations.actuatorGain === null ? ' — logging lat_accel_mps2 and steer_angle_rad tells the channels apart' : ''}.`;
  throw new SpeedbandError(
    'identify.channelScale',
    `in the ${logCount} log(s), ${first.channel}${recorded} reads ${first.factor >= 1 ? `${shown(first.factor)}× too high` : `1/${shown(1 / first.factor)} of the true value`} for the vehicle's kinematics: ${words} — ${fix}; ${check}.${alternatives}`,
    { details: { observations, findings: verdict.findings } },
  );
}
