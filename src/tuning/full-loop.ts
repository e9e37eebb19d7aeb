/**
 * The loop a rule may tune on directly, as the firmware runs it: the continuous loop plant (actuator,
 * vehicle and loop integrators, its delay including the computation latency, without the Ts/2 that the
 * design model uses for the hold) under the discrete PID at its sample time. `fullLoopResponse`
 * evaluates what the robustness constraints need on a frequency grid: the plant's exact pulse
 * frequency response G(e^(jωTs)) (zero-order-hold equivalent with its fractional delay,
 * src/verify/sampled-plant.ts) and, per candidate gains, C(e^(jωTs)) of discretePidCoefficients.
 */
import { discretePidCoefficients } from '../controller/discrete.js';
import type { ControllerSettings, PidGains } from '../controller/types.js';
import type { TransferFunction } from '../lti/types.js';
import { pulseTransferFunction } from '../verify/pulse-transfer-function.js';
import { sampledPlant } from '../verify/sampled-plant.js';
import { plantPoleCounts } from '../verify/pole-counts.js';
import { analysisRoots } from '../verify/small-roots.js';

/** The full loop at one operating point. */
export interface FullLoop {
  /** Steer command → loop output, delay = vehicle and actuator delay + computation latency, s (no Ts/2). */
  readonly plant: TransferFunction;
  readonly controller: ControllerSettings;
}

/** The plant's pulse frequency response on a grid, and the grid. */
export interface FullLoopResponse {
  readonly frequency_radps: Float64Array;
  readonly plantRe: Float64Array;
  readonly plantIm: Float64Array;
  /** cos and sin of ωTs and 2ωTs, for evaluating C(e^(jωTs)) quickly. */
  readonly cos1: Float64Array;
  readonly sin1: Float64Array;
  readonly cos2: Float64Array;
  readonly sin2: Float64Array;
  readonly controller: ControllerSettings;
  /** Poles of the plant at s = 0 (z = 1): integrators of the loop besides the controller's. */
  readonly plantIntegrators: number;
  /** Poles of the plant in the open right half-plane (outside the unit circle once sampled). */
  readonly plantUnstablePoles: number;
}

/** Logarithmic grid points per decade (a 5.9 % spacing; the peaks of |S| and |T| are broad at that scale, and a design found on the grid is confirmed by the exact analysis). */
const POINTS_PER_DECADE = 40;
/**
 * The Nyquist count on the grid needs the loop's low-frequency asymptote K/(z − 1)^q at the grid's lowest
 * frequency: the plant's corners lie above it by construction (fullLoopResponse), the PI zero ki/kp must lie
 * this factor above it.
 */
export const CORNER_ABOVE_LOWEST = 30;
/** Largest change of the delay's phase between neighbouring grid points, rad: the Nyquist curve is followed without ambiguity. */
const DELAY_PHASE_STEP_rad = 0.25;

/**
 * G(e^(jωTs)) on a grid from `lowest_radps` to just below the Nyquist frequency π/Ts: logarithmic, and
 * at most DELAY_PHASE_STEP_rad of delay phase (ℓ + 3 samples of it) between points, so that the turn of
 * 1 + L can be followed from point to point. Horner's rule on B(z) and A(z)·z^(ℓ+1) of `pulseTransferFunction`.
 */
