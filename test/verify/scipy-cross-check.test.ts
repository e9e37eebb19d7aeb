/**
 * Property test against reference libraries: ≥ 200 random plants with delay (stable,
 * integrating, open-loop unstable, resonant, non-minimum phase; positive and negative gain) under random
 * filtered PIDs. One python3 call (numpy/scipy) computes, independently:
 * - the frequency response with scipy.signal.freqs times the exact e^(−jωθ);
 * - every margin by dense evaluation and scipy.optimize.brentq (gain crossovers on
 *   |L| − 1, phase crossovers on Im L with Re L < 0), Ms by scipy.optimize.minimize_scalar;
 * - the verdict from numpy.roots of the closed loop with a [12/12] Padé approximant.
 */
import { beforeAll, describe, expect, it } from 'vitest';
import { runPython } from '../helpers/python.js';
import { makeRandom } from '../../src/core/random.js';
import { decibelsToRatio } from '../../src/core/units.js';
import { polynomialRoots } from '../../src/lti/roots.js';
import { compileLoopResponse, evaluateLoopResponse, newLoopPoint } from '../../src/verify/loop-response.js';
import { analyseOpenLoop, openLoopOf, type OpenLoop } from '../../src/verify/index.js';

/** Frequency responses agree to this relative error (dimensionless). */
const RESPONSE_TOLERANCE = 1e-9;
/** Margins agree within 0.1 % (relative; phase margin relative to max(|PM|, 1°)). */
const MARGIN_TOLERANCE = 1e-3;
const CASES = 240;
const TEST_FREQUENCIES_RADPS = Array.from({ length: 25 }, (_, i) => Math.pow(10, -2 + (4 * i) / 24));

function randomLoops(seed: number, count: number): OpenLoop[] {
  const random = makeRandom(seed);
  const between = (low: number, high: number): number => low + (high - low) * random.uniform();
  const logBetween = (low: number, high: number): number => Math.exp(between(Math.log(low), Math.log(high)));
  const loops: OpenLoop[] = [];
  for (let i = 0; i < count; i++) {
    const sign = random.uniform() < 0.2 ? -1 : 1;
    const gain = sign * logBetween(0.2, 5);
    const tau = logBetween(0.2, 10);
    const kind = i % 6;
    // kind 5: a right-half-plane zero (non-minimum phase), K(1 − a·s)/((τs + 1)(0.5τs + 1)).
    const numerator = kind === 5 ? [-gain * logBetween(0.05, 1) * tau, gain] : [gain];
    const denominator =
      kind === 0
        ? [tau, 1]
        : kind === 1
          ? [tau * tau * 0.3, tau * 1.3, 1]
          : kind === 2
            ? [tau, 1, 0]
            : kind === 3
              ? [tau, -1]
              : kind === 4
                ? [1 / (tau * tau), (2 * between(0.1, 0.7)) / tau, 1]
                : [0.5 * tau * tau, 1.5 * tau, 1];
    const delay_s = logBetween(0.02, kind === 3 ? 0.3 * tau : 2);
    const kp = (sign * logBetween(0.05, 3)) / Math.abs(gain);
    const ki = kp / logBetween(0.3, 20);
    const kd = random.uniform() < 0.5 ? 0 : kp * logBetween(0.01, 1);
    const derivativeFilter = [5, 10, 20][Math.floor(random.uniform() * 3)];
    loops.push(openLoopOf({ plant: { numerator, denominator, delay_s }, pid: { kp, ki, kd, derivativeFilter } }));
  }
  return loops;
}

interface ReferenceCase {
  readonly response: { re: number[]; im: number[] };
  readonly phaseMargin_deg: number | null;
  readonly delayMargin_s: number | null;
  readonly lowerGainMargin: number | null;
  readonly upperGainMargin: number | null;
  readonly sensitivityPeak: number;
  readonly largestRealPart: number;
  readonly rightHalfPlanePoles: number;
}

