import { beforeAll, describe, expect, it } from 'vitest';
import { firstCrossing, stepMetrics, type StepWindow } from '../../src/log/metrics.js';
import { runPython } from '../helpers/python.js';
import { syntheticLog, type FopdtPlant } from './synthetic-log.js';

/** Every scipy reference of this file, computed in one python call (before the tests that use them). */
const SCIPY_INPUT = {
  fopdt: { K: 2.5, tau: 0.4, theta: 0.12, ramp: 0.15 },
  secondOrder: { w: 6, z: 0.4 },
  singleTrack: { m: 3500, Iz: 5500, a: 1.5, b: 2.0, Cf: 120_000, Cr: 150_000, vx: 25, lag: 0.08, A: 0.015, ramp: 0.15, rate: 100 },
};
const SCIPY_SCRIPT = [
  'import sys, json, numpy as np',
  'from scipy import signal',
  'd = json.load(sys.stdin)',
  'out = {}',
  '# First-order-plus-dead-time response to a ramped step: 90 % time after the ramp 50 % point.',
  'f = d["fopdt"]',
  't = np.arange(0, 8, 1e-4)',
  'u = np.clip((t - f["theta"]) / f["ramp"], 0, 1)',
  '_, y, _ = signal.lsim(([f["K"]], [f["tau"], 1]), u, t)',
  'y90 = 0.9 * f["K"]',
  'i = int(np.argmax(y >= y90))',
  't90 = t[i-1] + (y90 - y[i-1]) / (y[i] - y[i-1]) * (t[i] - t[i-1])',
  'out["fopdtRamp"] = {"t90": float(t90 - f["ramp"] / 2)}',
  '# Underdamped second order, ideal step.',
  'q = d["secondOrder"]',
  't = np.arange(0, 5, 1e-4)',
  '_, y = signal.step(([q["w"]**2], [1, 2*q["z"]*q["w"], q["w"]**2]), T=t)',
  'out["secondOrder"] = {"overshoot_pct": float(100*(y.max()-1)), "peak_s": float(t[int(np.argmax(y))])}',
  '# Single-track model with actuator lag, ramped step at t = 2 s, metrics by the same definitions in numpy.',
  'p = d["singleTrack"]',
  'm, Iz, a, b, Cf, Cr, vx = p["m"], p["Iz"], p["a"], p["b"], p["Cf"], p["Cr"], p["vx"]',
  'L = a + b',
  'a1 = (Cf + Cr)/(m*vx) + (a*a*Cf + b*b*Cr)/(Iz*vx)',
  'a0 = Cf*Cr*L*L/(m*Iz*vx*vx) + (b*Cr - a*Cf)/Iz',
  'b1 = a*Cf/Iz; b0 = Cf*Cr*L/(m*Iz*vx)',
  'num = np.array([b1, b0]); den = np.polymul([1, a1, a0], [p["lag"], 1])',
  't = np.arange(0, 8, 1e-4)',
  'u = p["A"] * np.clip((t - 2.0) / p["ramp"], 0, 1)',
  '_, y, _ = signal.lsim((num, den), u, t)',
  'gain = b0 / a0',
  'steady = gain * p["A"]',
  't50 = 2.0 + p["ramp"] / 2',
  'i90 = int(np.argmax(y >= 0.9 * steady))',
  't90 = t[i90-1] + (0.9*steady - y[i90-1]) / (y[i90] - y[i90-1]) * 1e-4',
  'ipk = int(np.argmax(y))',
  'k = np.arange(0, len(t), int(round(1e4 / p["rate"])))',
  'out["singleTrack"] = {"t": t[k].tolist(), "u": u[k].tolist(), "y": y[k].tolist(), "gain": gain, "response_s": t90 - t50, "peak_s": t[ipk] - t50, "overshoot_pct": 100*(y[ipk] - steady)/steady}',
  'print(json.dumps(out))',
].join('\n');

interface ScipyReferences {
  readonly fopdtRamp: { readonly t90: number };
  readonly secondOrder: { readonly overshoot_pct: number; readonly peak_s: number };
  readonly singleTrack: {
    readonly t: number[];
    readonly u: number[];
    readonly y: number[];
    readonly gain: number;
    readonly response_s: number;
    readonly peak_s: number;
    readonly overshoot_pct: number;
  };
}
let references: ScipyReferences | undefined;
beforeAll(() => {
  references = runPython<ScipyReferences>(SCIPY_SCRIPT, SCIPY_INPUT);
});
function scipy(): ScipyReferences {
  if (references === undefined) throw new Error('scipy references not computed');
  return references;
}

