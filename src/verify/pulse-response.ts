/**
 * The exact pulse frequency response of a sampled loop, for counting encirclements:
 *   L(e^(jϑ)) = C(e^(jϑ))·B(e^(jϑ))/A(e^(jϑ))·e^(−j(ℓ+1)ϑ),  ϑ = ω·Ts ∈ [0, π],
 * with B, A the plant's pulse transfer function (sampled-verdict.ts `pulseTransferFunction`) and
 * A evaluated in product form over its roots e^(pᵢTs) from the continuous poles pᵢ, each factor as
 * (z − 1) − (e^(pᵢTs) − 1) with both differences computed without cancellation (−2·sin²(ϑ/2) and
 * expm1): near z = 1, where the integrators put A's roots, the coefficient form of A cancels.
 * The value only (no continuous phase): the count follows the turn of 1 + L itself.
 */
import type { Complex } from '../lti/types.js';
import { controllerInDelays } from './sampled-plant.js';

export interface PulseResponse {
  /** B(z), powers of z highest first. */
  readonly numerator: Float64Array;
  /** e^(pᵢTs) − 1 for each root of A (0 exactly for a pole at the origin). */
  readonly poleOffsetRe: Float64Array;
  readonly poleOffsetIm: Float64Array;
  /** C(z) = b(z)/a(z), powers of z highest first, equal lengths, a[0] = 1. */
  readonly controllerNumerator: Float64Array;
  readonly controllerDenominator: Float64Array;
  /** ℓ + 1: whole samples of delay plus the one the sampling adds. */
  readonly delaySamples: number;
}

/** Scratch record an evaluation writes into: L and the loop without the delay register's turn (the "body"). */
export interface PulsePoint {
  re: number;
  im: number;
  bodyRe: number;
  bodyIm: number;
}

export const newPulsePoint = (): PulsePoint => ({ re: 0, im: 0, bodyRe: 0, bodyIm: 0 });

/**
 * Compile the pulse response from B(z) (powers of z, highest first), the continuous plant poles pᵢ
 * (rad/s; those within the axis tolerance of the origin given as exactly 0), the sample time (s),
 * C(z) and the whole samples of delay ℓ.
 */
export function compilePulseResponse(loop: {
  /** B(z), powers of z, highest first. */
  readonly pulseNumerator: readonly number[];
  /** The continuous plant poles pᵢ, rad/s (those within the axis tolerance of the origin exactly 0). */
  readonly continuousPoles: readonly Complex[];
  readonly sampleTime_s: number;
  /** C(z). */
  readonly controller: { readonly numerator: readonly number[]; readonly denominator: readonly number[] };
  /** ℓ, whole samples of delay. */
  readonly wholeSampleDelay: number;
}): PulseResponse {
  const { pulseNumerator, continuousPoles, sampleTime_s, controller, wholeSampleDelay } = loop;
  const { b, a } = controllerInDelays(controller);
  const offsetRe = new Float64Array(continuousPoles.length);
  const offsetIm = new Float64Array(continuousPoles.length);
  continuousPoles.forEach((p, i) => {
    const decay = Math.expm1(p.re * sampleTime_s);
    const angle = p.im * sampleTime_s;
    const half = Math.sin(angle / 2);
    offsetRe[i] = decay * Math.cos(angle) - 2 * half * half;
    offsetIm[i] = (decay + 1) * Math.sin(angle);
  });
  return {
    numerator: Float64Array.from(pulseNumerator),
    poleOffsetRe: offsetRe,
    poleOffsetIm: offsetIm,
    controllerNumerator: Float64Array.from(b),
    controllerDenominator: Float64Array.from(a),
    delaySamples: wholeSampleDelay + 1,
  };
}

/** L(e^(jϑ)) with `extraSamples` whole samples of delay added, into `out`. */
export function evaluatePulse(response: PulseResponse, angle: number, extraSamples: number, out: PulsePoint): void {
  const c = Math.cos(angle);
  const s = Math.sin(angle);
  const half = Math.sin(angle / 2);
  const zMinusOneRe = -2 * half * half;
  // B(z) and the controller by Horner's rule.
  let bRe = 0;
  let bIm = 0;
  const num = response.numerator;
  for (let i = 0; i < num.length; i++) {
    const next = bRe * c - bIm * s + num[i];
    bIm = bRe * s + bIm * c;
    bRe = next;
  }
  let nRe = 0;
  let nIm = 0;
  let dRe = 0;
  let dIm = 0;
  const cn = response.controllerNumerator;
  const cd = response.controllerDenominator;
  for (let i = 0; i < cn.length; i++) {
    const nextN = nRe * c - nIm * s + cn[i];
    nIm = nRe * s + nIm * c;
    nRe = nextN;
    const nextD = dRe * c - dIm * s + cd[i];
    dIm = dRe * s + dIm * c;
    dRe = nextD;
  }
  // A(z) = Π((z − 1) − (rᵢ − 1)) times the controller's denominator.
  const offRe = response.poleOffsetRe;
  const offIm = response.poleOffsetIm;
  for (let i = 0; i < offRe.length; i++) {
    const fRe = zMinusOneRe - offRe[i];
    const fIm = s - offIm[i];
    const next = dRe * fRe - dIm * fIm;
    dIm = dRe * fIm + dIm * fRe;
    dRe = next;
  }
  const topRe = nRe * bRe - nIm * bIm;
  const topIm = nRe * bIm + nIm * bRe;
  const d2 = dRe * dRe + dIm * dIm;
  const bodyRe = (topRe * dRe + topIm * dIm) / d2;
  const bodyIm = (topIm * dRe - topRe * dIm) / d2;
  const turn = (response.delaySamples + extraSamples) * angle;
  const tc = Math.cos(turn);
  const ts = Math.sin(turn);
  out.bodyRe = bodyRe;
  out.bodyIm = bodyIm;
  out.re = bodyRe * tc + bodyIm * ts;
  out.im = bodyIm * tc - bodyRe * ts;
}
