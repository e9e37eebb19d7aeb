import { describe, expect, it } from 'vitest';
import { makeRandom } from '../../src/core/random.js';
import { fitFopdt, FOPDT_FIT_DEFAULTS } from '../../src/identify/fit-fopdt.js';

const LINEAR = { ...FOPDT_FIT_DEFAULTS, hold: 'linear' } as const;
import { fitSecondOrder } from '../../src/identify/fit-second-order.js';
import { simulateSecondOrder } from '../../src/identify/simulate-second-order.js';
import type { StepSignals } from '../../src/identify/step-signals.js';
import { runPython } from '../helpers/python.js';
import { rampStepSignals } from './synthetic.js';

const h = 0.01;
const n = 800;
const time_s = Float64Array.from({ length: n }, (_, i) => i * h);
const input = time_s.map((t) => 0.03 * Math.min(1, Math.max(0, (t - 1) / 0.15)));
// A yaw-like response with a zero: K = 3, ωn = 6 rad/s, ζ = 0.55, β = 0.12 s, θ = 0.05 s (five samples)
const TRUE = { gain: 3, naturalFrequency_radps: 6, dampingRatio: 0.55, zeroTimeConstant_s: 0.12, deadTime_s: 0.05 };

describe('simulateSecondOrder({ time_s, input, gain, naturalFrequency_radps, dampingRatio, zeroTimeConstant_s, deadTime_s, hold })', () => {
  it('matches scipy.signal.lsim with linear interpolation of the input (whole-sample delay) to 1e−9', () => {
    const cases = [TRUE, { ...TRUE, dampingRatio: 1.4, zeroTimeConstant_s: 0 }, { ...TRUE, dampingRatio: 1, deadTime_s: 0 }];
    // Source: scipy.signal.lsim(interp=True) — exact for a linearly interpolated input
    const reference = runPython<number[][]>(
      `
import json, sys
import numpy as np
from scipy import signal
data = json.load(sys.stdin)
t = np.array(data['t']); u = np.array(data['u'])
out = []
for c in data['cases']:
    w = c['naturalFrequency_radps']; z = c['dampingRatio']; b = c['zeroTimeConstant_s']; K = c['gain']
    d = int(round(c['deadTime_s'] / data['h']))
    ud = np.concatenate([np.full(d, u[0]), u[:len(u) - d]])
    _, y, _ = signal.lsim(signal.lti([K * w * w * b, K * w * w], [1, 2 * z * w, w * w]), ud, t, interp=True)
    out.append(list(y))
print(json.dumps(out))
`,
      { t: Array.from(time_s), u: Array.from(input), h, cases },
    );
    cases.forEach((c, i) => {
      const y = simulateSecondOrder({ time_s, input, ...c, hold: 'linear' });
      let worst = 0;
      for (let k = 0; k < n; k++) worst = Math.max(worst, Math.abs(y[k] - reference[i][k]));
      expect(worst).toBeLessThan(1e-9);
    });
  });
});

describe('fitSecondOrder(signals, { seed, withZero, biasMode, hold })', () => {
  it('recovers a second-order-with-zero step and beats the FOPDT by BIC; on FOPDT data the FOPDT keeps the lower BIC', () => {
    const random = makeRandom(7);
    const clean = simulateSecondOrder({ time_s, input, ...TRUE, hold: 'linear' });
    const signals: StepSignals = { time_s, input, output: clean.map((v) => v + 0.003 * random.normal()), preStepSamples: 100 };
    const fopdt = fitFopdt(signals, LINEAR);
    const withZero = fitSecondOrder(signals, { seed: fopdt.model, withZero: true, biasMode: 'fitted', hold: 'linear' });
    expect(withZero.fit.stopReason).toBe('converged');
    // Source: the generating parameters
    expect(Math.abs(withZero.model.gain / TRUE.gain - 1)).toBeLessThan(0.02);
    expect(Math.abs(withZero.model.naturalFrequency_radps / TRUE.naturalFrequency_radps - 1)).toBeLessThan(0.05);
    expect(Math.abs(withZero.model.dampingRatio - TRUE.dampingRatio)).toBeLessThan(0.05);
    expect(withZero.fit.quality.bic).toBeLessThan(fopdt.fit.quality.bic);

    const fopdtData = rampStepSignals({ seed: 3 });
    const fopdtOnFopdt = fitFopdt(fopdtData, LINEAR);
    const secondOnFopdt = fitSecondOrder(fopdtData, { seed: fopdtOnFopdt.model, withZero: true, biasMode: 'fitted', hold: 'linear' });
    expect(fopdtOnFopdt.fit.quality.bic).toBeLessThan(secondOnFopdt.fit.quality.bic);
  });
});