export function fullLoopResponse(loop: FullLoop, lowest_radps: number): FullLoopResponse {
  const ts = loop.controller.sampleTime_s;
  const sampled = sampledPlant(loop.plant, ts);
  const pulse = pulseTransferFunction(sampled);
  const poles = plantPoleCounts(loop.plant.denominator);
  const highest = Math.PI / ts;
  // Below every corner of the plant (its non-zero poles and zeros) by CORNER_ABOVE_LOWEST, so the low end shows the asymptote.
  let corner = Number.POSITIVE_INFINITY;
  for (const root of [...poles.poles, ...(loop.plant.numerator.length > 1 ? analysisRoots(loop.plant.numerator) : [])]) {
    const size = Math.hypot(root.re, root.im);
    if (size > 0) corner = Math.min(corner, size);
  }
  const low = Math.max(1e-6, Math.min(lowest_radps, highest / 10, corner / CORNER_ABOVE_LOWEST));
  const delaySamples = sampled.wholeSampleDelay + 1;
  const linearStep = DELAY_PHASE_STEP_rad / ((delaySamples + 2) * ts);
  const frequencies: number[] = [];
  const logCount = Math.ceil(Math.log10(highest / low) * POINTS_PER_DECADE);
  for (let i = 0; i <= logCount; i++) {
    const omega = low * Math.pow(highest / low, i / logCount);
    const previous = frequencies[frequencies.length - 1];
    if (previous !== undefined && omega - previous > linearStep) {
      for (let w = previous + linearStep; w < highest; w += linearStep) frequencies.push(w);
      break;
    }
    frequencies.push(omega);
  }
  // The last point sits just below π/Ts (at π/Ts a controller pole at z = −1 would divide by zero).
  frequencies.push(highest * (1 - 1e-9));
  const count = frequencies.length;
  const frequency = Float64Array.from(frequencies);
  const plantRe = new Float64Array(count);
  const plantIm = new Float64Array(count);
  const cos1 = new Float64Array(count);
  const sin1 = new Float64Array(count);
  const cos2 = new Float64Array(count);
  const sin2 = new Float64Array(count);
  for (let i = 0; i < count; i++) {
    const angle = frequency[i] * ts;
    const zr = Math.cos(angle);
    const zi = Math.sin(angle);
    const [br, bi] = horner(pulse.numerator, zr, zi);
    const [ar, ai] = horner(pulse.denominator, zr, zi);
    // z^(ℓ+1) = e^(j(ℓ+1)ωTs)
    const dr = Math.cos(delaySamples * angle);
    const di = Math.sin(delaySamples * angle);
    const denRe = ar * dr - ai * di;
    const denIm = ar * di + ai * dr;
    const scale = denRe * denRe + denIm * denIm;
    plantRe[i] = (br * denRe + bi * denIm) / scale;
    plantIm[i] = (bi * denRe - br * denIm) / scale;
    cos1[i] = zr;
    sin1[i] = zi;
    cos2[i] = Math.cos(2 * angle);
    sin2[i] = Math.sin(2 * angle);
  }
  return {
    frequency_radps: frequency,
    plantRe,
    plantIm,
    cos1,
    sin1,
    cos2,
    sin2,
    controller: loop.controller,
    plantIntegrators: poles.originPoles,
    plantUnstablePoles: poles.rightHalfPlanePoles,
  };
}

function horner(coefficients: readonly number[], zr: number, zi: number): [number, number] {
  let re = 0;
  let im = 0;
  for (const c of coefficients) {
    const nextRe = re * zr - im * zi + c;
    im = re * zi + im * zr;
    re = nextRe;
  }
  return [re, im];
}

/** Bounds on the sensitivity peaks. */
export interface SensitivityBounds {
  /** Ms: |S| = |1/(1 + L)| must stay at or below this. */
  readonly sensitivity: number;
  /** Mt: |T| = |L/(1 + L)| must stay at or below this. */
  readonly complementary: number;
  /** Optional: at every gain crossover (|L| = 1, interpolated between grid points) L stays at least this far from −1 in phase, degrees. */
  readonly phaseMargin_deg?: number;
}

