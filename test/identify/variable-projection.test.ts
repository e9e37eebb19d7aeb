import { describe, expect, it } from 'vitest';
import { makeRandom } from '../../src/core/random.js';
import { fitFopdt, FOPDT_FIT_DEFAULTS } from '../../src/identify/fit-fopdt.js';
import { fitStepModel } from '../../src/identify/fit-step-model.js';
import { simulateFopdt } from '../../src/identify/simulate-fopdt.js';
import { projectGainAndBias, projectOrthogonal } from '../../src/identify/variable-projection.js';
import { runPython } from '../helpers/python.js';
import { rampStepSignals } from './synthetic.js';

function randomVector(seed: number, n: number): Float64Array {
  const random = makeRandom(seed);
  return Float64Array.from({ length: n }, () => random.normal());
}

describe('projectGainAndBias(output, x, fixedBias)', () => {
  it('equals numpy.linalg.lstsq on the columns [x, 1], and on [x] for a fixed bias', () => {
    // Source: numpy.linalg.lstsq (reference least squares) on the same columns
    const x = randomVector(1, 300);
    const output = x.map((v, i) => 1.7 * v - 0.3 + 0.05 * Math.sin(i));
    const reference = runPython<{ free: number[]; freeSsr: number; fixed: number[]; fixedSsr: number }>(
      `import json, sys, numpy as np
d = json.load(sys.stdin); x = np.array(d['x']); y = np.array(d['y'])
A = np.column_stack([x, np.ones_like(x)]); c = np.linalg.lstsq(A, y, rcond=None)[0]
B = x[:, None]; f = np.linalg.lstsq(B, y - 0.1, rcond=None)[0]
print(json.dumps({'free': c.tolist(), 'freeSsr': float(np.sum((y - A @ c)**2)), 'fixed': f.tolist(), 'fixedSsr': float(np.sum((y - 0.1 - B @ f)**2))}))`,
      { x: Array.from(x), y: Array.from(output) },
    );
    const free = projectGainAndBias(output, x, null);
    expect(free.gain).toBeCloseTo(reference.free[0], 12);
    expect(free.bias).toBeCloseTo(reference.free[1], 12);
    expect(free.ssr / reference.freeSsr - 1).toBeLessThan(1e-10);
    const fixed = projectGainAndBias(output, x, 0.1);
    expect(fixed.gain).toBeCloseTo(reference.fixed[0], 12);
    expect(fixed.bias).toBe(0.1);
    expect(Math.abs(fixed.ssr / reference.fixedSsr - 1)).toBeLessThan(1e-10);
  });
});

describe('projectOrthogonal(v, x, terms)', () => {
  it('leaves a vector orthogonal to x and to the constant, and is idempotent (a projection)', () => {
    // Property of an orthogonal projection P⊥ = I − Φ(ΦᵀΦ)⁻¹Φᵀ
    for (const seed of [2, 3, 4]) {
      const x = randomVector(seed, 200);
      const v = projectOrthogonal(randomVector(seed + 10, 200), x, 'slopeAndOffset');
      let dotX = 0;
      let sum = 0;
      let norm = 0;
      for (let i = 0; i < v.length; i++) {
        dotX += v[i] * x[i];
        sum += v[i];
        norm += v[i] * v[i];
      }
      expect(Math.abs(dotX) / Math.sqrt(norm)).toBeLessThan(1e-9);
      expect(Math.abs(sum) / Math.sqrt(norm)).toBeLessThan(1e-9);
      const again = projectOrthogonal(v.slice(), x, 'slopeAndOffset');
      for (let i = 0; i < v.length; i++) expect(again[i]).toBeCloseTo(v[i], 12);
    }
  });
});

describe('fitStepModel with linearInGain (variable projection)', () => {
  it('reaches the same FOPDT optimum as the search over all four parameters (gain, τ, θ, bias) within 1e−6', () => {
    // Property of variable projection (Golub & Pereyra 1973): the projected problem has the same minimisers
    for (const seed of [21, 22, 23]) {
      const signals = rampStepSignals({ seed });
      const { time_s, input } = signals;
      const definition = {
        names: ['gain', 'timeConstant_s', 'deadTime_s'],
        simulate: (p: readonly number[]) => simulateFopdt({ time_s, input, gain: p[0], timeConstant_s: p[1], deadTime_s: p[2], hold: 'linear' }),
        starts: [[2, 0.3, 0.1]],
        maxRuns: 1,
        scale: [2, 0.3, 0.05],
        lower: [-Infinity, 0, 0],
        upper: [Infinity, 5, 2],
      };
      const full = fitStepModel(signals, definition, 'fitted');
      const projected = fitStepModel(signals, { ...definition, linearInGain: true }, 'fitted');
      expect(projected.stopReason).toBe('converged');
      expect(full.stopReason).toBe('converged');
      for (let i = 0; i < 4; i++) expect(Math.abs(projected.parameters[i] - full.parameters[i])).toBeLessThan(1e-6 * Math.max(1, Math.abs(full.parameters[i])));
      expect(Math.abs(projected.ssr / full.ssr - 1)).toBeLessThan(1e-8);
    }
  });

  it('refuses a model whose gain is bounded (the projection solves it without bounds)', () => {
    const signals = rampStepSignals({ seed: 5 });
    expect(() =>
      fitStepModel(
        signals,
        {
          names: ['gain', 'timeConstant_s', 'deadTime_s'],
          simulate: (p) => simulateFopdt({ time_s: signals.time_s, input: signals.input, gain: p[0], timeConstant_s: p[1], deadTime_s: p[2], hold: 'linear' }),
          starts: [[2, 0.3, 0.1]],
          maxRuns: 1,
          scale: [2, 0.3, 0.05],
          lower: [0, 0, 0],
          upper: [Infinity, 5, 2],
          linearInGain: true,
        },
        'fitted',
      ),
    ).toThrow(/gain unbounded/);
  });

  it('with the bias fixed to the pre-step mean, fitFopdt still recovers the generating parameters', () => {
    // Source: the generating parameters of the synthetic ramped step (test/identify/synthetic.ts)
    const fit = fitFopdt(rampStepSignals({ seed: 31, noise: 0.001 }), { ...FOPDT_FIT_DEFAULTS, hold: 'linear', biasMode: 'preStep' });
    expect(fit.fit.stopReason).toBe('converged');
    expect(Math.abs(fit.model.gain / 2.5 - 1)).toBeLessThan(0.02);
    expect(Math.abs(fit.model.timeConstant_s / 0.35 - 1)).toBeLessThan(0.1);
    expect(Math.abs(fit.model.deadTime_s - 0.12)).toBeLessThan(0.01);
  });
});
