/**
 * Synthetic step-steer test logs: the planned command (step-plan.ts) run through the
 * exact simulator (simulate.ts) on a vehicle's nominal single-track model, with seeded
 * sensor noise and bias, written in the default CSV format
 *   time_s,speed_mps,steer_cmd_rad,steer_angle_rad,yaw_rate_radps,lat_accel_mps2
 * one file per speed, named `synthetic-steps-<speed>mps.csv`, and a README.md in the
 * folder that says the data are invented and how they were made. The CSV itself
 * carries no comment lines (a plain header first). Same inputs and seed → same bytes.
 */
import { existsSync, readFileSync } from 'node:fs';
import { join } from 'node:path';
import { SpeedbandError } from '../core/errors.js';
import { writeFileAtomic, type WriteOptions, type WriteOutcome } from '../core/files.js';
import { makeRandom } from '../core/random.js';
import { radiansToDegrees } from '../core/units.js';
import { simulateSingleTrack } from './simulate.js';
import { singleTrackParametersFromVehicle } from './single-track.js';
import {
  LIMITED_BY_WORDS,
  planDuration_s,
  planSteps,
  sampleCommand,
  stepAmplitudes,
  STEP_PLAN_DEFAULTS,
  type PlannedStep,
  type StepAmplitudes,
} from './step-plan.js';
import type { Vehicle } from './types.js';

/** Defaults of synthetic logs: seed, sample rate and the sensor noise levels (demo data only). */
export const TEST_LOG_DEFAULTS = {
  seed: 1,
  sampleRate_hz: 50,
  /** Multiplies every noise level and the bias below; 0 gives noise-free logs. */
  noiseScale: 1,
  /** Speed sensor noise σ as a fraction of the speed, and at least speedNoiseFloor_mps. */
  speedNoiseFraction: 0.004,
  speedNoiseFloor_mps: 0.005,
  /** Yaw-rate sensor white noise σ, rad/s (≈ 0.06°/s, a MEMS gyro at 50 Hz — common practice). */
  yawRateNoise_radps: 0.001,
  /** Yaw-rate sensor bias, drawn per file uniformly in ± this, rad/s. */
  yawRateBiasMax_radps: 0.003,
  /** Road-wheel angle sensor noise σ, rad. */
  steerAngleNoise_rad: 0.0003,
  /** Lateral accelerometer noise σ, m/s². */
  lateralAccelerationNoise_mps2: 0.03,
  /** Command quantisation step, rad (0: not quantised). */
  commandResolution_rad: 0,
} as const;

export type TestLogSettings = { readonly [K in keyof typeof TEST_LOG_DEFAULTS]: number };

/** Options of generateTestLog: any TEST_LOG_DEFAULTS value, fixed step amplitudes, command quantisation. */
export interface TestLogOptions extends Partial<TestLogSettings> {
  /** Large and small amplitudes (rad, positive) for every speed, instead of the per-speed rule. */
  readonly amplitudes_rad?: readonly number[];
  /** How the README's regenerate command names the vehicle file and the output folder (default: placeholders). */
  readonly commandPaths?: { readonly vehicle: string; readonly out: string };
}

/** Decimals written per column (4–5 significant places keep the demo data small). */
const DECIMALS = { speed_mps: 3, angle_rad: 5, yawRate_radps: 5, lateralAcceleration_mps2: 3 } as const;
export const TEST_LOG_COLUMNS = ['time_s', 'speed_mps', 'steer_cmd_rad', 'steer_angle_rad', 'yaw_rate_radps', 'lat_accel_mps2'] as const;

/** One synthetic step-test log: its CSV text, the planned steps and their onsets. */
export interface GeneratedTestLog {
  readonly fileName: string;
  readonly speed_mps: number;
  readonly csv: string;
  /** Every commanded step in the file, returns to zero included, in time order. */
  readonly steps: readonly PlannedStep[];
  readonly amplitudes: StepAmplitudes;
  readonly yawRateBias_radps: number;
  readonly sampleCount: number;
}

/** `synthetic-steps-07.50mps.csv`: labelled synthetic, zero-padded so files sort by speed. */
export function testLogFileName(speed_mps: number): string {
  return `synthetic-steps-${speed_mps.toFixed(2).padStart(5, '0')}mps.csv`;
}