/** What the grid says of one set of gains. */
export interface GridLoopCheck {
  readonly sensitivity: number;
  readonly complementary: number;
  /**
   * The Nyquist count on the grid (Z = P − Δarg(1 + L)/2π over the unit circle, indented outside z = 1 round
   * the q integrators, which turn 1 + L by −qπ there): true when no closed-loop pole lies outside the unit
   * circle. False also when a step of the curve is too long to follow (it could pass round −1).
   */
  readonly stable: boolean;
  /** Every bound kept and stable. */
  readonly feasible: boolean;
  /** The grid index at which the check stopped on a broken bound (a peak, or the phase margin at a crossover just below it); −1 when it did not. */
  readonly brokenAt: number;
}

/**
 * The peaks of |S| = |1/(1 + L)| and |T| = |L/(1 + L)| on the grid for the discrete PID with these gains,
 * and the Nyquist count; with `bounds`, stops at the first frequency that breaks one (feasible false).
 */
export function gridLoopCheck(response: FullLoopResponse, gains: PidGains, bounds?: SensitivityBounds): GridLoopCheck {
  return sweepGrid(response, gains, bounds, { from: 0, to: response.plantRe.length - 1 });
}

/**
 * Whether the loop with these gains breaks a bound at grid point `index` or the one below it (either peak there, or
 * the phase margin at a gain crossover between them), tested by the sweep of gridLoopCheck over those two points: when
 * it does, gridLoopCheck finds the loop infeasible too (it stops there or earlier). A search asks this first at the
 * point where the last check broke — neighbouring gains tend to break at the same frequency — and sweeps the whole
 * grid only when it holds.
 */
export function breaksBoundAt(response: FullLoopResponse, gains: PidGains, bounds: SensitivityBounds, index: number): boolean {
  return sweepGrid(response, gains, bounds, { from: Math.max(0, index - 1), to: index }).brokenAt >= 0;
}

