import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { runPython } from '../helpers/python.js';
import { dampingTarget } from '../../src/tuning/damping-target.js';
import { TUNING_DEFAULTS } from '../../src/tuning/defaults.js';

describe('dampingTarget (pole placement on k′′/s²)', () => {
  it('property: the delay-free closed-loop poles are −ζωn ± ωn√(ζ²−1) and −ωn/ratio (numpy.roots on s³ + k′′Kd s² + k′′Kp s + k′′Ki)', () => {
    const cases = fc.sample(
      fc.record({
        gain: fc.oneof(fc.double({ min: 0.05, max: 50, noNaN: true }), fc.double({ min: -50, max: -0.05, noNaN: true })),
        zeta: fc.double({ min: 0.3, max: 2, noNaN: true }),
        omega: fc.double({ min: 0.1, max: 10, noNaN: true }),
        ratio: fc.double({ min: 2, max: 20, noNaN: true }),
      }),
      { numRuns: 200, seed: 42 },
    );
    const gains = cases.map(
      (c) =>
        dampingTarget(
          { integrators: 2, gain: c.gain, lags_s: [], deadTime_s: 0.05 },
          { dampingRatio: c.zeta, naturalFrequency_radps: c.omega, integralPoleRatio: c.ratio },
          { speed_mps: 5 },
        ).gains,
    );
    // Source: numpy.roots (reference library) of the closed-loop characteristic polynomial.
    const roots = runPython<{ re: number[]; im: number[] }[]>(
      `
import json, sys, numpy as np
out = []
for c in json.load(sys.stdin):
    r = np.sort_complex(np.roots([1, c['gain']*c['kd'], c['gain']*c['kp'], c['gain']*c['ki']]))
    out.append({'re': r.real.tolist(), 'im': r.imag.tolist()})
print(json.dumps(out))
`,
      cases.map((c, i) => ({ gain: c.gain, ...gains[i] })),
    );
    cases.forEach((c, i) => {
      const { zeta, omega, ratio } = c;
      const wanted: { re: number; im: number }[] = [{ re: -omega / ratio, im: 0 }];
      if (zeta >= 1) {
        const spread = omega * Math.sqrt(zeta * zeta - 1);
        wanted.push({ re: -zeta * omega - spread, im: 0 }, { re: -zeta * omega + spread, im: 0 });
      } else {
        const imaginary = omega * Math.sqrt(1 - zeta * zeta);
        wanted.push({ re: -zeta * omega, im: -imaginary }, { re: -zeta * omega, im: imaginary });
      }
      const found = roots[i].re.map((re, k) => ({ re, im: roots[i].im[k] }));
      // Matched as a set; near-double roots (ζ ≈ 1) are ill-conditioned (error ~ √eps·ωn), hence the looser tolerance there.
      const tolerance = (Math.abs(zeta - 1) < 0.05 ? 1e-4 : 1e-7) * omega;
      for (const w of wanted) {
        const distance = Math.min(...found.map((f) => Math.hypot(f.re - w.re, f.im - w.im)));
        expect(distance).toBeLessThan(tolerance);
      }
    });
  });

  it('property: with a lead k″(T0 s + 1)/s² the delay-free closed-loop poles are still the requested ones (numpy.roots on the full characteristic polynomial)', () => {
    const cases = fc
      .sample(
        fc.record({
          gain: fc.double({ min: 0.05, max: 50, noNaN: true }),
          zeta: fc.double({ min: 0.4, max: 1.8, noNaN: true }),
          omega: fc.double({ min: 0.1, max: 5, noNaN: true }),
          ratio: fc.double({ min: 3, max: 10, noNaN: true }),
          leadTimesOmega: fc.double({ min: 0.001, max: 0.3, noNaN: true }),
        }),
        { numRuns: 150, seed: 7 },
      )
      .map((c) => ({ ...c, lead: c.leadTimesOmega / c.omega }))
      .filter((c) => Math.abs(c.zeta - 1) > 0.05);
    const designed = cases.map((c) => {
      try {
        return dampingTarget(
          { integrators: 2, gain: c.gain, lags_s: [], deadTime_s: 0.01, leadTimeConstant_s: c.lead },
          { dampingRatio: c.zeta, naturalFrequency_radps: c.omega, integralPoleRatio: c.ratio },
          { speed_mps: 5 },
        ).gains;
      } catch {
        return null;
      }
    });
    const placed = cases.filter((_, i) => designed[i] !== null);
    expect(placed.length).toBeGreaterThan(100);
    // Source: numpy.roots of (1 + k″kd T0)s³ + k″(kd + kp T0)s² + k″(kp + ki T0)s + k″ki (loop algebra written out here).
    const roots = runPython<{ re: number[]; im: number[] }[]>(
      `
import json, sys, numpy as np
out = []
for c in json.load(sys.stdin):
    k, T = c['gain'], c['lead']
    r = np.roots([1 + k*c['kd']*T, k*(c['kd'] + c['kp']*T), k*(c['kp'] + c['ki']*T), k*c['ki']])
    out.append({'re': r.real.tolist(), 'im': r.imag.tolist()})
print(json.dumps(out))
`,
      cases.flatMap((c, i) => (designed[i] === null ? [] : [{ gain: c.gain, lead: c.lead, ...designed[i]! }])),
    );
    placed.forEach((c, i) => {
      const { zeta, omega, ratio } = c;
      const wanted = [{ re: -omega / ratio, im: 0 }];
      if (zeta > 1) {
        const spread = omega * Math.sqrt(zeta * zeta - 1);
        wanted.push({ re: -zeta * omega - spread, im: 0 }, { re: -zeta * omega + spread, im: 0 });
      } else {
        const imaginary = omega * Math.sqrt(1 - zeta * zeta);
        wanted.push({ re: -zeta * omega, im: -imaginary }, { re: -zeta * omega, im: imaginary });
      }
      const found = roots[i].re.map((re, k) => ({ re, im: roots[i].im[k] }));
      for (const w of wanted) {
        expect(Math.min(...found.map((f) => Math.hypot(f.re - w.re, f.im - w.im)))).toBeLessThan(1e-6 * omega);
      }
    });
  });

  it('refuses a target too fast for the lead (design loop gain |k″·kd·T0| ≥ 1) with tuning.targetNotReachable and a usable ωn', () => {
    const model = { integrators: 2 as const, gain: 10, lags_s: [], deadTime_s: 0.05, leadTimeConstant_s: 0.5 };
    let limit = 0;
    try {
      dampingTarget(model, { naturalFrequency_radps: 1.5 }, { speed_mps: 5 });
      throw new Error('expected a refusal');
    } catch (error) {
      expect((error as { code: string }).code).toBe('tuning.targetNotReachable');
      limit = (error as { details: { maximumNaturalFrequency_radps: number } }).details.maximumNaturalFrequency_radps;
    }
    expect(limit).toBeGreaterThan(0);
    expect(limit).toBeLessThan(1.5);
    expect(dampingTarget(model, { naturalFrequency_radps: 0.99 * limit }, { speed_mps: 5 }).intermediate.highFrequencyLoopGain).toBeLessThan(1);
  });

  it('a settling distance D at speed vx gives ωn = 4vx/(ζD) (ts ≈ 4/(ζωn), common practice)', () => {
    const result = dampingTarget({ integrators: 2, gain: 10, lags_s: [], deadTime_s: 0.1 }, { dampingRatio: 0.8, settlingDistance_m: 25 }, { speed_mps: 10 });
    expect(result.intermediate.naturalFrequency_radps).toBeCloseTo((4 * 10) / (0.8 * 25), 14);
  });

  it('warns when ωn·θ_eff exceeds the bound, counting lags by the half rule', () => {
    const result = dampingTarget({ integrators: 2, gain: 10, lags_s: [0.2], deadTime_s: 0.1 }, { naturalFrequency_radps: 2 }, { speed_mps: 10 });
    expect(result.intermediate.effectiveDeadTime_s).toBeCloseTo(0.2, 14);
    expect(result.warnings.join()).toMatch(/more bandwidth than the actuator lag and delay/);
    expect(dampingTarget({ integrators: 2, gain: 10, lags_s: [0.2], deadTime_s: 0.1 }, { naturalFrequency_radps: 0.5 }, { speed_mps: 10 }).warnings).toEqual(
      [],
    );
  });

  it('the documented bound ωn·θ = 0.2 (ζ = 1, ratio 5) leaves a phase margin near 48° on k′′e^(−θs)/s² (scipy brentq)', () => {
    const gains = dampingTarget(
      { integrators: 2, gain: 1, lags_s: [], deadTime_s: TUNING_DEFAULTS.maximumBandwidthDelayProduct },
      { naturalFrequency_radps: 1 },
      { speed_mps: 1 },
    ).gains;
    // Source: scipy.optimize.brentq on |L(jω)| = 1 for L = (kd s² + kp s + ki)e^(−θs)/s³ (reference library).
    const { phaseMargin_deg } = runPython<{ phaseMargin_deg: number }>(
      `
import json, sys, numpy as np
from scipy.optimize import brentq
d = json.load(sys.stdin)
L = lambda w: (d['kd']*(1j*w)**2 + d['kp']*1j*w + d['ki'])/(1j*w)**3*np.exp(-1j*w*d['theta'])
wc = brentq(lambda w: abs(L(w)) - 1, 0.5, 50)
print(json.dumps({'phaseMargin_deg': 180 + np.degrees(np.angle(L(wc)))}))
`,
      { ...gains, theta: TUNING_DEFAULTS.maximumBandwidthDelayProduct },
    );
    expect(phaseMargin_deg).toBeGreaterThan(45);
    expect(phaseMargin_deg).toBeLessThan(50);
  });

  it('refuses a self-regulating plant', () => {
    expect(() => dampingTarget({ integrators: 0, gain: 1, lags_s: [1], deadTime_s: 1 }, {}, { speed_mps: 1 })).toThrow(/double integrator/);
  });
});

describe('dampingTarget on an integrating design model (heading loop)', () => {
  it("places the poles of s² + k'·kp·s + k'·ki at s² + 2ζωn s + ωn² (numpy.roots of the closed-loop polynomial)", () => {
    const k = 1.7;
    const model = { integrators: 1 as const, gain: k, lags_s: [0.1], deadTime_s: 0.05 };
    const result = dampingTarget(model, { dampingRatio: 0.8, naturalFrequency_radps: 1.5 }, { speed_mps: 5 });
    expect(result.gains.kd).toBe(0);
    // Source: numpy.roots; expected poles −ζωn ± jωn√(1 − ζ²).
    const roots = runPython<{ re: number[]; im: number[] }>(
      `import json, sys, numpy as np
d = json.load(sys.stdin)
r = np.roots([1, d['k'] * d['kp'], d['k'] * d['ki']])
print(json.dumps({'re': r.real.tolist(), 'im': sorted(r.imag.tolist())}))`,
      { k, kp: result.gains.kp, ki: result.gains.ki },
    );
    for (const re of roots.re) expect(re).toBeCloseTo(-0.8 * 1.5, 10);
    expect(roots.im[1]).toBeCloseTo(1.5 * Math.sqrt(1 - 0.64), 10);
  });
});
