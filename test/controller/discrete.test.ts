import { describe, expect, it } from 'vitest';
import { discretePidCoefficients, discretePidFrequencyResponse, samplingDelay_s } from '../../src/controller/discrete.js';
import { discretePidStep, initialDiscretePidState } from '../../src/controller/discrete-step.js';
import { pidTransferFunction } from '../../src/controller/pid.js';
import type { ControllerSettings, Discretisation, PidGains } from '../../src/controller/types.js';
import { isSpeedbandError } from '../../src/core/errors.js';
import { frequencyResponse } from '../../src/lti/frequency-response.js';
import { runPythonSingleThread as runPython } from '../lti/python-single-thread.js';

const settingsFor = (discretisation: Discretisation, sampleTime_s = 0.01, derivativeFilter = 10): ControllerSettings => ({
  derivativeFilter,
  sampleTime_s,
  discretisation,
  computationLatency_s: 0.004,
});

const CASES: { gains: PidGains; settings: ControllerSettings }[] = [
  { gains: { kp: 2, ki: 1.5, kd: 0.4 }, settings: settingsFor('backward-euler') },
  { gains: { kp: 2, ki: 1.5, kd: 0.4 }, settings: settingsFor('tustin') },
  { gains: { kp: 0.8, ki: 3, kd: 0.02 }, settings: settingsFor('tustin', 0.02, 8) },
  { gains: { kp: -1.1, ki: -0.3, kd: -0.25 }, settings: settingsFor('backward-euler', 0.005, 15) },
  { gains: { kp: 0.5, ki: 0, kd: 0.1 }, settings: settingsFor('tustin', 0.01, 5) },
];

describe('discretePidFrequencyResponse(gains, settings, ω)', () => {
  it('agrees with scipy.signal.cont2discrete (bilinear / backward_diff) of each PID term and scipy.signal.dfreqresp, to 1e-9', () => {
    // Source: scipy.signal.cont2discrete discretises ki/s and kd·s/(Tf·s + 1) independently ('bilinear' = Tustin,
    // 'backward_diff' = backward Euler); the parallel sum is evaluated at z = e^(jωT) by scipy.signal.dfreqresp.
    const omegas = CASES.map((c) => Array.from({ length: 40 }, (_, i) => ((i + 1) / 41) * (Math.PI / c.settings.sampleTime_s)));
    const reference = runPython<{ re: number[]; im: number[] }[]>(
      `
import sys, json, numpy as np
from scipy import signal
data = json.load(sys.stdin)
out = []
for c, w in zip(data["cases"], data["omegas"]):
    kp, ki, kd = c["kp"], c["ki"], c["kd"]
    T = c["T"]
    method = "bilinear" if c["method"] == "tustin" else "backward_diff"
    tf = (kd / kp) / c["N"]
    w = np.array(w)
    total = kp * np.ones(len(w), dtype=complex)
    for num, den in (([ki], [1, 0]), ([kd, 0], [tf, 1])):
        if num[0] == 0:
            continue
        numd, dend, _ = signal.cont2discrete((num, den), T, method=method)
        _, h = signal.dfreqresp((np.ravel(numd), dend, T), w=w * T)
        total = total + h
    out.append({"re": total.real.tolist(), "im": total.imag.tolist()})
print(json.dumps(out))
`,
      {
        omegas,
        cases: CASES.map((c) => ({ ...c.gains, T: c.settings.sampleTime_s, N: c.settings.derivativeFilter, method: c.settings.discretisation })),
      },
    );
    CASES.forEach((c, k) => {
      const response = discretePidFrequencyResponse(c.gains, c.settings, Float64Array.from(omegas[k]));
      for (let i = 0; i < omegas[k].length; i++) {
        const error = Math.hypot(response.real[i] - reference[k].re[i], response.imaginary[i] - reference[k].im[i]);
        expect(error).toBeLessThanOrEqual(1e-9 * Math.hypot(reference[k].re[i], reference[k].im[i]));
      }
    });
  });

  it('approaches the continuous PID as ω → 0 (error falls with ω)', () => {
    // Source: both discretisations map z = e^(jωT) → s = jω + O(ω²T) (Franklin, Powell & Workman §6.3).
    for (const c of CASES) {
      const omegas = Float64Array.from([1e-3, 1e-2, 1e-1].map((x) => (x * Math.PI) / c.settings.sampleTime_s));
      const discrete = discretePidFrequencyResponse(c.gains, c.settings, omegas);
      const continuous = frequencyResponse(pidTransferFunction(c.gains, c.settings.derivativeFilter), omegas);
      const errors = Array.from(
        omegas,
        (_, i) =>
          Math.hypot(discrete.real[i] - continuous.real[i], discrete.imaginary[i] - continuous.imaginary[i]) /
          Math.hypot(continuous.real[i], continuous.imaginary[i]),
      );
      expect(errors[0]).toBeLessThan(omegas[0] * c.settings.sampleTime_s); // first order in ωT (backward Euler ≈ ωT/2)
      expect(errors[0]).toBeLessThan(errors[1]);
      expect(errors[1]).toBeLessThan(errors[2]);
    }
  });
});

