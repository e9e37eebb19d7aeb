/**
 * The frequency band and grid on which a loop is swept. Crossings and peaks are
 * only *bracketed* here; they are refined by root search (crossings.ts, sensitivity.ts).
 */
import { evaluateLoopResponse, newLoopPoint, type CompiledLoopResponse } from './loop-response.js';

/** The loop sampled on a grid, frequencies ascending (rad/s); phase continuous (rad). */
export interface LoopGrid {
  readonly frequency_radps: Float64Array;
  readonly magnitude: Float64Array;
  readonly phase_rad: Float64Array;
  readonly real: Float64Array;
  readonly imaginary: Float64Array;
}

export interface GridSettings {
  /** Log-spaced points per decade before refinement. */
  readonly pointsPerDecade: number;
  /** Band ends: this factor below the smallest and above the largest corner frequency. */
  readonly cornerFactor: number;
  /** Where |L| ≥ `detailMagnitude`, intervals whose phase changes more than this (rad) are subdivided. */
  readonly maximumPhaseStep_rad: number;
  readonly detailMagnitude: number;
  /** Cap on grid points (subdivision stops there). */
  readonly maximumPoints: number;
}

/**
 * Band [low, high] (rad/s) from the loop's corner frequencies: |poles|, |zeros| off the
 * origin, 1/(θ + Ts/2) for the delay (with a discrete controller's half sample of hold; 1/θ
 * without one) and 1/Ts for a discrete controller; `cornerFactor` below the smallest and
 * above the largest. Widened a decade at a time (at most 12) until |L| ≥ 10 at the low end
 * when the loop has poles at the origin (so the indentation is far outside −1) and, on a
 * continuous loop, until |L| ≤ 0.01 at the high end when L is strictly proper. A discrete
 * controller caps the band at the Nyquist frequency π/Ts instead.
 */
export function frequencyBand(
  loop: CompiledLoopResponse,
  shape: {
    /** Poles of L at the origin. */
    readonly originPoles: number;
    /** 'strictlyProper': deg N < deg D, so |L| falls at high frequency. */
    readonly properness: 'strictlyProper' | 'proper';
  },
  settings: GridSettings,
): { readonly low_radps: number; readonly high_radps: number } {
  const { originPoles } = shape;
  const strictlyProper = shape.properness === 'strictlyProper';
  let smallest = Infinity;
  let largest = 0;
  const note = (size: number): void => {
    if (size > 0 && Number.isFinite(size)) {
      smallest = Math.min(smallest, size);
      largest = Math.max(largest, size);
    }
  };
  for (const roots of [loop.zeros, loop.poles]) {
    for (let i = 0; i < roots.re.length; i++) note(Math.hypot(roots.re[i], roots.im[i]));
  }
  const totalDelay = loop.delay_s + (loop.discrete === null ? 0 : loop.discrete.sampleTime_s / 2);
  if (totalDelay > 0) note(1 / totalDelay);
  if (loop.discrete !== null) note(1 / loop.discrete.sampleTime_s);
  if (!Number.isFinite(smallest)) {
    smallest = 1;
    largest = 1;
  }
  let low = smallest / settings.cornerFactor;
  let high = largest * settings.cornerFactor;
  const point = newLoopPoint();
  for (let i = 0; i < 12 && originPoles > 0; i++) {
    evaluateLoopResponse(loop, low, point);
    if (point.magnitude >= 10) break;
    low /= 10;
  }
  if (loop.discrete !== null) {
    high = Math.min(high, Math.PI / loop.discrete.sampleTime_s);
  } else {
    for (let i = 0; i < 12 && strictlyProper; i++) {
      evaluateLoopResponse(loop, high, point);
      if (point.magnitude <= 0.01) break;
      high *= 10;
    }
  }
  return { low_radps: low, high_radps: high };
}

/**
 * Sample L(jω) on a log grid over the band, plus `extraFrequencies` (e.g. near lightly
 * damped roots), then subdivide every interval where |L| ≥ detailMagnitude and the
 * continuous phase moves more than maximumPhaseStep_rad (the delay turns the phase
 * fast at high frequency).
 */
export function sampleLoop(
  loop: CompiledLoopResponse,
  band: { readonly low_radps: number; readonly high_radps: number },
  extraFrequencies: readonly number[],
  settings: GridSettings,
): LoopGrid {
  const decades = Math.log10(band.high_radps / band.low_radps);
  const count = Math.max(2, Math.ceil(decades * settings.pointsPerDecade) + 1);
  const base = new Float64Array(count + extraFrequencies.length);
  for (let i = 0; i < count; i++) base[i] = band.low_radps * Math.pow(10, (decades * i) / (count - 1));
  base[count - 1] = band.high_radps;
  let baseCount = count;
  for (const w of extraFrequencies) if (w > band.low_radps && w < band.high_radps) base[baseCount++] = w;
  const sortedBase = baseCount > count ? base.subarray(0, baseCount).sort() : base.subarray(0, count);

  let capacity = Math.min(settings.maximumPoints, 2 * sortedBase.length + 64);
  let w: Float64Array = new Float64Array(capacity);
  let magnitude: Float64Array = new Float64Array(capacity);
  let phase: Float64Array = new Float64Array(capacity);
  let re: Float64Array = new Float64Array(capacity);
  let im: Float64Array = new Float64Array(capacity);
  let size = 0;
  const grow = (): void => {
    capacity *= 2;
    const widen = (a: Float64Array): Float64Array => {
      const b = new Float64Array(capacity);
      b.set(a);
      return b;
    };
    w = widen(w);
    magnitude = widen(magnitude);
    phase = widen(phase);
    re = widen(re);
    im = widen(im);
  };
  const point = newLoopPoint();
  const store = (frequency: number): void => {
    if (size === capacity) grow();
    w[size] = frequency;
    magnitude[size] = point.magnitude;
    phase[size] = point.phase_rad;
    re[size] = point.re;
    im[size] = point.im;
    size++;
  };
  evaluateLoopResponse(loop, sortedBase[0], point);
  store(sortedBase[0]);
  for (let i = 1; i < sortedBase.length; i++) {
    const target = sortedBase[i];
    const from = w[size - 1];
    if (target <= from) continue;
    const fromMagnitude = magnitude[size - 1];
    const fromPhase = phase[size - 1];
    evaluateLoopResponse(loop, target, point);
    const step = Math.abs(point.phase_rad - fromPhase);
    if (Math.max(fromMagnitude, point.magnitude) >= settings.detailMagnitude && step > settings.maximumPhaseStep_rad && size < settings.maximumPoints) {
      // Keep the end point's value, fill in between, then store the end point again.
      const endRe = point.re;
      const endIm = point.im;
      const endMagnitude = point.magnitude;
      const endPhase = point.phase_rad;
      const pieces = Math.min(Math.ceil(step / settings.maximumPhaseStep_rad), settings.maximumPoints - size);
      for (let k = 1; k < pieces; k++) {
        const between = from + ((target - from) * k) / pieces;
        evaluateLoopResponse(loop, between, point);
        store(between);
      }
      point.re = endRe;
      point.im = endIm;
      point.magnitude = endMagnitude;
      point.phase_rad = endPhase;
    }
    store(target);
  }
  return {
    frequency_radps: w.subarray(0, size),
    magnitude: magnitude.subarray(0, size),
    phase_rad: phase.subarray(0, size),
    real: re.subarray(0, size),
    imaginary: im.subarray(0, size),
  };
}
