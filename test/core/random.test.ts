import { describe, expect, it } from 'vitest';
import { makeRandom } from '../../src/core/random.js';
import { runPython } from '../helpers/python.js';

describe('makeRandom(seed)', () => {
  it('gives the same sequence for the same seed and a different one for another seed', () => {
    const a = makeRandom(42);
    const b = makeRandom(42);
    const c = makeRandom(43);
    const first = Array.from({ length: 5 }, () => a.uniform());
    expect(Array.from({ length: 5 }, () => b.uniform())).toEqual(first);
    expect(Array.from({ length: 5 }, () => c.uniform())).not.toEqual(first);
  });

  it('normal() has mean ≈ 0 and standard deviation ≈ 1, and passes a Kolmogorov–Smirnov test (scipy.stats.kstest)', () => {
    const random = makeRandom(7);
    const samples = Array.from({ length: 20_000 }, () => random.normal());
    const mean = samples.reduce((s, x) => s + x, 0) / samples.length;
    const variance = samples.reduce((s, x) => s + (x - mean) ** 2, 0) / (samples.length - 1);
    expect(Math.abs(mean)).toBeLessThan(0.03);
    expect(Math.abs(Math.sqrt(variance) - 1)).toBeLessThan(0.03);
    const { pvalue } = runPython<{ pvalue: number }>(
      'import sys, json\nfrom scipy import stats\nx = json.load(sys.stdin)\nprint(json.dumps({"pvalue": float(stats.kstest(x, "norm").pvalue)}))',
      samples,
    );
    expect(pvalue).toBeGreaterThan(0.001);
  });
});
