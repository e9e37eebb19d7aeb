/**
 * The open-loop frequency response L(jω) compiled once for fast evaluation at many
 * frequencies: value by Horner's rule (accurate) and a *continuous* phase, so that
 * crossings of −180°·(2k + 1) are found without ever unwrapping a wrapped angle
 * (docs/domain.md §5b, "delay on a coarse grid").
 *
 * Continuous phase: arg L(jω) = arg(b0/a0) + Σ arg(jω − zᵢ) − Σ arg(jω − pᵢ) − ωθ
 *   (+ the discrete controller's Σ arg(e^(jωTs) − z) − Σ arg(e^(jωTs) − p) − ωTs/2).
 * Each root's angle is measured with its branch cut on a ray that the path of s
 * (the positive imaginary axis, or the upper unit half circle for z) never meets, so
 * every term is continuous in ω; the delay term is exact and analytic. The wrapped
 * Horner angle is then moved to the branch nearest this continuous phase, which keeps
 * the Horner accuracy and the continuity. A sampled loop (discrete controller with its
 * sampled plant, `CompiledSampled`) is evaluated exactly instead, by the same snapping.
 */
import { analysisRoots } from './small-roots.js';
import type { Complex } from '../lti/types.js';
import type { SampledPlant } from './sampled-plant.js';
import { pulseTransferFunction } from './pulse-transfer-function.js';

/** Roots compiled for the continuous-angle sum. */
interface RootAngles {
  readonly re: Float64Array;
  readonly im: Float64Array;
  /** −1: cut to the left (standard atan2); +1: cut to the right (angle in [0, 2π)); 0: on the axis. */
  readonly side: Int8Array;
}

/** The discrete controller part, compiled. */
export interface CompiledDiscrete {
  readonly numerator: Float64Array;
  readonly denominator: Float64Array;
  readonly sampleTime_s: number;
  readonly zeros: RootAngles;
  readonly poles: RootAngles;
  readonly leadPhase_rad: number;
}

/**
 * The exact sampled loop C(z)·G(z) at z = e^(jωTs), G(z) = B(z)/(A(z)·z^(ℓ+1)) the plant's
 * zero-order-hold equivalent with its fractional delay (sampled-plant.ts), compiled: the value
 * by Horner's rule on B, A (Faddeev–LeVerrier, as the sampled verdict builds them) and C(z) —
 * the Nyquist count evaluates the same G by a complex solve (`sampledLoopEvaluator`), and the
 * tests check both against scipy — the continuous phase from the roots of B
 * (`zeros`), of A (`poles`: e^(pᵢTs) from the plant's poles pᵢ), the controller's roots and −(ℓ+1)·ωTs.
 */
export interface CompiledSampled {
  /** B(z) and A(z) of the plant's pulse transfer function (`pulseTransferFunction`), powers of z highest first. */
  readonly pulse: { readonly numerator: readonly number[]; readonly denominator: readonly number[] };
  readonly pulseNumerator: Float64Array;
  readonly pulseDenominator: Float64Array;
  readonly sampleTime_s: number;
  readonly zeros: RootAngles;
  readonly poles: RootAngles;
  /** π when the leading coefficient of B is negative, else 0. */
  readonly leadPhase_rad: number;
  /** ℓ + 1: the whole samples of delay plus the one the sampling adds. */
  readonly delaySamples: number;
}

/** L(jω) ready to evaluate; build with `compileLoopResponse`. */
export interface CompiledLoopResponse {
  readonly numerator: Float64Array;
  readonly denominator: Float64Array;
  readonly delay_s: number;
  readonly leadPhase_rad: number;
  readonly zeros: RootAngles;
  readonly poles: RootAngles;
  readonly discrete: CompiledDiscrete | null;
  /** With a discrete controller and its sampled plant: the loop is evaluated exactly (no Ts/2 hold approximation). */
  readonly sampled: CompiledSampled | null;
}

/** Scratch record one evaluation writes into (reused: no allocation per frequency). */
export interface LoopPoint {
  re: number;
  im: number;
  magnitude: number;
  /** Continuous (unwrapped) phase of L(jω), rad. */
  phase_rad: number;
}

export const newLoopPoint = (): LoopPoint => ({ re: 0, im: 0, magnitude: 0, phase_rad: 0 });

/**
 * Compile L(s) = N(s)/D(s)·e^(−delay_s·s) [· C(e^(sTs))·e^(−sTs/2)] from its coefficients
 * and the already computed roots of N and D. Roots closer to the imaginary axis than
 * `axisTolerance` (rad/s, absolute) are treated as on it. With a discrete controller and
 * `sampledPlant` (the zero-order-hold equivalent of N/D·e^(−delay_s·s) at its sample time,
 * from `sampledPlant`) the loop is evaluated exactly as C(e^(jωTs))·G(e^(jωTs)) instead.
 */
