/** How much of a reference the steering actuator allows at one breakpoint (item of the time-domain figures). */
import { peakMagnitude } from './figures.js';
import type { PerformanceLoop } from './loop-at-speed.js';
import type { ActuatorRoom } from './types.js';

/**
 * The largest reference (scaled from a response to `size`) that keeps the commanded angle within
 * ±maxSteerAngle_rad and the steering rate the actuator is asked for within maxSteerRate_radps: with the
 * actuator's lag τ known, that rate is (c − δ)/τ of its first-order position loop, largest at the instants
 * the delayed command changes (δ = c + (δ₀ − c)·e^(−t/τ) in between, exact); otherwise the command's own rate
 * |u_k − u_(k−1)|/Ts.
 */
export function actuatorRoom(
  command: Float64Array,
  size: number,
  loop: PerformanceLoop,
  limits: { readonly maxSteerAngle_rad: number; readonly maxSteerRate_radps: number },
): ActuatorRoom {
  const peakAngle = peakMagnitude(command) / size;
  const peakRate = peakMagnitude(askedSteeringRate(command, loop)) / size;
  const byAngle = peakAngle > 0 ? limits.maxSteerAngle_rad / peakAngle : Number.POSITIVE_INFINITY;
  const byRate = peakRate > 0 ? limits.maxSteerRate_radps / peakRate : Number.POSITIVE_INFINITY;
  return {
    largestReference: Math.min(byAngle, byRate),
    limitedBy: byRate < byAngle ? 'rate' : 'angle',
    peakAnglePerUnit: peakAngle,
    peakRatePerUnit: peakRate,
  };
}

/** The steering rate the actuator is asked for at each sample of a command, rad/s (see actuatorRoom). */
export function askedSteeringRate(command: Float64Array, loop: PerformanceLoop): Float64Array {
  const ts = loop.controller.sampleTime_s;
  const rate = new Float64Array(command.length);
  if (loop.actuator !== null && loop.actuator.lag_s > 0) {
    const lag = loop.actuator.lag_s;
    const decay = Math.exp(-ts / lag);
    let angle = 0;
    for (let k = 0; k < command.length; k++) {
      rate[k] = (command[k] - angle) / lag;
      angle = command[k] + (angle - command[k]) * decay;
    }
  } else {
    for (let k = 0; k < command.length; k++) rate[k] = (command[k] - (k > 0 ? command[k - 1] : 0)) / ts;
  }
  return rate;
}
