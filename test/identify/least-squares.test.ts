import { levenbergMarquardt } from 'ml-levenberg-marquardt';
import { describe, expect, it } from 'vitest';
import { makeRandom } from '../../src/core/random.js';
import { fitLeastSquares, LEAST_SQUARES_DEFAULTS, type LeastSquaresProblem } from '../../src/identify/least-squares.js';
import { simulateFopdt } from '../../src/identify/simulate-fopdt.js';

// Behaviours of ml-levenberg-marquardt 5.1.0 read in node_modules/ml-levenberg-marquardt/src;
// each test shows the library behaviour, then that fitLeastSquares handles it.

const x = Float64Array.from({ length: 200 }, (_, i) => i * 0.0005); // 0 … 0.1
const index = Array.from(x, (_, i) => i);
const decay = (tau: number): Float64Array => x.map((t) => Math.exp(-t / tau));

function noisyDecay(tau: number, noise: number, seed: number): Float64Array {
  const random = makeRandom(seed);
  return decay(tau).map((v) => v + noise * random.normal());
}

function decayProblem(data: Float64Array, initial: number): LeastSquaresProblem {
  return {
    data,
    model: (p) => decay(p[0]),
    initial: [initial],
    scale: [Math.abs(initial)],
    lower: [1e-4],
    upper: [10],
    residualScale: 1,
  };
}

