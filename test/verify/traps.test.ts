/**
 * One test per trap of docs/domain.md §5b that general control code has fallen into.
 * Independent values come from closed forms derived beside each test, or from one
 * batched python3 call (numpy/scipy) in beforeAll.
 */
import { beforeAll, describe, expect, it } from 'vitest';
import { runPython } from '../helpers/python.js';
import { analyseLoop, analyseOpenLoop, type LoopMargins } from '../../src/verify/index.js';
import { decibelsToRatio } from '../../src/core/units.js';
import { multiplyPolynomials } from '../../src/lti/polynomial.js';

/** Relative agreement with scipy's brentq-refined values, dimensionless. */
const REFERENCE = 1e-8;

/** An oversteering single-track car above its critical speed (our own invented numbers, synthetic). */
function oversteerYawRatePlant(speed_mps: number): { numerator: number[]; denominator: number[] } {
  // Source: docs/domain.md §3 single-track formulas (Gillespie 1992; Rajamani 2012).
  const m = 1500;
  const iz = 2500;
  const a = 1.6;
  const b = 1.0;
  const cf = 80_000;
  const cr = 60_000;
  const l = a + b;
  const a1 = (cf + cr) / (m * speed_mps) + (a * a * cf + b * b * cr) / (iz * speed_mps);
  const a0 = (cf * cr * l * l) / (m * iz * speed_mps * speed_mps) + (b * cr - a * cf) / iz;
  return { numerator: [(a * cf) / iz, (cf * cr * l) / (m * iz * speed_mps)], denominator: [1, a1, a0] };
}

const multiCrossover = {
  numerator: multiplyPolynomials([6], [1, 0.2, 0.01]),
  denominator: multiplyPolynomials([1, 0, 0], [1, 0.4, 100]),
  delay_s: 0,
};
const oversteer = { ...oversteerYawRatePlant(30), delay_s: 0.05 };
const oversteerGains = [0.05, 0.1, 0.2, 0.5];

interface Reference {
  coarse: { firstPhaseCrossover_radps: number; gainMargin: number };
  multi: { crossovers_radps: number[]; phaseMargins_deg: number[]; delayMargin_s: number };
  oversteer: { largestRealPart: number[] };
}

const SCRIPT = String.raw`
import json, sys, math, warnings
import numpy as np
from scipy.optimize import brentq
from scipy.interpolate import pade
warnings.simplefilter("ignore")
d = json.load(sys.stdin)
out = {}
# Delay on a coarse grid: L = 0.5 e^(-10 s)/(s + 1); first phase crossover atan(w) + 10 w = pi.
w1 = brentq(lambda w: math.atan(w) + 10 * w - math.pi, 1e-6, 1.0, xtol=1e-15)
out['coarse'] = {'firstPhaseCrossover_radps': w1, 'gainMargin': math.sqrt(1 + w1 * w1) / 0.5}
# Several gain crossovers: dense evaluation, brentq on |L| - 1.
num, den = d['multi']['numerator'], d['multi']['denominator']
L = lambda w: np.polyval(num, 1j * w) / np.polyval(den, 1j * w)
grid = np.logspace(-4, 4, 200001)
mag = np.abs(L(grid)) - 1
cross = []
for i in np.nonzero(np.sign(mag[:-1]) != np.sign(mag[1:]))[0]:
    cross.append(brentq(lambda w: abs(L(w)) - 1, grid[i], grid[i + 1], xtol=1e-14, rtol=1e-14))
pms = [math.degrees(np.angle(-L(w))) for w in cross]
out['multi'] = {'crossovers_radps': cross, 'phaseMargins_deg': pms,
                'delayMargin_s': min((math.radians(p) if p > 0 else math.radians(p) + 2 * math.pi) / w for p, w in zip(pms, cross))}
# Oversteering plant under PI: closed-loop roots with a [6/6] Pade of the delay (scipy.interpolate.pade).
taylor = [(-d['oversteer']['delay_s']) ** k / math.factorial(k) for k in range(13)]
p, q = pade(taylor, 6)
res = []
for kp in d['oversteer']['gains']:
    c_num, c_den = [kp, 2 * kp], [1, 0]
    ln = np.polymul(np.polymul(d['oversteer']['numerator'], c_num), p.coeffs)
    ld = np.polymul(np.polymul(d['oversteer']['denominator'], c_den), q.coeffs)
    res.append(float(np.max(np.roots(np.polyadd(ld, ln)).real)))
out['oversteer'] = {'largestRealPart': res}
print(json.dumps(out))
`;

let reference: Reference;
beforeAll(() => {
  reference = runPython<Reference>(SCRIPT, { multi: multiCrossover, oversteer: { ...oversteer, gains: oversteerGains } });
});

/** Source: definition (docs/domain.md §5b): a phase margin lies in (−180°, 180°]. */
function wrapDegrees(angle_deg: number): number {
  return angle_deg - 360 * Math.ceil((angle_deg - 180) / 360);
}