/** Fixed-point text without a negative zero. */
function fixed(value: number, decimals: number): string {
  const text = value.toFixed(decimals);
  return /^-0\.?0*$/.test(text) ? text.slice(1) : text;
}

/** Fewest decimals (≤ 6) that write every multiple of the sample period exactly. */
function timeDecimals(period_s: number): number {
  for (let decimals = 0; decimals < 6; decimals += 1) {
    const scaled = period_s * 10 ** decimals;
    if (Math.abs(scaled - Math.round(scaled)) < 1e-9) return decimals;
  }
  return 6;
}

/** Seed of one file: the user's seed mixed with the speed, so a file does not depend on the other speeds in the list. */
function fileSeed(seed: number, speed_mps: number): number {
  return (Math.imul(seed >>> 0, 0x9e3779b1) ^ Math.round(speed_mps * 1000)) >>> 0;
}

function settingsOf(options: TestLogOptions): TestLogSettings {
  const settings = { ...TEST_LOG_DEFAULTS, ...options };
  const positive = (name: string, value: number) => {
    if (!(Number.isFinite(value) && value > 0))
      throw new SpeedbandError('testLogs.badOption', `${name} must be above 0, got ${value}`, { details: { name, value } });
  };
  positive('sampleRate_hz', settings.sampleRate_hz);
  if (!(settings.noiseScale >= 0)) throw new SpeedbandError('testLogs.badOption', `noiseScale must be 0 or more, got ${settings.noiseScale}`, {});
  if (!(settings.commandResolution_rad >= 0))
    throw new SpeedbandError('testLogs.badOption', `commandResolution_rad must be 0 (none) or more, got ${settings.commandResolution_rad}`, {});
  if (!Number.isInteger(settings.seed)) throw new SpeedbandError('testLogs.badOption', `seed must be an integer, got ${settings.seed}`, {});
  return settings;
}

/**
 * One synthetic step-test log at a constant speed (m/s > 0): command plan, exact simulation
 * (delay, lag and limits of the vehicle's actuator), seeded noise, CSV text. SI units, ISO 8855 signs.
 * Throws `vehicle.noCorneringStiffness` when the vehicle has no nominal stiffnesses and
 * `testLogs.unstableSpeed` above an oversteering vehicle's critical speed.
 */
export function generateTestLog(vehicle: Vehicle, speed_mps: number, options: TestLogOptions = {}): GeneratedTestLog {
  const settings = settingsOf(options);
  const params = singleTrackParametersFromVehicle(vehicle);
  const limits = { maxSteerAngle_rad: vehicle.maxSteerAngle_rad, maxSteerRate_radps: vehicle.maxSteerRate_radps };
  const given = options.amplitudes_rad;
  for (const amplitude of given ?? []) {
    if (!(amplitude > 0 && amplitude < vehicle.maxSteerAngle_rad)) {
      throw new SpeedbandError(
        'testLogs.badAmplitude',
        `step amplitude ${radiansToDegrees(amplitude).toFixed(2)}° is not between 0 and the vehicle's steer angle limit ${radiansToDegrees(vehicle.maxSteerAngle_rad).toFixed(2)}° — give positive amplitudes below the limit (steps go both ways)`,
        { details: { amplitude_rad: amplitude } },
      );
    }
  }
  const ruled = stepAmplitudes(params, limits, speed_mps);
  const amplitudes: StepAmplitudes =
    given === undefined
      ? ruled
      : {
          large_rad: Math.max(...given),
          small_rad: Math.min(...given),
          limitedBy: 'given',
          steadyLateralAcceleration_mps2: (ruled.steadyLateralAcceleration_mps2 / ruled.large_rad) * Math.max(...given),
        };
  const steps = planSteps(given ?? [amplitudes.large_rad, amplitudes.small_rad], vehicle.maxSteerRate_radps);
  const period_s = 1 / settings.sampleRate_hz;
  const count = Math.floor(planDuration_s(steps) / period_s + 1e-9) + 1;
  const time_s = Float64Array.from({ length: count }, (_, k) => k * period_s);
  const command = sampleCommand(steps, time_s);
  if (settings.commandResolution_rad > 0) {
    for (let k = 0; k < count; k += 1) command[k] = Math.round(command[k] / settings.commandResolution_rad) * settings.commandResolution_rad;
  }
  const simulated = simulateSingleTrack({ params, speed_mps, time_s, steerCommand_rad: command, ...limits });

  const random = makeRandom(fileSeed(settings.seed, speed_mps));
  const scale = settings.noiseScale;
  const yawRateBias_radps = scale * settings.yawRateBiasMax_radps * (2 * random.uniform() - 1);
  const speedNoise = scale * Math.max(settings.speedNoiseFloor_mps, settings.speedNoiseFraction * speed_mps);
  const lines: string[] = [TEST_LOG_COLUMNS.join(',')];
  const decimals = timeDecimals(period_s);
  for (let k = 0; k < count; k += 1) {
    const speed = speed_mps + speedNoise * random.normal();
    const angle = simulated.steerAngle_rad[k] + scale * settings.steerAngleNoise_rad * random.normal();
    const yawRate = simulated.yawRate_radps[k] + yawRateBias_radps + scale * settings.yawRateNoise_radps * random.normal();
    const lateral = simulated.lateralAcceleration_mps2[k] + scale * settings.lateralAccelerationNoise_mps2 * random.normal();
    lines.push(
      [
        fixed(time_s[k], decimals),
        fixed(speed, DECIMALS.speed_mps),
        fixed(command[k], DECIMALS.angle_rad),
        fixed(angle, DECIMALS.angle_rad),
        fixed(yawRate, DECIMALS.yawRate_radps),
        fixed(lateral, DECIMALS.lateralAcceleration_mps2),
      ].join(','),
    );
  }
  return {
    fileName: testLogFileName(speed_mps),
    speed_mps,
    csv: `${lines.join('\n')}\n`,
    steps,
    amplitudes,
    yawRateBias_radps,
    sampleCount: count,
  };
}

