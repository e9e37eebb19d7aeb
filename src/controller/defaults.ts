import type { ControllerSettings } from './types.js';

/**
 * Default controller settings, in one place: `tune`, `stability` and `build` (the plan) all take them
 * from here through `resolveControllerSettings`, so the same speed gives the same gains everywhere.
 * N = 10 is common practice for the derivative filter (from memory: Åström & Hägglund, Advanced PID
 * Control, 2006, give N of about 2–20); 100 Hz is a common steering-controller rate (common practice); backward Euler keeps the
 * derivative-filter pole in [0, 1) for any N (no ringing); one sample of computation latency (the
 * command computed from a sample goes out with the next one) is our choice, on the safe side.
 * `computationLatency_s` here is that one sample at the default sample time.
 */
export const CONTROLLER_DEFAULTS: ControllerSettings = {
  derivativeFilter: 10,
  sampleTime_s: 0.01,
  discretisation: 'backward-euler',
  computationLatency_s: 0.01,
};

/**
 * The controller settings from what the user gave: each given value as is; the sample time else the
 * vehicle file's `controllerSampleTime_s`, else `CONTROLLER_DEFAULTS.sampleTime_s`; the computation
 * latency else ONE SAMPLE of the sample time in use; filter and discretisation else the defaults.
 */
export function resolveControllerSettings(given: Partial<ControllerSettings>, vehicleSampleTime_s?: number): ControllerSettings {
  const sampleTime_s = given.sampleTime_s ?? vehicleSampleTime_s ?? CONTROLLER_DEFAULTS.sampleTime_s;
  return {
    derivativeFilter: given.derivativeFilter ?? CONTROLLER_DEFAULTS.derivativeFilter,
    sampleTime_s,
    discretisation: given.discretisation ?? CONTROLLER_DEFAULTS.discretisation,
    computationLatency_s: given.computationLatency_s ?? sampleTime_s,
  };
}

const shown = (value: number): string => String(Number(value.toPrecision(6)));

/**
 * The settings in words, as every output that shows gains prints them:
 * "backward-euler PID at 0.01 s (100 Hz), computation latency 0.01 s, derivative filter N = 10".
 */
export function describeControllerSettings(settings: ControllerSettings): string {
  const rate_hz = 1 / settings.sampleTime_s;
  const latency = settings.computationLatency_s === settings.sampleTime_s ? ' (one sample)' : '';
  return (
    `${settings.discretisation} PID at ${shown(settings.sampleTime_s)} s (${shown(rate_hz)} Hz), ` +
    `computation latency ${shown(settings.computationLatency_s)} s${latency}, derivative filter N = ${shown(settings.derivativeFilter)}`
  );
}