const PLANT: FopdtPlant = { gain_perS: SCIPY_INPUT.fopdt.K, timeConstant_s: SCIPY_INPUT.fopdt.tau, deadTime_s: SCIPY_INPUT.fopdt.theta };
const AMPLITUDE_rad = 0.03;

/** One step from 0 to `amplitude` at t = 2 s with the given ramp, as a metrics window. */
function fopdtWindow(ramp_s: number, rate_Hz: number, amplitude_rad = AMPLITUDE_rad): StepWindow {
  const log = syntheticLog({
    plant: PLANT,
    sampleRate_Hz: rate_Hz,
    stages: [
      { level_rad: 0, hold_s: 2 },
      { level_rad: amplitude_rad, hold_s: 6, ramp_s },
    ],
  });
  let preStepSamples = 0;
  while (log.time_s[preStepSamples] <= 2 + 1e-9) preStepSamples += 1;
  return { time_s: log.time_s, steerCommand_rad: log.steerCommand_rad, yawRate_radps: log.yawRate_radps, preStepSamples };
}

describe('stepMetrics(window) on an analytic first-order-plus-dead-time response', () => {
  it('an ideal step gives response time θ + τ·ln 10 and steady gain K', () => {
    // A one-sample ramp at 10 kHz approximates the ideal step; its 50 % point is half a sample after the onset.
    const rate_Hz = 10_000;
    const metrics = stepMetrics(fopdtWindow(1 / rate_Hz, rate_Hz));
    // Source: first-order step response y = K(1 − e^(−t/τ)) reaches 90 % at t = τ·ln 10 (textbook, e.g. Seborg et al., Process Dynamics and Control), plus the dead time θ.
    const expected_s = PLANT.deadTime_s + PLANT.timeConstant_s * Math.log(10);
    expect(Math.abs((metrics.responseTime_s ?? NaN) - expected_s)).toBeLessThan(2e-4); // one sample at 10 kHz
    // K of the plant; the steady part (last 1.5 s of a 6 s hold) still holds e^(−4.5 s/τ) ≈ 1e-5 of the transient.
    expect(metrics.steadyYawGain_perS).toBeCloseTo(PLANT.gain_perS, 4);
    expect(metrics.overshoot_pct).toBe(0); // a first-order response has no overshoot
    expect(metrics.peakResponseTime_s).toBeNull();
  });

  it('a 0.15 s ramp: response time from the ramp 50 % point agrees with the closed form and with scipy.signal.lsim', () => {
    const ramp_s = SCIPY_INPUT.fopdt.ramp;
    const rate_Hz = 1000;
    const metrics = stepMetrics(fopdtWindow(ramp_s, rate_Hz));
    const tau = PLANT.timeConstant_s;
    // Closed form (textbook ramp response of a first-order lag): for u > Tr, y/y∞ = 1 − (τ/Tr)(e^((Tr−u)/τ) − e^(−u/τ)) = 0.9
    // ⇒ u90 = τ·ln(10τ(e^(Tr/τ) − 1)/Tr); the 50 % point of the input is at Tr/2.
    const closedForm_s = PLANT.deadTime_s + tau * Math.log((10 * tau * (Math.exp(ramp_s / tau) - 1)) / ramp_s) - ramp_s / 2;
    const reference = scipy().fopdtRamp;
    expect(Math.abs(closedForm_s - reference.t90)).toBeLessThan(1e-4); // scipy.signal.lsim on a 0.1 ms grid
    expect(Math.abs((metrics.responseTime_s ?? NaN) - closedForm_s)).toBeLessThan(1e-3); // linear interpolation at 1 kHz
    expect(metrics.steadyYawGain_perS).toBeCloseTo(PLANT.gain_perS, 4);
  });

  it('a step to the right (negative amplitude) gives the same positive gain and response time as one to the left', () => {
    const left = stepMetrics(fopdtWindow(0.15, 500, AMPLITUDE_rad));
    const right = stepMetrics(fopdtWindow(0.15, 500, -AMPLITUDE_rad));
    expect(right.steadyYawGain_perS).toBeCloseTo(left.steadyYawGain_perS, 9);
    expect(right.responseTime_s).toBeCloseTo(left.responseTime_s ?? NaN, 9);
  });
});

