import { makeRandom } from '../../src/core/random.js';

/** One random sampled loop: plant num/den (highest power first) with delay θ, a discrete PID at Ts. */
export interface SampledCase {
  readonly num: number[];
  readonly den: number[];
  readonly theta: number;
  readonly Ts: number;
  readonly kp: number;
  readonly ki: number;
  readonly kd: number;
  readonly N: number;
  readonly method: 'tustin' | 'backward-euler';
}

/**
 * Seeded random sampled loops over six plant kinds (cycled): first order, overdamped second order,
 * integrating, resonant, open-loop unstable (a pole at +1/τ), and a path-like double integrator with a
 * preview lead (τs + 1)/(s²(0.1τs + 1)). Ts log-uniform in 5–100 ms, θ ≤ 0.25 s and ≤ 20 samples;
 * kp·gain log-uniform in [0.1, maxLoopGain], Ti = kp/ki log-uniform in `integralTimeRange_s`.
 */
export function randomSampledLoops(seed: number, count: number, maxLoopGain: number, integralTimeRange_s: readonly [number, number]): SampledCase[] {
  const random = makeRandom(seed);
  const between = (low: number, high: number): number => low + (high - low) * random.uniform();
  const logBetween = (low: number, high: number): number => Math.exp(between(Math.log(low), Math.log(high)));
  const cases: SampledCase[] = [];
  for (let i = 0; i < count; i++) {
    const gain = logBetween(0.3, 4);
    const tau = logBetween(0.1, 2);
    const kind = i % 6;
    const den =
      kind === 0 ? [tau, 1]
      : kind === 1 ? [0.3 * tau * tau, 1.3 * tau, 1]
      : kind === 2 ? [tau, 1, 0]
      : kind === 3 ? [1 / (tau * tau), (2 * between(0.2, 0.7)) / tau, 1]
      : kind === 4 ? [tau, -1]
      : [0.1 * tau, 1, 0, 0];
    const Ts = logBetween(0.005, 0.1);
    const theta = Math.min(between(0, 0.25), 20 * Ts);
    const kp = logBetween(0.1, maxLoopGain) / gain;
    const ki = kp / logBetween(integralTimeRange_s[0], integralTimeRange_s[1]);
    const kd = random.uniform() < 0.25 ? 0 : kp * logBetween(0.005, 0.3);
    const N = [5, 10, 20][Math.floor(random.uniform() * 3)];
    cases.push({ num: kind === 5 ? [gain * tau, gain] : [gain], den, theta, Ts, kp, ki, kd, N, method: i % 2 === 0 ? 'tustin' : 'backward-euler' });
  }
  return cases;
}