/** The README.md written beside the logs: what they are (invented), how they were made, what each file holds. */
export function testLogsReadme(vehicle: Vehicle, logs: readonly GeneratedTestLog[], options: TestLogOptions = {}): string {
  const settings = settingsOf(options);
  const deg = (angle_rad: number) => radiansToDegrees(angle_rad).toFixed(2);
  const speeds = logs.map((log) => log.speed_mps).join(',');
  const amplitudeOption =
    options.amplitudes_rad === undefined ? '' : ` --amplitudes-deg ${options.amplitudes_rad.map((a) => Number(radiansToDegrees(a).toPrecision(12))).join(',')}`;
  const resolutionOption =
    settings.commandResolution_rad > 0 ? ` --command-resolution-deg ${Number(radiansToDegrees(settings.commandResolution_rad).toPrecision(12))}` : '';
  const rows = logs.map(
    (log) =>
      `| ${log.fileName} | ${log.speed_mps} | ${deg(log.amplitudes.large_rad)} / ${deg(log.amplitudes.small_rad)} | ${LIMITED_BY_WORDS[log.amplitudes.limitedBy]} | ${log.amplitudes.steadyLateralAcceleration_mps2.toFixed(2)} | ${log.steps.length} | ${log.steps.map((s) => s.onset_s.toFixed(2)).join(' ')} |`,
  );
  return [
    `# Synthetic step-steer logs — ${vehicle.name}`,
    '',
    "**Invented demo data.** These logs were generated by speedband's simulator from the nominal single-track model",
    'in the vehicle file; no vehicle was driven. Use them to try the tool, never to tune a real vehicle.',
    '',
    `Regenerate byte-identically with: \`speedband make-test-logs --vehicle ${options.commandPaths?.vehicle ?? '<vehicle folder>'} --speeds ${speeds} --seed ${settings.seed} --sample-rate-hz ${settings.sampleRate_hz} --noise-scale ${settings.noiseScale}${amplitudeOption}${resolutionOption} --out ${options.commandPaths?.out ?? '<this folder>'}\``,
    '',
    `Columns (SI, ISO 8855 signs: positive steer and yaw rate to the left): ${TEST_LOG_COLUMNS.join(', ')}.`,
    `Sampled at ${settings.sampleRate_hz} Hz. Each file: ${STEP_PLAN_DEFAULTS.preHold_s} s at zero, then steps left and right at a large and a small`,
    `road-wheel amplitude, each a fast ramp (≥ ${STEP_PLAN_DEFAULTS.ramp_s} s), held ${STEP_PLAN_DEFAULTS.hold_s} s, ramped back to zero and held ${STEP_PLAN_DEFAULTS.returnHold_s} s.`,
    `Amplitude rule: the large amplitude gives ${STEP_PLAN_DEFAULTS.targetLateralAcceleration_mps2} m/s² steady lateral acceleration on the nominal model, unless half the`,
    'steer angle limit or the actuator rate limit is smaller; the small one is half of it.',
    `Noise (σ, × noise scale ${settings.noiseScale}): yaw rate ${settings.yawRateNoise_radps} rad/s plus a constant bias per file within ±${settings.yawRateBiasMax_radps} rad/s;`,
    `speed ${settings.speedNoiseFraction * 100} % of speed (at least ${settings.speedNoiseFloor_mps} m/s); steer angle ${settings.steerAngleNoise_rad} rad; lateral acceleration ${settings.lateralAccelerationNoise_mps2} m/s².`,
    settings.commandResolution_rad > 0 ? `The command is quantised to multiples of ${settings.commandResolution_rad} rad.` : 'The command is not quantised.',
    '',
    '| file | speed (m/s) | amplitudes (°) large / small | large limited by | steady lateral acceleration (m/s²) | steps | step onsets (s) |',
    '|---|---|---|---|---|---|---|',
    ...rows,
    '',
  ].join('\n');
}