/** gridLoopCheck over grid points `from` … `to` (the Nyquist count meaningful only over the whole grid). */
function sweepGrid(response: FullLoopResponse, gains: PidGains, bounds: SensitivityBounds | undefined, range: { from: number; to: number }): GridLoopCheck {
  const stopS = bounds?.sensitivity ?? Number.POSITIVE_INFINITY;
  const stopT = bounds?.complementary ?? Number.POSITIVE_INFINITY;
  const { numerator: b, denominator: a } = discretePidCoefficients(gains, response.controller);
  const b0 = b[0];
  const b1 = b[1] ?? 0;
  const b2 = b[2] ?? 0;
  const a0 = a[0];
  const a1 = a[1] ?? 0;
  const a2 = a[2] ?? 0;
  const { plantRe, plantIm, cos1, sin1, cos2, sin2 } = response;
  // Squared magnitudes throughout (a square root only where a crossover is interpolated): the peaks are the largest
  // squares, and every comparison holds between squares as between magnitudes.
  const stopS2 = stopS * stopS;
  const stopT2 = stopT * stopT;
  let sensitivity2 = 0;
  let complementary2 = 0;
  // The turn of 1 + L is counted by its crossings of the negative real axis (atan2's branch cut) between the first and
  // last angle: while the curve is followed (below) each chord turns by less than 60°, so a crossing lies between two
  // points that are both left of the imaginary axis, with Im changing sign — two atan2 per check instead of one per point.
  let crossings = 0;
  let firstAngle = Number.NaN;
  let previousRe = Number.NaN;
  let previousIm = Number.NaN;
  let previousOnePlus2 = Number.NaN;
  let previousMagnitude2 = Number.NaN;
  let followed = true;
  const minimumPhase_rad = ((bounds?.phaseMargin_deg ?? 0) * Math.PI) / 180;
  /** Stopped early: a peak or the phase margin is past its bound (the peaks found so far). */
  const infeasible = (brokenAt: number) => ({
    sensitivity: Math.sqrt(sensitivity2),
    complementary: Math.sqrt(complementary2),
    stable: false,
    feasible: false,
    brokenAt,
  });
  const { from, to } = range;
  for (let i = from; i <= to; i++) {
    // z⁻¹ = cos − j·sin
    const nRe = b0 + b1 * cos1[i] + b2 * cos2[i];
    const nIm = -b1 * sin1[i] - b2 * sin2[i];
    const dRe = a0 + a1 * cos1[i] + a2 * cos2[i];
    const dIm = -a1 * sin1[i] - a2 * sin2[i];
    const d2 = dRe * dRe + dIm * dIm;
    const cRe = (nRe * dRe + nIm * dIm) / d2;
    const cIm = (nIm * dRe - nRe * dIm) / d2;
    const lRe = cRe * plantRe[i] - cIm * plantIm[i];
    const lIm = cRe * plantIm[i] + cIm * plantRe[i];
    const re = 1 + lRe;
    const im = lIm;
    const onePlus2 = re * re + im * im;
    const magnitude2 = lRe * lRe + lIm * lIm;
    // |S|² = 1/|1 + L|², |T|² = |L|²/|1 + L|²
    const s2 = 1 / onePlus2;
    const t2 = magnitude2 / onePlus2;
    if (s2 > sensitivity2) sensitivity2 = s2;
    if (t2 > complementary2) complementary2 = t2;
    if (sensitivity2 > stopS2 || complementary2 > stopT2) return infeasible(i);
    if (minimumPhase_rad > 0 && i > from && (previousMagnitude2 - 1) * (magnitude2 - 1) <= 0) {
      // A gain crossover between the two points: L there by linear interpolation in |L|; its phase distance from −1.
      const previousMagnitude = Math.sqrt(previousMagnitude2);
      const magnitude = Math.sqrt(magnitude2);
      const t = previousMagnitude === magnitude ? 0 : (previousMagnitude - 1) / (previousMagnitude - magnitude);
      const crossRe = previousRe - 1 + t * (lRe - (previousRe - 1));
      const crossIm = previousIm + t * (lIm - previousIm);
      if (Math.PI - Math.abs(Math.atan2(crossIm, crossRe)) < minimumPhase_rad) return infeasible(i);
    }
    previousMagnitude2 = magnitude2;
    if (i > from) {
      // The chord from the last point must not reach −1 (|ΔL| below both distances to −1): then the turn is that of the chord.
      const stepRe = re - previousRe;
      const stepIm = im - previousIm;
      const step2 = stepRe * stepRe + stepIm * stepIm;
      if (!(step2 < Math.min(onePlus2, previousOnePlus2))) followed = false;
      if (re < 0 && previousRe < 0) {
        const above = upperHalf(im);
        if (above !== upperHalf(previousIm)) crossings += above ? -1 : 1;
      }
    } else {
      firstAngle = Math.atan2(im, re);
    }
    previousRe = re;
    previousIm = im;
    previousOnePlus2 = onePlus2;
  }
  const sensitivity = Math.sqrt(sensitivity2);
  const complementary = Math.sqrt(complementary2);
  // The count assumes the low end of the grid is below every corner of the loop: the controller's too.
  if (gains.ki !== 0 && Math.abs(gains.ki) < CORNER_ABOVE_LOWEST * response.frequency_radps[0] * Math.abs(gains.kp)) followed = false;
  const turn = Math.atan2(previousIm, previousRe) - firstAngle + 2 * Math.PI * crossings;
  const integrators = response.plantIntegrators + (gains.ki !== 0 ? 1 : 0);
  const total = 2 * turn - integrators * Math.PI;
  const outside = response.plantUnstablePoles - total / (2 * Math.PI);
  const stable = followed && Math.abs(outside) < 0.25;
  const feasible = stable && sensitivity <= stopS && complementary <= stopT;
  return { sensitivity, complementary, stable, feasible, brokenAt: -1 };
}

/** Whether atan2 puts a point left of the imaginary axis at +π (Im ≥ +0) rather than at −π (Im < 0 or −0). */
function upperHalf(im: number): boolean {
  return im > 0 || (im === 0 && !Object.is(im, -0));
}