export function compileLoopResponse(loop: {
  /** Coefficients of N and D, highest power first. */
  readonly numerator: readonly number[];
  readonly denominator: readonly number[];
  readonly delay_s: number;
  /** The roots of N and D, and the distance (rad/s) within which a root counts as on the imaginary axis. */
  readonly roots: { readonly zeros: readonly Complex[]; readonly poles: readonly Complex[]; readonly axisTolerance: number };
  /** The discrete controller C(z), or null for a continuous loop. */
  readonly discreteController: { numerator: readonly number[]; denominator: readonly number[]; sampleTime_s: number } | null;
  /** The zero-order-hold equivalent of the plant at the controller's sample time, or null (then absent). */
  readonly sampledPlant?: SampledPlant | null;
}): CompiledLoopResponse {
  const { numerator, denominator, delay_s, roots } = loop;
  const discrete = loop.discreteController;
  const sampledPlant = loop.sampledPlant ?? null;
  const poles = continuousRootAngles(roots.poles, roots.axisTolerance);
  return {
    numerator: Float64Array.from(numerator),
    denominator: Float64Array.from(denominator),
    delay_s,
    leadPhase_rad: numerator[0] / denominator[0] < 0 ? Math.PI : 0,
    zeros: continuousRootAngles(roots.zeros, roots.axisTolerance),
    poles,
    discrete: discrete === null ? null : compileDiscrete(discrete),
    sampled: discrete === null || sampledPlant === null ? null : compileSampled(sampledPlant, discrete, poles),
  };
}

/** Leading coefficients below this × the largest are rounding residue of B(z) (their roots would be at infinity). */
const PULSE_LEAD_RELATIVE_TOLERANCE = 1e-12;

function compileSampled(
  plant: SampledPlant,
  controller: { numerator: readonly number[]; denominator: readonly number[]; sampleTime_s: number },
  plantPoles: RootAngles,
): CompiledSampled {
  const pulse = pulseTransferFunction(plant);
  const full = pulse.numerator;
  const largest = full.reduce((m, c) => Math.max(m, Math.abs(c)), 0);
  let first = 0;
  while (first < full.length - 1 && Math.abs(full[first]) <= PULSE_LEAD_RELATIVE_TOLERANCE * largest) first++;
  const pulseNumerator = full.slice(first);
  // A = det(zI − Φ) = Π(z − e^(pᵢTs)): its roots from the plant's poles, exactly (an axis pole maps onto the circle).
  const ts = controller.sampleTime_s;
  const poles: Complex[] = [];
  for (let i = 0; i < plantPoles.re.length; i++) {
    const radius = Math.exp(plantPoles.re[i] * ts);
    poles.push({ re: radius * Math.cos(plantPoles.im[i] * ts), im: radius * Math.sin(plantPoles.im[i] * ts) });
  }
  return {
    pulse,
    pulseNumerator: Float64Array.from(pulse.numerator),
    pulseDenominator: Float64Array.from(pulse.denominator),
    sampleTime_s: ts,
    zeros: discreteRootAngles(pulseNumerator.length > 1 ? analysisRoots(pulseNumerator) : []),
    poles: discreteRootAngles(poles),
    leadPhase_rad: pulseNumerator[0] < 0 ? Math.PI : 0,
    delaySamples: plant.wholeSampleDelay + 1,
  };
}

function continuousRootAngles(roots: readonly Complex[], axisTolerance: number): RootAngles {
  const re = new Float64Array(roots.length);
  const im = new Float64Array(roots.length);
  const side = new Int8Array(roots.length);
  roots.forEach((root, i) => {
    const onAxis = Math.abs(root.re) <= axisTolerance;
    re[i] = onAxis ? 0 : root.re;
    im[i] = root.im;
    side[i] = onAxis ? 0 : root.re < 0 ? -1 : 1;
  });
  return { re, im, side };
}

function compileDiscrete(d: { numerator: readonly number[]; denominator: readonly number[]; sampleTime_s: number }): CompiledDiscrete {
  return {
    numerator: Float64Array.from(d.numerator),
    denominator: Float64Array.from(d.denominator),
    sampleTime_s: d.sampleTime_s,
    zeros: discreteRootAngles(d.numerator.length > 1 ? analysisRoots(d.numerator) : []),
    poles: discreteRootAngles(d.denominator.length > 1 ? analysisRoots(d.denominator) : []),
    leadPhase_rad: d.numerator[0] / d.denominator[0] < 0 ? Math.PI : 0,
  };
}