describe('fitLeastSquares and the ml-levenberg-marquardt behaviours it handles', () => {
  it('library: with noisy data the absolute errorTolerance is never reached, so it always runs to maxIterations and gives no stop reason; the adapter stops on relative change', () => {
    const data = noisyDecay(0.02, 0.01, 3);
    const library = levenbergMarquardt({ x: index, y: Array.from(data) }, (p) => (i) => Math.exp(-x[i] / p[0]), {
      initialValues: [0.03],
      gradientDifference: [1e-6],
    });
    expect(library.iterations).toBe(100); // the code's default cap; no field says "capped"
    expect(Object.keys(library).sort()).toEqual(['iterations', 'parameterError', 'parameterValues']);
    const adapter = fitLeastSquares(decayProblem(data, 0.03));
    expect(adapter.stopReason).toBe('converged');
    expect(adapter.iterations).toBeLessThan(40);
    expect(adapter.parameters[0]).toBeCloseTo(library.parameterValues[0], 6);
  });

  it('library: the default finite-difference step is an absolute 0.1, ten times a parameter of size 0.01; the adapter scales the step to the parameter', () => {
    const data = decay(0.01); // exact data, time constant 0.01 s
    const probes: number[] = [];
    const library = levenbergMarquardt(
      { x: index, y: Array.from(data) },
      (p) => {
        probes.push(p[0]);
        return (i) => Math.exp(-x[i] / Math.abs(p[0]));
      },
      {
        initialValues: [0.02],
        maxIterations: 50,
      },
    );
    expect(probes[2]).toBeCloseTo(0.12, 12); // first derivative probe: 0.02 + 0.1
    // on exact data the secant Jacobian still leaves an error 1e4 times the adapter's
    expect(Math.abs(library.parameterValues[0] - 0.01)).toBeGreaterThan(1e-7);
    const adapter = fitLeastSquares(decayProblem(data, 0.02));
    expect(adapter.stopReason).toBe('converged');
    expect(Math.abs(adapter.parameters[0] - 0.01)).toBeLessThan(1e-10); // Source: the generating value
  });

  it('library: a gradientDifference array of the wrong length is silently filled with its first element', () => {
    const probes: number[][] = [];
    levenbergMarquardt(
      { x: [0, 1, 2], y: [1, 3, 5] },
      (p) => {
        probes.push(p.slice());
        return (t) => p[0] + p[1] * t;
      },
      { initialValues: [0, 0], gradientDifference: [0.5], maxIterations: 1, damping: 1e-2 },
    );
    // calls: initial error, step evaluation, probe of parameter 0, probe of parameter 1 —
    // parameter 1 moved by 0.5, the first element, not a step of its own
    expect(probes[2]).toEqual([0.5, 0]);
    expect(probes[3]).toEqual([0, 0.5]);
  });

  it('library: a zero finite-difference step meant to hold the first parameter moves it instead of the second; the adapter never passes a zero step', () => {
    // y = a + b·t with a "held" at 1 by a zero step: the Jacobian row of b lands in a's slot.
    const t = [0, 1, 2, 3];
    const y = t.map((v) => 1 + 2 * v);
    const library = levenbergMarquardt({ x: t, y }, (p) => (v) => p[0] + p[1] * v, {
      initialValues: [1, 0],
      gradientDifference: [0, 1e-6],
      maxIterations: 20,
      damping: 1e-2,
    });
    expect(library.parameterValues[0]).not.toBeCloseTo(1, 3); // the "held" parameter moved
    expect(library.parameterValues[1]).toBe(0); // and the free one never did
    // The adapter: hold a parameter by reparametrising (the model takes only b), and a zero start still gets a step.
    const adapter = fitLeastSquares({
      data: Float64Array.from(y),
      model: (p) => Float64Array.from(t, (v) => 1 + p[0] * v),
      initial: [0],
      scale: [1],
      lower: [-Infinity],
      upper: [Infinity],
      residualScale: 1,
    });
    expect(adapter.parameters[0]).toBeCloseTo(2, 9);
  });

  it('library: a NaN residual ends the loop early and returns the best point as if nothing happened; the adapter reports nonFinite', () => {
    const t = Array.from({ length: 20 }, (_, i) => i / 10);
    const y = t.map((v) => 2 * v);
    const model = (k: number) => (v: number) => (k > 1.5 ? Number.NaN : k * v);
    const library = levenbergMarquardt({ x: t, y }, (p) => model(p[0]), {
      initialValues: [1],
      gradientDifference: [1e-6],
      maxIterations: 100,
      damping: 1e-3,
    });
    expect(library.iterations).toBeLessThan(100);
    expect(Number.isFinite(library.parameterValues[0])).toBe(true);
    const adapter = fitLeastSquares({
      data: Float64Array.from(y),
      model: (p) => Float64Array.from(t, model(p[0])),
      initial: [1],
      scale: [1],
      lower: [-Infinity],
      upper: [Infinity],
      residualScale: 1,
    });
    expect(adapter.stopReason).toBe('nonFinite');
  });

  it('library: hitting the iteration cap looks like any other result; the adapter reports iterationCap', () => {
    const data = noisyDecay(0.02, 0.01, 4);
    const adapter = fitLeastSquares(decayProblem(data, 1), { ...LEAST_SQUARES_DEFAULTS, maxIterations: 2, chunkIterations: 2 });
    expect(adapter.stopReason).toBe('iterationCap');
    expect(adapter.iterations).toBe(2);
  });

  it('library: bounds are clamped after each step but derivative probes evaluate the model outside them; the FOPDT model stays finite there', () => {
    const probed: number[] = [];
    const t = [0, 1, 2, 3];
    const clamped = levenbergMarquardt(
      { x: t, y: t.map((v) => -v) },
      (p) => {
        probed.push(p[0]);
        return (v) => p[0] * v;
      },
      { initialValues: [0.5], minValues: [0], maxValues: [1], gradientDifference: [0.01], centralDifference: true, maxIterations: 5, damping: 1e-2 },
    );
    expect(clamped.parameterValues[0]).toBe(0); // the step towards −1 is clamped to the bound
    expect(Math.min(...probed)).toBeLessThan(0); // the optimum −1 is clamped to 0, and the probe at 0 − 0.01 is outside
    const time_s = Float64Array.from({ length: 50 }, (_, i) => i * 0.01);
    const input = time_s.map((v) => (v > 0.1 ? 1 : 0));
    for (const [tau, theta] of [
      [0, 0.05],
      [-0.01, 0.05],
      [0.1, -0.02],
      [-1e-7, -1e-7],
    ]) {
      expect(simulateFopdt({ time_s, input, gain: 1, timeConstant_s: tau, deadTime_s: theta, hold: 'zeroOrder' }).every(Number.isFinite)).toBe(true);
    }
  });

  it('library: weights enter the error as r²·w² but the step as r²/w², so the adapter passes weights 1 and scales residuals itself', () => {
    const t = [0, 1, 2];
    const y = [1, 1, 1];
    const run = (weights: number) => levenbergMarquardt({ x: t, y }, (p) => () => p[0], { initialValues: [0], weights, maxIterations: 0 }).parameterError;
    expect(run(1)).toBeCloseTo(3, 12); // Σ r² with r = 1
    expect(run(2)).toBeCloseTo(12, 12); // r²·w², not r²/w² = 0.75
  });
});

describe('fitLeastSquares with an exact Jacobian', () => {
  it('reaches the finite-difference optimum of the same problem', () => {
    // Property: the Jacobian changes the path, not the minimiser
    const data = noisyDecay(0.02, 0.01, 7);
    const jacobian = (p: readonly number[]): Float64Array[] => [x.map((t) => (t / (p[0] * p[0])) * Math.exp(-t / p[0]))];
    const numeric = fitLeastSquares(decayProblem(data, 0.03));
    const exact = fitLeastSquares({ ...decayProblem(data, 0.03), jacobian });
    expect(exact.stopReason).toBe('converged');
    expect(exact.parameters[0]).toBeCloseTo(numeric.parameters[0], 7);
  });

  it('reports nonFinite when the Jacobian is not finite, never converged', () => {
    const data = noisyDecay(0.02, 0.01, 8);
    const jacobian = (): Float64Array[] => [x.map(() => Number.NaN)];
    expect(fitLeastSquares({ ...decayProblem(data, 0.03), jacobian }).stopReason).toBe('nonFinite');
  });
});
