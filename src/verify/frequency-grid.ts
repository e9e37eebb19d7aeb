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
 * origin, 1/θ for the delay and 1/Ts for a discrete controller; `cornerFactor` below
 * the smallest and above the largest. Widened until |L| ≥ 10 at the low end when the
 * loop has poles at the origin (so the indentation is far outside −1) and until
 * |L| ≤ 0.01 at the high end when L is strictly proper. A discrete controller caps the
 * band at the Nyquist frequency π/Ts.
 */
export function frequencyBand(
  loop: CompiledLoopResponse,
  originPoles: number,
  strictlyProper: boolean,
  settings: GridSettings,
): { readonly low_radps: number; readonly high_radps: number } {
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
  const base: number[] = new Array(count);
  for (let i = 0; i < count; i++) base[i] = band.low_radps * Math.pow(10, (decades * i) / (count - 1));
  base[count - 1] = band.high_radps;
  for (const w of extraFrequencies) if (w > band.low_radps && w < band.high_radps) base.push(w);
  base.sort((a, b) => a - b);

  const w: number[] = [];
  const magnitude: number[] = [];
  const phase: number[] = [];
  const re: number[] = [];
  const im: number[] = [];
  const point = newLoopPoint();
  const push = (frequency: number): void => {
    evaluateLoopResponse(loop, frequency, point);
    w.push(frequency);
    magnitude.push(point.magnitude);
    phase.push(point.phase_rad);
    re.push(point.re);
    im.push(point.im);
  };
  push(base[0]);
  for (let i = 1; i < base.length; i++) {
    if (base[i] <= w[w.length - 1]) continue;
    const from = w[w.length - 1];
    const fromMagnitude = magnitude[magnitude.length - 1];
    const fromPhase = phase[phase.length - 1];
    evaluateLoopResponse(loop, base[i], point);
    const step = Math.abs(point.phase_rad - fromPhase);
    const detailed = Math.max(fromMagnitude, point.magnitude) >= settings.detailMagnitude;
    if (detailed && step > settings.maximumPhaseStep_rad && w.length < settings.maximumPoints) {
      const pieces = Math.min(Math.ceil(step / settings.maximumPhaseStep_rad), settings.maximumPoints - w.length);
      for (let k = 1; k < pieces; k++) push(from + ((base[i] - from) * k) / pieces);
    }
    push(base[i]);
  }
  return {
    frequency_radps: Float64Array.from(w),
    magnitude: Float64Array.from(magnitude),
    phase_rad: Float64Array.from(phase),
    real: Float64Array.from(re),
    imaginary: Float64Array.from(im),
  };
}