describe('stepMetrics(window) on an underdamped second-order response', () => {
  it('overshoot e^(−πζ/√(1−ζ²)) and peak time π/(ωn√(1−ζ²)) of an ideal step, as scipy.signal.step finds them', () => {
    const zeta = SCIPY_INPUT.secondOrder.z;
    const omega_radps = SCIPY_INPUT.secondOrder.w;
    const gain = 1.8;
    const rate_Hz = 5000;
    const onset_s = 1;
    const n = Math.round(6 * rate_Hz);
    const time_s = new Float64Array(n);
    const command = new Float64Array(n);
    const yaw = new Float64Array(n);
    const damped = omega_radps * Math.sqrt(1 - zeta * zeta);
    for (let i = 0; i < n; i += 1) {
      const t = i / rate_Hz;
      time_s[i] = t;
      const u = t - onset_s;
      command[i] = u > 0 ? 0.02 : 0;
      // Textbook unit-step response of ωn²/(s² + 2ζωn s + ωn²) (e.g. Ogata, Modern Control Engineering).
      const unit = u > 0 ? 1 - (Math.exp(-zeta * omega_radps * u) / Math.sqrt(1 - zeta * zeta)) * Math.sin(damped * u + Math.acos(zeta)) : 0;
      yaw[i] = gain * 0.02 * unit;
    }
    const metrics = stepMetrics({ time_s, steerCommand_rad: command, yawRate_radps: yaw, preStepSamples: onset_s * rate_Hz + 1 });
    // Source: Ogata, Modern Control Engineering, maximum overshoot Mp = e^(−ζπ/√(1−ζ²)) and peak time tp = π/ωd.
    const overshoot_pct = 100 * Math.exp((-zeta * Math.PI) / Math.sqrt(1 - zeta * zeta));
    const peak_s = Math.PI / damped;
    const reference = scipy().secondOrder;
    expect(reference.overshoot_pct).toBeCloseTo(overshoot_pct, 3);
    expect(Math.abs(reference.peak_s - peak_s)).toBeLessThan(1.5e-4); // scipy on a 0.1 ms grid
    expect(metrics.overshoot_pct).toBeCloseTo(overshoot_pct, 2);
    // The 50 % point of an ideal step lies half a sample after the onset sample.
    expect(Math.abs((metrics.peakResponseTime_s ?? NaN) - (peak_s - 0.5 / rate_Hz))).toBeLessThan(2 / rate_Hz);
    expect(metrics.steadyYawGain_perS).toBeCloseTo(gain, 4);
  });
});

describe('firstCrossing({ time_s: time, values, target, direction, from })', () => {
  it('interpolates linearly between the samples around the crossing, for rising and falling signals', () => {
    const time_s = Float64Array.from([0, 1, 2, 3]);
    expect(firstCrossing({ time_s, values: Float64Array.from([0, 0, 4, 4]), target: 1, direction: 1, from: 0 })).toBeCloseTo(1.25, 12);
    expect(firstCrossing({ time_s, values: Float64Array.from([4, 4, 0, 0]), target: 1, direction: -1, from: 0 })).toBeCloseTo(1.75, 12);
    expect(firstCrossing({ time_s, values: Float64Array.from([0, 0, 0, 0]), target: 1, direction: 1, from: 0 })).toBeNull();
  });
});

describe('stepMetrics(window) on a single-track model response computed by scipy', () => {
  it('gain, response time, peak time and overshoot agree with the same definitions applied by numpy to scipy.signal.lsim', () => {
    // Single-track δ → r (docs/domain.md §3, Gillespie 1992 / Rajamani 2012) for an invented van at 25 m/s with a 0.08 s actuator lag,
    // driven by a 0.015 rad step ramped over 0.15 s from t = 2 s, sampled at 100 Hz (see SCIPY_INPUT).
    const reference = scipy().singleTrack;
    const time_s = Float64Array.from(reference.t);
    let preStepSamples = 0;
    while (time_s[preStepSamples] <= 2 + 1e-9) preStepSamples += 1;
    const metrics = stepMetrics({ time_s, steerCommand_rad: Float64Array.from(reference.u), yawRate_radps: Float64Array.from(reference.y), preStepSamples });
    expect(reference.overshoot_pct).toBeGreaterThan(1); // the model does overshoot at this speed, so the peak check means something
    expect(metrics.steadyYawGain_perS).toBeCloseTo(reference.gain, 3); // b0/a0 = vx/(L + K·vx²)
    expect(Math.abs((metrics.responseTime_s ?? NaN) - reference.response_s)).toBeLessThan(0.005); // 100 Hz samples, 5-sample smoothing
    expect(Math.abs((metrics.peakResponseTime_s ?? NaN) - reference.peak_s)).toBeLessThan(0.02); // a flat peak: parabolic refinement on 10 ms samples
    expect(Math.abs(metrics.overshoot_pct - reference.overshoot_pct)).toBeLessThan(0.2); // percentage points
  });
});
