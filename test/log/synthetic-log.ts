/**
 * Synthetic step-test logs for tests: the command is a sequence of held levels
 * joined by linear ramps; the yaw rate is the exact (closed-form) response of a
 * first-order-plus-dead-time plant K·e^(−θs)/(τs + 1) to that command, by
 * superposition of ramp responses. Noise is seeded (src/core/random.ts).
 */
import { makeRandom } from '../../src/core/random.js';

export interface FopdtPlant {
  readonly gain_perS: number;
  readonly timeConstant_s: number;
  readonly deadTime_s: number;
}

/**
 * Response at time u after the start of a unit ramp-step (0 → 1 linearly over ramp_s)
 * of 1/(τs + 1): u ≤ 0: 0; 0 < u ≤ Tr: (u − τ(1 − e^(−u/τ)))/Tr;
 * u > Tr: 1 − (τ/Tr)(e^(−(u−Tr)/τ) − e^(−u/τ)). Textbook first-order ramp response.
 */
export function firstOrderRampStep(u: number, timeConstant_s: number, ramp_s: number): number {
  if (u <= 0) return 0;
  const tau = timeConstant_s;
  if (ramp_s <= 0) return 1 - Math.exp(-u / tau);
  if (u <= ramp_s) return (u - tau * (1 - Math.exp(-u / tau))) / ramp_s;
  return 1 - (tau / ramp_s) * (Math.exp(-(u - ramp_s) / tau) - Math.exp(-u / tau));
}

export interface Stage {
  /** Command level held in this stage, rad. */
  readonly level_rad: number;
  /** Time held at the level, s (after the ramp into it). */
  readonly hold_s: number;
  /** Ramp into the level, s (default 0.15). */
  readonly ramp_s?: number;
  /** Speed during the stage, m/s (default 10). */
  readonly speed_mps?: number;
}

export interface SyntheticLogOptions {
  readonly plant: FopdtPlant;
  readonly stages: readonly Stage[];
  readonly sampleRate_Hz?: number;
  readonly yawNoise_radps?: number;
  readonly speedNoise_mps?: number;
  /** Noise on the logged command (e.g. a command read back from a bus), rad. */
  readonly commandNoise_rad?: number;
  readonly seed?: number;
  /** Speed changes linearly to this over stage `speedRamp.stage`. */
  readonly speedRamp?: { readonly stage: number; readonly to_mps: number };
}

export interface SyntheticLog {
  readonly time_s: Float64Array;
  readonly speed_mps: Float64Array;
  readonly steerCommand_rad: Float64Array;
  readonly yawRate_radps: Float64Array;
  /** Start time of each ramp (one per stage after the first), s. */
  readonly onsets_s: readonly number[];
}

/** Build the samples of a synthetic log. The first stage is the initial level (no ramp). */
export function syntheticLog(options: SyntheticLogOptions): SyntheticLog {
  const rate = options.sampleRate_Hz ?? 100;
  const random = makeRandom(options.seed ?? 1);
  const ramps: { start_s: number; ramp_s: number; change_rad: number }[] = [];
  const boundaries: number[] = [0];
  let clock = options.stages[0].hold_s;
  boundaries.push(clock);
  for (let k = 1; k < options.stages.length; k += 1) {
    const stage = options.stages[k];
    const ramp_s = stage.ramp_s ?? 0.15;
    ramps.push({ start_s: clock, ramp_s, change_rad: stage.level_rad - options.stages[k - 1].level_rad });
    clock += ramp_s + stage.hold_s;
    boundaries.push(clock);
  }
  const n = Math.floor(clock * rate) + 1;
  const time_s = new Float64Array(n);
  const speed_mps = new Float64Array(n);
  const steerCommand_rad = new Float64Array(n);
  const yawRate_radps = new Float64Array(n);
  const { gain_perS, timeConstant_s, deadTime_s } = options.plant;
  for (let i = 0; i < n; i += 1) {
    const t = i / rate;
    time_s[i] = t;
    let command = options.stages[0].level_rad;
    let yaw = gain_perS * command;
    for (const ramp of ramps) {
      const into = t - ramp.start_s;
      command += ramp.change_rad * (into <= 0 ? 0 : ramp.ramp_s <= 0 ? 1 : Math.min(1, into / ramp.ramp_s));
      yaw += gain_perS * ramp.change_rad * firstOrderRampStep(into - deadTime_s, timeConstant_s, ramp.ramp_s);
    }
    let stage = 0;
    while (stage + 1 < options.stages.length && t >= boundaries[stage + 1]) stage += 1;
    let speed = options.stages[stage].speed_mps ?? 10;
    if (options.speedRamp !== undefined && stage === options.speedRamp.stage) {
      const fraction = (t - boundaries[stage]) / (boundaries[stage + 1] - boundaries[stage]);
      speed += fraction * (options.speedRamp.to_mps - speed);
    }
    steerCommand_rad[i] = command + (options.commandNoise_rad ?? 0) * random.normal();
    yawRate_radps[i] = yaw + (options.yawNoise_radps ?? 0) * random.normal();
    speed_mps[i] = speed + (options.speedNoise_mps ?? 0) * random.normal();
  }
  return { time_s, speed_mps, steerCommand_rad, yawRate_radps, onsets_s: ramps.map((ramp) => ramp.start_s) };
}

/** The log as CSV text in the default column format. */
export function syntheticCsv(log: SyntheticLog): string {
  const lines = ['time_s,speed_mps,steer_cmd_rad,yaw_rate_radps'];
  for (let i = 0; i < log.time_s.length; i += 1) {
    lines.push(`${log.time_s[i].toFixed(4)},${log.speed_mps[i].toFixed(4)},${log.steerCommand_rad[i].toFixed(7)},${log.yawRate_radps[i].toFixed(7)}`);
  }
  return `${lines.join('\n')}\n`;
}