export interface WrittenTestLogs {
  readonly logs: readonly GeneratedTestLog[];
  /** Every file written, with 'written' or 'unchanged'. */
  readonly files: readonly { readonly path: string; readonly outcome: WriteOutcome }[];
}

/** What writeTestLogs makes and where; `force` as for every writer (WriteOptions). */
export interface TestLogsInput extends WriteOptions {
  /** The vehicle whose nominal single-track model is simulated. */
  readonly vehicle: Vehicle;
  /** One log per speed, m/s: each above 0, listed once. */
  readonly speeds_mps: readonly number[];
  /** The folder the logs and their README.md go into (created when missing). */
  readonly outDir: string;
  /** How the logs are made (seed, sample rate, noise, amplitudes); default TEST_LOG_DEFAULTS and the per-speed amplitude rule. */
  readonly generation?: TestLogOptions;
}

/**
 * Generate one log per speed (m/s) and a README.md into `outDir`, atomically; an existing file with
 * different content is replaced only with `force`. Throws `testLogs.badSpeeds` for an empty list,
 * a non-positive or duplicated speed.
 */
export function writeTestLogs(input: TestLogsInput): WrittenTestLogs {
  const { vehicle, speeds_mps, outDir, generation: options = {}, force } = input;
  if (speeds_mps.length === 0) throw new SpeedbandError('testLogs.badSpeeds', 'no speeds given — list at least one test speed in m/s', {});
  const names = new Set<string>();
  for (const speed of speeds_mps) {
    if (!(Number.isFinite(speed) && speed > 0))
      throw new SpeedbandError('testLogs.badSpeeds', `speed ${speed} m/s is not above 0 — list positive test speeds in m/s`, { details: { speed } });
    const name = testLogFileName(speed);
    if (names.has(name))
      throw new SpeedbandError(
        'testLogs.badSpeeds',
        `speed ${speed} m/s gives the same file name (${name}) as another listed speed — list each speed once, at most two decimals apart`,
        { details: { speed } },
      );
    names.add(name);
  }
  const logs = speeds_mps.map((speed) => generateTestLog(vehicle, speed, options));
  const outputs = [
    ...logs.map((log) => ({ path: join(outDir, log.fileName), content: log.csv })),
    { path: join(outDir, 'README.md'), content: testLogsReadme(vehicle, logs, options) },
  ];
  // Refuse before writing anything when one file would need --force.
  if (!force)
    for (const output of outputs)
      if (existsSync(output.path) && readFileSync(output.path, 'utf8') !== output.content) writeFileAtomic(output.path, output.content, { force: false });
  const files = outputs.map((output) => ({ path: output.path, outcome: writeFileAtomic(output.path, output.content, { force }) }));
  return { logs, files };
}