/** side +1: cut straight down from the root (angle in (−π/2, 3π/2]); −1: cut straight up. */
function discreteRootAngles(roots: readonly Complex[]): RootAngles {
  const re = new Float64Array(roots.length);
  const im = new Float64Array(roots.length);
  const side = new Int8Array(roots.length);
  roots.forEach((root, i) => {
    re[i] = root.re;
    im[i] = root.im;
    const aboveArc = root.im > 0 && Math.abs(root.re) < 1 && root.im * root.im + root.re * root.re > 1;
    side[i] = aboveArc ? -1 : 1;
  });
  return { re, im, side };
}

/**
 * atan2(y, x) within 2e−6 rad: an odd degree-11 polynomial for atan on [0, 1] (largest error
 * 1.7e−6 rad, checked against math.atan on 1e5 points) with octant reduction. Used only to
 * pick the 2π branch, where any error well below π would do; values come from Math.atan2.
 */
function roughAtan2(y: number, x: number): number {
  const ax = Math.abs(x);
  const ay = Math.abs(y);
  if (ax === 0 && ay === 0) return 0;
  const swap = ay > ax;
  const t = swap ? ax / ay : ay / ax;
  const t2 = t * t;
  let angle = t * (0.99997726 + t2 * (-0.33262347 + t2 * (0.19354346 + t2 * (-0.11643287 + t2 * (0.05265332 + t2 * -0.0117212)))));
  if (swap) angle = Math.PI / 2 - angle;
  if (x < 0) angle = Math.PI - angle;
  return y < 0 ? -angle : angle;
}

function continuousAngleSum(roots: RootAngles, frequency_radps: number): number {
  let sum = 0;
  for (let i = 0; i < roots.re.length; i++) {
    const x = -roots.re[i];
    const y = frequency_radps - roots.im[i];
    const side = roots.side[i];
    if (side === 0) sum += y > 0 ? Math.PI / 2 : y < 0 ? -Math.PI / 2 : 0;
    else {
      const angle = roughAtan2(y, x);
      sum += side > 0 && angle < 0 ? angle + 2 * Math.PI : angle;
    }
  }
  return sum;
}

function discreteAngleSum(roots: RootAngles, cosine: number, sine: number): number {
  let sum = 0;
  for (let i = 0; i < roots.re.length; i++) {
    const angle = roughAtan2(sine - roots.im[i], cosine - roots.re[i]);
    if (roots.side[i] > 0) sum += angle < -Math.PI / 2 ? angle + 2 * Math.PI : angle;
    else sum += angle > Math.PI / 2 ? angle - 2 * Math.PI : angle;
  }
  return sum;
}

/** Move `wrapped` by a multiple of 2π to the branch nearest `reference`. */
const nearestBranch = (wrapped: number, reference: number): number => wrapped + 2 * Math.PI * Math.round((reference - wrapped) / (2 * Math.PI));

/**
 * L(jω) at ω = frequency_radps ≥ 0 (rad/s) into `out`: value, magnitude and continuous
 * phase (rad). A pole exactly at jω gives an infinite magnitude.
 */