const SCRIPT = String.raw`
import json, sys, math, warnings
import numpy as np
from scipy import signal
from scipy.optimize import brentq, minimize_scalar
warnings.simplefilter('ignore')
d = json.load(sys.stdin)
ws = np.array(d['frequencies'])
grid = np.logspace(-5, 4, 60001)
def pade(theta, n):
    c = [math.factorial(2 * n - k) * math.factorial(n) / (math.factorial(2 * n) * math.factorial(k) * math.factorial(n - k)) * theta ** k for k in range(n + 1)]
    den = np.array(c[::-1])
    num = np.array([ck * (-1) ** k for k, ck in enumerate(c)][::-1])
    return num, den
out = []
for case in d['loops']:
    num, den, theta = np.array(case['numerator']), np.array(case['denominator']), case['delay_s']
    _, h = signal.freqs(num, den, worN=ws)
    h = h * np.exp(-1j * ws * theta)
    L = lambda w: np.polyval(num, 1j * w) / np.polyval(den, 1j * w) * np.exp(-1j * w * theta)
    lg = L(grid)
    mag = np.abs(lg)
    gc = [brentq(lambda w: abs(L(w)) - 1, grid[i], grid[i + 1], xtol=1e-15, rtol=1e-13)
          for i in np.nonzero((mag[:-1] >= 1) != (mag[1:] >= 1))[0]]
    pms = [float(np.angle(-L(w))) for w in gc]
    im = lg.imag
    crit = []
    changes = np.nonzero(np.sign(im[:-1]) * np.sign(im[1:]) < 0)[0]
    # refine the crossings that can decide a margin: |L| above 0.3 and the five largest below
    order = changes[np.argsort(-mag[changes])]
    for i in sorted(set(order[:5].tolist()) | set(changes[mag[changes] > 0.3].tolist())):
        w = brentq(lambda w: L(w).imag, grid[i], grid[i + 1], xtol=1e-15, rtol=1e-13)
        if L(w).real < 0:
            crit.append(abs(L(w)))
    if den[-1] != 0 and num[-1] / den[-1] < 0:
        crit.append(abs(num[-1] / den[-1]))
    ks = [1 / m for m in crit]
    lower = max([k for k in ks if k < 1], default=None)
    upper = min([k for k in ks if k > 1], default=None)
    s = 1 / np.abs(1 + lg)
    i = int(np.argmax(s))
    ms = float(s[i])
    if 0 < i < len(grid) - 1:
        r = minimize_scalar(lambda x: -1 / abs(1 + L(math.exp(x))), bounds=(math.log(grid[i - 1]), math.log(grid[i + 1])), method='bounded', options={'xatol': 1e-10})
        ms = max(ms, -r.fun)
    pn, pd = pade(theta, 12)
    poles = np.roots(np.polyadd(np.polymul(den, pd), np.polymul(num, pn)))
    largest = float(np.max(poles.real))
    dm = min(((p if p > 0 else p + 2 * math.pi) / w for p, w in zip(pms, gc)), default=None)
    out.append({'response': {'re': h.real.tolist(), 'im': h.imag.tolist()},
                'phaseMargin_deg': math.degrees(min(abs(p) for p in pms)) if pms else None,
                'delayMargin_s': dm, 'lowerGainMargin': lower, 'upperGainMargin': upper,
                'sensitivityPeak': ms, 'largestRealPart': largest, 'rightHalfPlanePoles': int(np.sum(poles.real > 0))})
print(json.dumps(out))
`;

const loops = randomLoops(20261201, CASES);
let reference: ReferenceCase[];
beforeAll(() => {
  reference = runPython<ReferenceCase[]>(SCRIPT, { loops, frequencies: TEST_FREQUENCIES_RADPS });
});

const relative = (value: number, expected: number): number => Math.abs(value / expected - 1);