describe('discretePidCoefficients(gains, settings)', () => {
  it('puts the derivative-filter pole at Tf/(Tf + T) (backward Euler) and (2Tf − T)/(2Tf + T) (Tustin)', () => {
    // Source: docs/domain.md §5b. kp = 2, kd = 0.4, N = 10 → Tf = 0.02 s; T = 0.01 s → 2/3 and 0.6.
    expect(discretePidCoefficients(CASES[0].gains, CASES[0].settings).derivativeFilterPole).toBeCloseTo(2 / 3, 15);
    expect(discretePidCoefficients(CASES[1].gains, CASES[1].settings).derivativeFilterPole).toBeCloseTo(0.6, 15);
  });

  it('warns of ringing when the Tustin filter pole is ≤ 0, and Tf → 0 drives it to −1; backward Euler stays in [0, 1)', () => {
    const fast = discretePidCoefficients({ kp: 1, ki: 0, kd: 0.01 }, settingsFor('tustin', 0.01, 10)); // Tf = 1 ms < T/2
    expect(fast.derivativeFilterPole).toBeLessThan(0);
    expect(fast.warnings.map((w) => w.code)).toEqual(['controller.derivativeRinging']);
    const unfiltered = discretePidCoefficients({ kp: 1, ki: 0, kd: 0.01 }, settingsFor('tustin', 0.01, Number.POSITIVE_INFINITY));
    expect(unfiltered.derivativeFilterPole).toBe(-1);
    const euler = discretePidCoefficients({ kp: 1, ki: 0, kd: 0.01 }, settingsFor('backward-euler', 0.01, Number.POSITIVE_INFINITY));
    expect(euler.derivativeFilterPole).toBe(0);
    expect(euler.warnings).toEqual([]);
  });

  it('leaves out cancelled factors: a PD has no pole at z = 1 and a PI under Tustin no pole at z = −1 (finite at ω = 0 and π/T)', () => {
    const pd = discretePidCoefficients({ kp: 2, ki: 0, kd: 0.4 }, settingsFor('tustin'));
    expect(pd.denominator).toHaveLength(2);
    const pi = discretePidCoefficients({ kp: 2, ki: 1, kd: 0 }, settingsFor('tustin'));
    expect(pi.denominator).toEqual([1, -1]);
    const at = discretePidFrequencyResponse({ kp: 2, ki: 0, kd: 0.4 }, settingsFor('tustin'), Float64Array.from([0, Math.PI / 0.01]));
    // Source: at ω = 0 the derivative term vanishes, leaving kp (textbook: C(z = 1) = kp for a PD).
    expect(at.real[0]).toBeCloseTo(2, 14);
    expect(at.imaginary[0]).toBe(0);
    expect(Number.isFinite(at.real[1])).toBe(true);
    const piAt = discretePidFrequencyResponse({ kp: 2, ki: 1, kd: 0 }, settingsFor('tustin'), Float64Array.from([Math.PI / 0.01]));
    // Source: Tustin maps ω = π/T to s = ∞, where ki/s → 0: C = kp.
    expect(piAt.real[0]).toBeCloseTo(2, 12);
  });

  it('refuses a sample time ≤ 0 and an unknown discretisation with controller.invalidSettings', () => {
    const code = (settings: ControllerSettings): string | undefined => {
      try {
        discretePidCoefficients({ kp: 1, ki: 1, kd: 0 }, settings);
      } catch (error) {
        return isSpeedbandError(error) ? error.code : 'other';
      }
      return undefined;
    };
    expect(code(settingsFor('tustin', 0))).toBe('controller.invalidSettings');
    expect(code({ ...settingsFor('tustin'), discretisation: 'forward' as Discretisation })).toBe('controller.invalidSettings');
  });

  it('its z⁻¹ transfer function equals the step-by-step difference equation (scipy.signal.lfilter on the same error)', () => {
    // Source: scipy.signal.lfilter(numerator, denominator, e) — a second implementation of the same recursion.
    const errors = Array.from({ length: 60 }, (_, k) => (k === 0 ? 0 : Math.sin(0.37 * k) + (k % 7 === 0 ? 1 : 0)));
    const coefficients = CASES.map((c) => discretePidCoefficients(c.gains, c.settings));
    const reference = runPython<number[][]>(
      'import sys, json\nfrom scipy import signal\nd = json.load(sys.stdin)\nprint(json.dumps([signal.lfilter(c["b"], c["a"], d["e"]).tolist() for c in d["c"]]))',
      { e: errors, c: coefficients.map((c) => ({ b: c.numerator, a: c.denominator })) },
    );
    CASES.forEach((c, k) => {
      let state = initialDiscretePidState();
      errors.forEach((e, i) => {
        const step = discretePidStep(c.gains, c.settings, state, e);
        state = step.state;
        expect(step.output).toBeCloseTo(reference[k][i], 10);
      });
    });
  });
});

describe('discretePidStep', () => {
  it('is bumpless: changing ki at constant error moves the output only by the next integral increment', () => {
    // Source: docs/domain.md §7 — integrate ki·e, not ki·∫e.
    const settings = settingsFor('backward-euler');
    let state = initialDiscretePidState();
    let last = 0;
    for (let k = 0; k < 50; k++) {
      const step = discretePidStep({ kp: 0, ki: 1, kd: 0 }, settings, state, 1);
      state = step.state;
      last = step.output;
    }
    const after = discretePidStep({ kp: 0, ki: 3, kd: 0 }, settings, state, 1).output;
    expect(after - last).toBeCloseTo(3 * 0.01, 12); // one increment T·ki·e at the new gain, no jump of 2·∫e
  });
});

describe('samplingDelay_s(settings)', () => {
  it('is T/2 plus the computation latency; T/2 is the exact phase lag of the zero-order hold (1 − e^(−jωT))/(jωT)', () => {
    // Source: Franklin, Powell & Workman, Digital Control of Dynamic Systems, §6.2 (ZOH ≈ e^(−sT/2)).
    expect(samplingDelay_s(settingsFor('tustin', 0.02))).toBeCloseTo(0.014, 15);
    const T = 0.02;
    for (const w of [1, 10, 100]) {
      const re = Math.sin(w * T) / (w * T);
      const im = (Math.cos(w * T) - 1) / (w * T);
      expect(Math.atan2(im, re)).toBeCloseTo((-w * T) / 2, 12);
    }
  });
});
