import { describe, expect, it } from 'vitest';
import { makeRandom } from '../../src/core/random.js';
import { fopdtSensitivities, simulateFopdt, type CommandHold } from '../../src/identify/simulate-fopdt.js';
import { newHoldUpdateCache, simulateThirdOrderHeld } from '../../src/identify/simulate-third-order.js';

// Exact derivatives used as Levenberg–Marquardt Jacobians, checked against central differences of
// the simulations they differentiate (the definition of a derivative; step 1e−6 relative).

const n = 240;
const time_s = Float64Array.from({ length: n }, (_, i) => i * 0.01);

function randomCommand(seed: number): Float64Array {
  const random = makeRandom(seed);
  let level = 0;
  return Float64Array.from({ length: n }, (_, i) => {
    if (i % 37 === 5) level = 0.05 * random.normal();
    return level + 0.002 * random.normal();
  });
}

function worstDifference(a: Float64Array, b: Float64Array): { worst: number; size: number } {
  let worst = 0;
  let size = 0;
  for (let i = 0; i < a.length; i++) {
    worst = Math.max(worst, Math.abs(a[i] - b[i]));
    size = Math.max(size, Math.abs(b[i]));
  }
  return { worst, size };
}

function centralDifference(simulate: (value: number) => Float64Array, value: number, step: number): Float64Array {
  const up = simulate(value + step);
  const down = simulate(value - step);
  return up.map((v, i) => (v - down[i]) / (2 * step));
}

describe('fopdtSensitivities({ time_s, input, gain, timeConstant_s, deadTime_s, hold, … })', () => {
  for (const hold of ['zeroOrder', 'linear'] as const satisfies readonly CommandHold[]) {
    it(`match central differences of simulateFopdt in K, τ and θ (command ${hold === 'zeroOrder' ? 'held' : 'interpolated'}, θ between samples)`, () => {
      for (const [seed, gain, tau, theta] of [
        [1, 2.5, 0.35, 0.1234],
        [2, -1.2, 0.08, 0.0571],
        [3, 0.7, 1.4, 0.2999],
      ] as const) {
        const input = randomCommand(seed);
        const out = { gain: new Float64Array(n), timeConstant: new Float64Array(n), deadTime: new Float64Array(n) };
        fopdtSensitivities({
          time_s,
          input,
          gain,
          timeConstant_s: tau,
          deadTime_s: theta,
          hold,
          out,
          states: new Float64Array(n),
          stateSensitivities: new Float64Array(n),
        });
        const checks = [
          [out.gain, centralDifference((k) => simulateFopdt({ time_s, input, gain: k, timeConstant_s: tau, deadTime_s: theta, hold }), gain, 1e-6)],
          [out.timeConstant, centralDifference((t) => simulateFopdt({ time_s, input, gain, timeConstant_s: t, deadTime_s: theta, hold }), tau, 1e-6 * tau)],
          [out.deadTime, centralDifference((d) => simulateFopdt({ time_s, input, gain, timeConstant_s: tau, deadTime_s: d, hold }), theta, 1e-7)],
        ] as const;
        for (const [exact, numeric] of checks) {
          const { worst, size } = worstDifference(exact, numeric);
          expect(worst).toBeLessThan(1e-6 * Math.max(size, 1e-3));
        }
      }
    });
  }

  it('at zero dead time (its lower bound) with the command held, ∂y/∂θ is the one-sided derivative for a growing dead time', () => {
    // With the command held, ẋ jumps at every sample, so y(θ) has a kink at θ = 0: only the side a fit can move to counts.
    const input = randomCommand(4);
    const out = { gain: new Float64Array(n), timeConstant: new Float64Array(n), deadTime: new Float64Array(n) };
    fopdtSensitivities({
      time_s,
      input,
      gain: 1.5,
      timeConstant_s: 0.2,
      deadTime_s: 0,
      hold: 'zeroOrder',
      out,
      states: new Float64Array(n),
      stateSensitivities: new Float64Array(n),
    });
    const base = simulateFopdt({ time_s, input, gain: 1.5, timeConstant_s: 0.2, deadTime_s: 0, hold: 'zeroOrder' });
    const h = 1e-8;
    const grown = simulateFopdt({ time_s, input, gain: 1.5, timeConstant_s: 0.2, deadTime_s: h, hold: 'zeroOrder' });
    const forward = grown.map((v, i) => (v - base[i]) / h);
    const { worst, size } = worstDifference(out.deadTime, forward);
    expect(worst).toBeLessThan(1e-5 * size);
  });
});

describe('simulateThirdOrderHeld with a delay derivative and a shared update cache', () => {
  const numerator = [0, 40, 260] as const;
  const denominator = [1, 25, 180, 900] as const;

  it('∂y/∂θ matches central differences of the simulation', () => {
    const input = randomCommand(5);
    const derivative = new Float64Array(n);
    simulateThirdOrderHeld({ time_s, input, numerator, denominator, delay_s: 0.0437, cache: newHoldUpdateCache(), delayDerivative: derivative });
    const numeric = centralDifference((d) => simulateThirdOrderHeld({ time_s, input, numerator, denominator, delay_s: d }), 0.0437, 1e-7);
    const { worst, size } = worstDifference(derivative, numeric);
    expect(worst).toBeLessThan(1e-6 * size);
  });

  it('gives bit-identical output whether a cache is shared across models and delays or fresh for each call', () => {
    const cache = newHoldUpdateCache();
    for (let k = 0; k < 12; k++) {
      const input = randomCommand(10 + k);
      const den = [1, 25 + (k % 3), 180, 900 + 50 * (k % 2)] as const;
      const delay = 0.03 + 0.0071 * (k % 4);
      const shared = simulateThirdOrderHeld({ time_s, input, numerator, denominator: den, delay_s: delay, cache });
      const fresh = simulateThirdOrderHeld({ time_s, input, numerator, denominator: den, delay_s: delay });
      expect(Array.from(shared)).toEqual(Array.from(fresh));
    }
  });
});
