import { describe, expect, it } from 'vitest';
import { makeRandom } from '../../src/core/random.js';
import { fitFopdt, FOPDT_FIT_DEFAULTS } from '../../src/identify/fit-fopdt.js';
import { chiSquare95, ljungBox, studentT975 } from '../../src/identify/statistics.js';
import { runPython } from '../helpers/python.js';
import { RAMP_STEP, rampStepSignals } from './synthetic.js';

describe('statistics against scipy.stats', () => {
  it('studentT975(ν) within 1e−3 of t.ppf(0.975, ν) and chiSquare95(k) within 0.5 % of chi2.ppf(0.95, k); Ljung–Box Q equals its definition', () => {
    const dofs = [3, 5, 10, 30, 100, 1000];
    const lags = [1, 5, 20];
    const random = makeRandom(9);
    const series = Float64Array.from({ length: 300 }, () => random.normal());
    for (let i = 1; i < series.length; i++) series[i] += 0.3 * series[i - 1]; // AR(1), not white
    // Source: scipy.stats.t.ppf, scipy.stats.chi2.ppf; Ljung & Box 1978 Q = n(n+2)Σρ_k²/(n−k) evaluated in numpy
    const reference = runPython<{ t: number[]; chi2: number[]; q: number }>(
      `
import json, sys
import numpy as np
from scipy import stats
d = json.load(sys.stdin)
x = np.array(d['x']); x = x - x.mean(); n = len(x); h = 20
rho = [np.sum(x[:-k] * x[k:]) / np.sum(x * x) for k in range(1, h + 1)]
q = n * (n + 2) * sum(r * r / (n - k) for k, r in zip(range(1, h + 1), rho))
print(json.dumps({'t': [stats.t.ppf(0.975, v) for v in d['dofs']], 'chi2': [stats.chi2.ppf(0.95, k) for k in d['lags']], 'q': q}))
`,
      { dofs, lags, x: Array.from(series) },
    );
    dofs.forEach((v, i) => expect(Math.abs(studentT975(v) - reference.t[i])).toBeLessThan(1e-3));
    lags.forEach((k, i) => expect(Math.abs(chiSquare95(k) / reference.chi2[i] - 1)).toBeLessThan(0.005));
    const test = ljungBox(series);
    expect(test.lags).toBe(20);
    expect(test.ljungBoxQ).toBeCloseTo(reference.q, 8);
    expect(test.white).toBe(false); // AR(1) with coefficient 0.3 over 300 samples is clearly not white
  });

  it('FOPDT standard errors agree with scipy.optimize.curve_fit covariance within 10 %', () => {
    const signals = rampStepSignals({ seed: 77 });
    const fit = fitFopdt(signals, { ...FOPDT_FIT_DEFAULTS, hold: 'linear' });
    // Source: scipy.optimize.curve_fit (pcov = σ²(JᵀJ)⁻¹) on the closed-form ramp-step model
    const reference = runPython<number[]>(
      `
import json, sys
import numpy as np
from scipy.optimize import curve_fit
d = json.load(sys.stdin)
t = np.array(d['t']); y = np.array(d['y']); A, Tr, t1 = d['A'], d['Tr'], d['t1']
def r(s, tau):
    s = np.maximum(s, 0.0)
    return s - tau * (1 - np.exp(-s / tau))
def model(t, K, tau, theta, b):
    tp = t - t1 - theta
    return b + K * A / Tr * (r(tp, tau) - r(tp - Tr, tau))
p, cov = curve_fit(model, t, y, p0=[2, 0.3, 0.1, 0])
print(json.dumps(list(np.sqrt(np.diag(cov)))))
`,
      {
        t: Array.from(signals.time_s),
        y: Array.from(signals.output),
        A: RAMP_STEP.amplitude,
        Tr: RAMP_STEP.ramp_s,
        t1: RAMP_STEP.preStepSamples * RAMP_STEP.samplePeriod_s,
      },
    );
    // Our errors are inflated by n/n_eff when residuals are autocorrelated; with white noise that factor is ≈ 1.
    for (let i = 0; i < 4; i++) expect(Math.abs(fit.fit.uncertainty.standardErrors[i] / reference[i] - 1)).toBeLessThan(0.1);
  });
});