describe(`analyseOpenLoop against numpy/scipy on ${CASES} random loops with delay`, () => {
  it('the loop frequency response matches scipy.signal.freqs × e^(−jωθ) to 1e-9 relative', () => {
    const point = newLoopPoint();
    loops.forEach((loop, index) => {
      const compiled = compileLoopResponse({
        numerator: loop.numerator,
        denominator: loop.denominator,
        delay_s: loop.delay_s,
        roots: { zeros: polynomialRoots(loop.numerator), poles: polynomialRoots(loop.denominator), axisTolerance: 0 },
        discreteController: null,
      });
      TEST_FREQUENCIES_RADPS.forEach((w, k) => {
        evaluateLoopResponse(compiled, w, point);
        const re = reference[index].response.re[k];
        const im = reference[index].response.im[k];
        expect(Math.hypot(point.re - re, point.im - im) / Math.hypot(re, im)).toBeLessThan(RESPONSE_TOLERANCE);
        // The continuous phase is the principal angle up to whole turns.
        const turns = (point.phase_rad - Math.atan2(im, re)) / (2 * Math.PI);
        expect(Math.abs(turns - Math.round(turns))).toBeLessThan(1e-9);
      });
    });
  });

  it('stability verdicts and the Nyquist count Z agree with numpy roots of the closed loop with a [12/12] Padé approximant', () => {
    let stable = 0;
    let compared = 0;
    let countsCompared = 0;
    loops.forEach((loop, index) => {
      const largest = reference[index].largestRealPart;
      if (Math.abs(largest) < 1e-4) return; // too close to the axis for a reference to decide
      const margins = analyseOpenLoop(loop);
      expect({ index, verdict: margins.verdict }).toEqual({ index, verdict: largest < 0 ? 'stable' : 'unstable' });
      // The Nyquist count Z = N + P is the number of closed-loop poles in the right half-plane.
      // (A [12/12] Padé resolves closed-loop poles up to |s|·θ ≈ 15 only; a violently unstable loop has
      // more right-half-plane poles beyond that, which the exact-delay count sees: compare up to 4.)
      if (reference[index].rightHalfPlanePoles <= 4) {
        expect({ index, z: margins.analysis?.closedLoopRightHalfPlanePoles }).toEqual({ index, z: reference[index].rightHalfPlanePoles });
        countsCompared++;
      }
      compared++;
      if (largest < 0) stable++;
    });
    expect(compared).toBeGreaterThanOrEqual(200);
    expect(countsCompared).toBeGreaterThanOrEqual(200);
    // Both kinds are well represented.
    expect(stable).toBeGreaterThan(50);
    expect(compared - stable).toBeGreaterThan(50);
  });

  it('phase margin, both gain margins, delay margin and Ms agree within 0.1 %', () => {
    loops.forEach((loop, index) => {
      const ours = analyseOpenLoop(loop);
      const ref = reference[index];
      const where = { index };
      // Margins are distances to instability: the reference has them only for a loop its closed-loop roots
      // call stable (loops too close to the axis for the reference to decide are left out). The phase margin
      // is the smallest phase change, lag or lead, at a crossover: min |180° + ∠L| (never negative when stable).
      if (Math.abs(ref.largestRealPart) >= 1e-4) {
        const phase = ref.largestRealPart < 0 ? ref.phaseMargin_deg : null;
        expect({ ...where, has: ours.phaseMargin_deg !== null }).toEqual({ ...where, has: phase !== null });
        if (phase !== null) {
          expect(ours.phaseMargin_deg!).toBeGreaterThan(0);
          expect(Math.abs(ours.phaseMargin_deg! - phase) / Math.max(phase, 1)).toBeLessThan(MARGIN_TOLERANCE);
        }
        const upper = ref.largestRealPart < 0 ? ref.upperGainMargin : null;
        const lower = ref.largestRealPart < 0 ? ref.lowerGainMargin : null;
        expect({ ...where, has: ours.upperGainMargin_dB !== null }).toEqual({ ...where, has: upper !== null });
        if (upper !== null) expect(relative(decibelsToRatio(ours.upperGainMargin_dB!), upper)).toBeLessThan(MARGIN_TOLERANCE);
        expect({ ...where, has: ours.lowerGainMargin_dB !== null }).toEqual({ ...where, has: lower !== null });
        if (lower !== null) expect(relative(decibelsToRatio(ours.lowerGainMargin_dB!), lower)).toBeLessThan(MARGIN_TOLERANCE);
      }
      if (ours.stable && ref.delayMargin_s !== null) expect(relative(ours.delayMargin_s!, ref.delayMargin_s)).toBeLessThan(MARGIN_TOLERANCE);
      expect(relative(ours.sensitivityPeak, ref.sensitivityPeak)).toBeLessThan(MARGIN_TOLERANCE);
    });
  });
});