export function evaluateLoopResponse(loop: CompiledLoopResponse, frequency_radps: number, out: LoopPoint): void {
  const w = frequency_radps;
  if (loop.sampled !== null && loop.discrete !== null) {
    evaluateSampledLoop(loop.sampled, loop.discrete, w, out);
    return;
  }
  // Horner at s = jω, highest power first.
  let nRe = 0;
  let nIm = 0;
  const num = loop.numerator;
  for (let i = 0; i < num.length; i++) {
    const next = -nIm * w + num[i];
    nIm = nRe * w;
    nRe = next;
  }
  let dRe = 0;
  let dIm = 0;
  const den = loop.denominator;
  for (let i = 0; i < den.length; i++) {
    const next = -dIm * w + den[i];
    dIm = dRe * w;
    dRe = next;
  }
  const d2 = dRe * dRe + dIm * dIm;
  let re = (nRe * dRe + nIm * dIm) / d2;
  let im = (nIm * dRe - nRe * dIm) / d2;
  const smooth = loop.leadPhase_rad + continuousAngleSum(loop.zeros, w) - continuousAngleSum(loop.poles, w);
  let phase = nearestBranch(Math.atan2(im, re), smooth);
  let delay = loop.delay_s;
  const discrete = loop.discrete;
  if (discrete !== null) {
    const omega = w * discrete.sampleTime_s;
    const c = Math.cos(omega);
    const s = Math.sin(omega);
    let zRe = 0;
    let zIm = 0;
    for (let i = 0; i < discrete.numerator.length; i++) {
      const next = zRe * c - zIm * s + discrete.numerator[i];
      zIm = zRe * s + zIm * c;
      zRe = next;
    }
    let pRe = 0;
    let pIm = 0;
    for (let i = 0; i < discrete.denominator.length; i++) {
      const next = pRe * c - pIm * s + discrete.denominator[i];
      pIm = pRe * s + pIm * c;
      pRe = next;
    }
    const p2 = pRe * pRe + pIm * pIm;
    const cRe = (zRe * pRe + zIm * pIm) / p2;
    const cIm = (zIm * pRe - zRe * pIm) / p2;
    const smoothDiscrete = discrete.leadPhase_rad + discreteAngleSum(discrete.zeros, c, s) - discreteAngleSum(discrete.poles, c, s);
    phase += nearestBranch(Math.atan2(cIm, cRe), smoothDiscrete);
    const nextRe = re * cRe - im * cIm;
    im = re * cIm + im * cRe;
    re = nextRe;
    delay += discrete.sampleTime_s / 2;
  }
  if (delay !== 0) {
    const angle = w * delay;
    const c = Math.cos(angle);
    const s = Math.sin(angle);
    const nextRe = re * c + im * s;
    im = im * c - re * s;
    re = nextRe;
    phase -= angle;
  }
  out.re = re;
  out.im = im;
  out.magnitude = Math.sqrt(re * re + im * im);
  out.phase_rad = phase;
}

/**
 * The exact sampled loop at ω (rad/s, 0 < ω ≤ π/Ts): value by the complex solve, continuous phase
 * = ∠(leading coefficients) + Σ∠(z − zeros) − Σ∠(z − poles) − (ℓ+1)·ωTs over the roots of B, A and C(z),
 * the accurate wrapped angle snapped to that branch (as for the continuous loop).
 */
function evaluateSampledLoop(sampled: CompiledSampled, controller: CompiledDiscrete, frequency_radps: number, out: LoopPoint): void {
  const angle = frequency_radps * sampled.sampleTime_s;
  const c = Math.cos(angle);
  const s = Math.sin(angle);
  // C(z)·B(z)/A(z) at z = e^(jϑ) by Horner's rule, then z^(−(ℓ+1)).
  const cn = hornerOnCircle(controller.numerator, c, s);
  const cRe = cn.re;
  const cIm = cn.im;
  const cd = hornerOnCircle(controller.denominator, c, s);
  const dRe = cd.re;
  const dIm = cd.im;
  const bn = hornerOnCircle(sampled.pulseNumerator, c, s);
  const bRe = bn.re;
  const bIm = bn.im;
  const an = hornerOnCircle(sampled.pulseDenominator, c, s);
  const topRe = cRe * bRe - cIm * bIm;
  const topIm = cRe * bIm + cIm * bRe;
  const bottomRe = dRe * an.re - dIm * an.im;
  const bottomIm = dRe * an.im + dIm * an.re;
  const b2 = bottomRe * bottomRe + bottomIm * bottomIm;
  const ratioRe = (topRe * bottomRe + topIm * bottomIm) / b2;
  const ratioIm = (topIm * bottomRe - topRe * bottomIm) / b2;
  const delay = sampled.delaySamples * angle;
  const eRe = Math.cos(delay);
  const eIm = -Math.sin(delay);
  const value = { re: ratioRe * eRe - ratioIm * eIm, im: ratioRe * eIm + ratioIm * eRe };
  const smooth =
    sampled.leadPhase_rad +
    controller.leadPhase_rad +
    discreteAngleSum(sampled.zeros, c, s) -
    discreteAngleSum(sampled.poles, c, s) +
    discreteAngleSum(controller.zeros, c, s) -
    discreteAngleSum(controller.poles, c, s) -
    sampled.delaySamples * angle;
  out.re = value.re;
  out.im = value.im;
  out.magnitude = Math.sqrt(value.re * value.re + value.im * value.im);
  out.phase_rad = nearestBranch(Math.atan2(value.im, value.re), smooth);
}

const horner = { re: 0, im: 0 };
/** p(z) at z = c + j·s (coefficients highest power first) into a shared scratch record. */
function hornerOnCircle(p: Float64Array, c: number, s: number): { re: number; im: number } {
  let re = 0;
  let im = 0;
  for (let i = 0; i < p.length; i++) {
    const next = re * c - im * s + p[i];
    im = re * s + im * c;
    re = next;
  }
  horner.re = re;
  horner.im = im;
  return horner;
}
