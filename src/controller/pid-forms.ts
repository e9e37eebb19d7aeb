/**
 * Conversions between the three ways of writing a PID (docs/domain.md §4; Åström &
 * Hägglund, Advanced PID Control, 2006, §3.2):
 *   parallel  kp + ki/s + kd·s
 *   ideal     Kc·(1 + 1/(Ti·s) + Td·s)            kp = Kc, ki = Kc/Ti, kd = Kc·Td
 *   series    Kc·(1 + 1/(τI·s))·(1 + τD·s)
 *             → ideal: Kc' = Kc·(1 + τD/τI), Ti = τI + τD, Td = τI·τD/(τI + τD).
 * The series form exists only when the PID zeros are real, Ti ≥ 4·Td.
 * No integral action is written ki = 0 / integralTime_s = null (Ti = ∞).
 * Negative gains (a negative plant gain, docs/domain.md §5b) are carried through: all of
 * kp, ki, kd share one sign and the times stay positive.
 */
import { SpeedbandError } from '../core/errors.js';
import type { IdealPid, PidGains, SeriesPid } from './types.js';

/**
 * 1 − 4Td/Ti within this of 0 counts as the double zero Ti = 4Td: a series PID with
 * τI = τD converted to ideal and back lands there up to rounding.
 */
const DOUBLE_ZERO_TOLERANCE = 1e-12;

/** Parallel (kp, ki, kd) → ideal (Kc = kp, Ti = kp/ki or null if ki = 0, Td = kd/kp). */
export function parallelToIdeal(gains: PidGains): IdealPid {
  requireFinite(gains);
  const { kp, ki, kd } = gains;
  if (kp === 0) {
    if (ki === 0 && kd === 0) return { gain: 0, integralTime_s: null, derivativeTime_s: 0 };
    throw new SpeedbandError(
      'controller.noIdealForm',
      `a PID with kp = 0 (ki = ${ki}, kd = ${kd}) has no ideal or series form: Kc·(1 + 1/(Ti·s) + Td·s) needs Kc ≠ 0 — keep it in the parallel form`,
      { details: { ...gains } },
    );
  }
  requireOneSign(gains);
  return { gain: kp, integralTime_s: ki === 0 ? null : kp / ki, derivativeTime_s: kd / kp };
}

/** Ideal (Kc, Ti, Td) → parallel: kp = Kc, ki = Kc/Ti (0 when Ti is null), kd = Kc·Td. */
export function idealToParallel(ideal: IdealPid): PidGains {
  requireTimes(ideal, 'ideal');
  return {
    kp: ideal.gain,
    ki: ideal.integralTime_s === null ? 0 : ideal.gain / ideal.integralTime_s,
    kd: ideal.gain * ideal.derivativeTime_s,
  };
}

/**
 * Series (Kc, τI, τD) → ideal: Kc' = Kc·(1 + τD/τI), Ti = τI + τD, Td = τI·τD/(τI + τD)
 * (docs/domain.md §4; Åström & Hägglund 2006, eq. 3.9). Without integral action (τI null)
 * the series form is Kc·(1 + τD·s): Kc' = Kc, Td = τD.
 */
export function seriesToIdeal(series: SeriesPid): IdealPid {
  requireTimes(series, 'series');
  const { gain, integralTime_s: tauI, derivativeTime_s: tauD } = series;
  if (tauI === null) return { gain, integralTime_s: null, derivativeTime_s: tauD };
  return { gain: gain * (1 + tauD / tauI), integralTime_s: tauI + tauD, derivativeTime_s: (tauI * tauD) / (tauI + tauD) };
}

/**
 * Ideal → series, the inverse of seriesToIdeal: τI and τD are the roots of
 * x² − Ti·x + Ti·Td = 0, τI the larger, τD the smaller:
 *   τI = Ti/2·(1 + √(1 − 4Td/Ti)),  τD = Ti/2·(1 − √(1 − 4Td/Ti)),  Kc = Kc'·τI/Ti.
 * Exists only for Ti ≥ 4·Td (real PID zeros; 1e-12 relative rounding allowed); otherwise
 * throws `controller.noSeriesForm`.
 */
export function idealToSeries(ideal: IdealPid): SeriesPid {
  requireTimes(ideal, 'ideal');
  const { gain, integralTime_s: ti, derivativeTime_s: td } = ideal;
  if (ti === null || td === 0) return { gain, integralTime_s: ti, derivativeTime_s: td };
  const discriminant = 1 - (4 * td) / ti;
  if (discriminant < -DOUBLE_ZERO_TOLERANCE) {
    throw new SpeedbandError(
      'controller.noSeriesForm',
      `this PID has Ti = ${ti} s < 4·Td = ${4 * td} s: its zeros are complex, so no series form Kc·(1 + 1/(τI·s))·(1 + τD·s) exists — keep the parallel or ideal form, or retune with Ti ≥ 4·Td`,
      { details: { integralTime_s: ti, derivativeTime_s: td } },
    );
  }
  const root = Math.sqrt(Math.max(0, discriminant));
  const tauI = (ti / 2) * (1 + root);
  const tauD = (ti * td) / tauI; // = Ti/2·(1 − root), computed without cancellation
  return { gain: (gain * tauI) / ti, integralTime_s: tauI, derivativeTime_s: tauD };
}

/** Parallel → series (via ideal); throws `controller.noSeriesForm` when Ti < 4·Td. */
export function parallelToSeries(gains: PidGains): SeriesPid {
  return idealToSeries(parallelToIdeal(gains));
}

/** Series → parallel (via ideal): kp = Kc·(τI + τD)/τI, ki = Kc/τI, kd = Kc·τD. */
export function seriesToParallel(series: SeriesPid): PidGains {
  return idealToParallel(seriesToIdeal(series));
}

function requireFinite(gains: PidGains): void {
  for (const name of ['kp', 'ki', 'kd'] as const) {
    if (!Number.isFinite(gains[name])) {
      throw new SpeedbandError('controller.invalidGains', `${name} is ${gains[name]} — expected a finite number`, { details: { ...gains } });
    }
  }
}

/** kp, ki, kd of mixed signs give a negative integral or derivative time: not a PID any form describes. */
function requireOneSign(gains: PidGains): void {
  const sign = Math.sign(gains.kp);
  if ((gains.ki !== 0 && Math.sign(gains.ki) !== sign) || (gains.kd !== 0 && Math.sign(gains.kd) !== sign)) {
    throw new SpeedbandError(
      'controller.mixedSigns',
      `PID gains of mixed signs (kp = ${gains.kp}, ki = ${gains.ki}, kd = ${gains.kd}) give a negative integral or derivative time — expected kp, ki and kd all of one sign (all negative for a negative plant gain)`,
      { details: { ...gains } },
    );
  }
}

function requireTimes(form: IdealPid | SeriesPid, name: string): void {
  const ti = form.integralTime_s;
  if (
    !Number.isFinite(form.gain) ||
    (ti !== null && !(Number.isFinite(ti) && ti > 0)) ||
    !(Number.isFinite(form.derivativeTime_s) && form.derivativeTime_s >= 0)
  ) {
    throw new SpeedbandError(
      'controller.invalidGains',
      `${name} PID with gain ${form.gain}, integral time ${ti} s, derivative time ${form.derivativeTime_s} s — expected a finite gain, an integral time > 0 s (or none) and a derivative time ≥ 0 s`,
      { details: { gain: form.gain, integralTime_s: ti, derivativeTime_s: form.derivativeTime_s } },
    );
  }
}