describe('docs/domain.md §5b traps', () => {
  it('phase wrapping: the signed margin at a crossover is wrapped into (−180°, 180°] even when ∠L there is far below −180°, and an unstable loop reports no phase margin', () => {
    // Source: derived. k·e^(−θs)/s crosses over at ω = k with ∠L = −90° − kθ·180/π, so the signed margin 180° + ∠L
    // is 90° − kθ·180/π wrapped into (−180°, 180°]; with kθ = 12 rad the unwrapped value is −597.5°. The loop is
    // stable only for kθ < π/2 (the textbook limit of an integrator with delay), so here it is unstable.
    for (const kTheta of [2, 4, 7, 12]) {
      const margins = analyseOpenLoop({ numerator: [1], denominator: [1, 0], delay_s: kTheta });
      const expected = wrapDegrees(90 - (kTheta * 180) / Math.PI);
      const signed = margins.analysis!.gainCrossovers[0].phaseMargin_deg;
      expect(signed).toBeGreaterThan(-180);
      expect(signed).toBeLessThanOrEqual(180);
      expect(signed).toBeCloseTo(expected, 8);
      expect(margins.stable).toBe(false);
      // A margin is a distance to instability: none on a loop that is already unstable.
      expect(margins.phaseMargin_deg).toBeNull();
    }
    // −k/s: ∠L = +90°, so a naive 180° + ∠L gives 270°; wrapped it is −90° and the loop is unstable (pole at s = k).
    const negative = analyseOpenLoop({ numerator: [-2], denominator: [1, 0], delay_s: 0 });
    expect(negative.analysis!.gainCrossovers[0].phaseMargin_deg).toBeCloseTo(-90, 10);
    expect(negative.verdict).toBe('unstable');
    expect(negative.phaseMargin_deg).toBeNull();
  });

  it('a positive phase margin does not prove stability: an unfiltered PID on a delayed lag with |L(j∞)| ≥ 1 is unstable', () => {
    // Source: neutral-type delay systems (docs/domain.md §5b; Hale & Verduyn Lunel 1993): with an
    // unfiltered derivative on K·e^(−θs)/(τs + 1), L(j∞) = kd·K/τ; |L(j∞)| ≥ 1 is unstable.
    const plant = { numerator: [1], denominator: [1, 1], delay_s: 0.1 };
    const neutral = analyseLoop({ plant, pid: { kp: 0.5, ki: 0.5, kd: 1.05, derivativeFilter: Infinity } });
    // Every crossover looks comfortable (signed margin above 90°), yet the loop is unstable: no margin is reported.
    for (const crossover of neutral.analysis!.gainCrossovers) expect(crossover.phaseMargin_deg).toBeGreaterThan(90);
    expect(neutral.analysis!.gainCrossovers.length).toBeGreaterThan(0);
    expect(neutral.phaseMargin_deg).toBeNull();
    expect(neutral.analysis?.decidedBy).toBe('neutral-type loop');
    expect(neutral.analysis?.highFrequencyLoopGain).toBeCloseTo(1.05, 12);
    expect(neutral.analysis?.neutralType).toBe(true);
    expect(neutral.stable).toBe(false);
    expect(neutral.verdict).toBe('unstable');
    // With the filter the firmware runs (N = 10) the loop is retarded again and decided by both tests.
    const filtered = analyseLoop({ plant, pid: { kp: 0.5, ki: 0.5, kd: 1.05, derivativeFilter: 10 } });
    expect(filtered.analysis?.neutralType).toBe(false);
    expect(filtered.analysis?.highFrequencyLoopGain).toBe(0);
    expect(filtered.analysis?.closedLoopPoleVerdict).toBe(filtered.analysis?.encirclementVerdict);
  });

  it('delay on a coarse grid: 0.5·e^(−10s)/(s + 1) finds the first phase crossover and its gain margin exactly', () => {
    // Reference: scipy.optimize.brentq on atan(ω) + 10ω = π; GM = √(1 + ω²)/K (derived).
    const margins = analyseOpenLoop({ numerator: [0.5], denominator: [1, 1], delay_s: 10 });
    expect(margins.stable).toBe(true);
    expect(Math.abs(margins.upperGainMarginFrequency_radps! / reference.coarse.firstPhaseCrossover_radps - 1)).toBeLessThan(REFERENCE);
    expect(Math.abs(decibelsToRatio(margins.upperGainMargin_dB!) / reference.coarse.gainMargin - 1)).toBeLessThan(REFERENCE);
    // Each crossing of the negative real axis counted exactly once: near ω·θ = π(2k + 1) for k = 0..
    const crossings = margins.analysis!.phaseCrossovers.map((c) => c.frequency_radps).filter((w) => w < 3);
    for (let i = 1; i < crossings.length; i++) expect(crossings[i] - crossings[i - 1]).toBeGreaterThan(0.5);
  });

  it('an open-loop pole at the origin nudged to +1e−14 by arithmetic flips neither the verdict nor the margins', () => {
    const exact = analyseOpenLoop({ numerator: [1], denominator: [1, 3, 2, 0], delay_s: 0.2 });
    const nudged = analyseOpenLoop({ numerator: [1], denominator: [1, 3, 2, -2e-14], delay_s: 0.2 });
    expect(nudged.verdict).toBe(exact.verdict);
    expect(nudged.analysis?.openLoopOriginPoles).toBe(1);
    expect(nudged.analysis?.openLoopRightHalfPlanePoles).toBe(0);
    expect(nudged.phaseMargin_deg).toBeCloseTo(exact.phaseMargin_deg as number, 8);
    expect(nudged.upperGainMargin_dB).toBeCloseTo(exact.upperGainMargin_dB as number, 8);
  });

  it('an oversteering car above its critical speed (open-loop unstable) is stabilised by a PI yaw-rate loop: Z = N + P', () => {
    // Source: Nyquist criterion (Nyquist 1932); reference verdicts from numpy roots of the
    // closed loop with a [6/6] Padé of the delay (θ = 0.05 s: good to ω·θ ≈ 7) (scipy.interpolate.pade).
    oversteerGains.forEach((kp, i) => {
      const margins = analyseLoop({ plant: oversteer, pid: { kp, ki: 2 * kp, kd: 0 } });
      expect(margins.analysis?.openLoopRightHalfPlanePoles).toBe(1);
      const referenceStable = reference.oversteer.largestRealPart[i] < 0;
      expect(margins.stable).toBe(referenceStable);
      expect(margins.analysis?.closedLoopRightHalfPlanePoles === 0).toBe(referenceStable);
    });
    // The stabilised loop has a lower gain margin: reducing the gain brings the unstable pole back.
    const stabilised = analyseLoop({ plant: oversteer, pid: { kp: 0.2, ki: 0.4, kd: 0 } });
    expect(stabilised.stable).toBe(true);
    expect(stabilised.lowerGainMargin_dB as number).toBeLessThan(0);
  });

  it('delay margin is the minimum of PMᵢ/ωᵢ over all gain crossovers, not the one at the smallest phase margin', () => {
    const margins: LoopMargins = analyseOpenLoop(multiCrossover);
    const crossovers = margins.analysis!.gainCrossovers;
    expect(crossovers.map((c) => c.frequency_radps)).toHaveLength(reference.multi.crossovers_radps.length);
    crossovers.forEach((c, i) => {
      expect(Math.abs(c.frequency_radps / reference.multi.crossovers_radps[i] - 1)).toBeLessThan(REFERENCE);
      expect(c.phaseMargin_deg).toBeCloseTo(reference.multi.phaseMargins_deg[i], 6);
    });
    expect(Math.abs(margins.delayMargin_s! / reference.multi.delayMargin_s - 1)).toBeLessThan(REFERENCE);
    // The smallest phase margin is at the lowest crossover; the delay margin is set by another one.
    expect(margins.delayMarginFrequency_radps).not.toBeCloseTo(margins.phaseMarginFrequency_radps as number, 3);
  });

  it('Padé order: the limit of k·e^(−θs)/s is kθ = π/2, not the kθ = 2 a first-order approximant gives', () => {
    // Source: derived. Exact: crossover ω = k, phase −90° − kθ → stable iff kθ < π/2. First-order
    // Padé: s(1 + θs/2) + k(1 − θs/2) = (θ/2)s² + (1 − kθ/2)s + k → "stable" iff kθ < 2.
    for (const kTheta of [1.5, 1.55]) expect(analyseOpenLoop({ numerator: [kTheta], denominator: [1, 0], delay_s: 1 }).stable).toBe(true);
    for (const kTheta of [1.6, 1.8, 1.95]) {
      const margins = analyseOpenLoop({ numerator: [kTheta], denominator: [1, 0], delay_s: 1 });
      expect(margins.stable).toBe(false);
      expect(margins.analysis?.closedLoopPoleVerdict).toBe('unstable');
      expect(margins.analysis?.padeOrder).toBeGreaterThan(1);
    }
  });

  it('a negative plant gain with negative controller gains gives the same margins', () => {
    // Source: common practice (docs/domain.md §5b: axis conventions differ; L = C·G is unchanged).
    const plant = { numerator: [0.8], denominator: [2, 3, 1], delay_s: 0.3 };
    const pid = { kp: 1.2, ki: 0.6, kd: 0.3, derivativeFilter: 10 };
    const positive = analyseLoop({ plant, pid });
    const negative = analyseLoop({ plant: { ...plant, numerator: [-0.8] }, pid: { ...pid, kp: -1.2, ki: -0.6, kd: -0.3 } });
    const { analysis: _a, ...p } = positive;
    const { analysis: _b, ...n } = negative;
    expect(n).toEqual(p);
    expect(positive.stable).toBe(true);
  });
});
