/**
 * The continuous PID the loop analysis uses: parallel form with a first-order
 * filtered derivative (docs/domain.md §4, §5b; Åström & Hägglund 2006, §3.3):
 *   C(s) = kp + ki/s + kd·s/(1 + Tf·s),   Tf = Td/N,  Td = kd/kp.
 */
import { SpeedbandError } from '../core/errors.js';
import { transferFunction } from '../lti/transfer-function.js';
import type { TransferFunction } from '../lti/types.js';
import type { PidGains } from './types.js';

/**
 * Derivative filter time constant Tf (s) = Td/N with Td = kd/kp (from Td, not from
 * kd: docs/domain.md §5b). N = Infinity or kd = 0 gives Tf = 0 (no filter).
 * Fallback when kp = 0 (an I+D controller has no Td): Tf = √(kd/ki)/N, the time
 * scale of its zeros s = ±j·√(ki/kd). A pure derivative (kp = ki = 0) has no time
 * scale: throws `controller.derivativeFilterUndefined`. N must be > 0
 * (`controller.invalidSettings`); kd of the other sign than kp (or ki) gives a
 * negative Tf and throws `controller.mixedSigns`.
 */
export function derivativeFilterTime_s(gains: PidGains, derivativeFilter: number): number {
  if (!(derivativeFilter > 0)) {
    throw new SpeedbandError(
      'controller.invalidSettings',
      `derivative filter factor N is ${derivativeFilter} — expected N > 0 (common practice about 10; Infinity means no filter)`,
      { details: { derivativeFilter } },
    );
  }
  const { kp, ki, kd } = gains;
  if (kd === 0 || derivativeFilter === Number.POSITIVE_INFINITY) return 0;
  let ratio: number;
  if (kp !== 0) ratio = kd / kp;
  else if (ki !== 0) ratio = Math.sqrt(kd / ki);
  else {
    throw new SpeedbandError(
      'controller.derivativeFilterUndefined',
      `a pure derivative controller (kp = 0, ki = 0, kd = ${kd}) has no derivative time to set the filter Tf = Td/N — give kp ≠ 0 or set derivativeFilter to Infinity`,
      { details: { ...gains } },
    );
  }
  if (!(ratio > 0)) {
    throw new SpeedbandError(
      'controller.mixedSigns',
      `kd = ${kd} has the other sign than ${kp !== 0 ? `kp = ${kp}` : `ki = ${ki}`}, which gives a negative derivative time — expected kp, ki and kd all of one sign`,
      { details: { ...gains } },
    );
  }
  return ratio / derivativeFilter;
}

/**
 * C(s) = kp + ki/s + kd·s/(1 + Tf·s) as one transfer function (no delay), with Tf
 * from derivativeFilterTime_s. Over the common denominator s·(1 + Tf·s):
 *   numerator (kp·Tf + kd)·s² + (kp + ki·Tf)·s + ki,  denominator Tf·s² + s.
 * Without integral action (ki = 0) the factor s is left out: (kp·Tf + kd)·s + kp over
 * Tf·s + 1, so no spurious pole at 0 appears. N = Infinity gives the unfiltered
 * (improper when kd ≠ 0) kd·s² + kp·s + ki over s — docs/domain.md §5b: analyse the
 * filtered derivative the firmware really runs.
 */
export function pidTransferFunction(gains: PidGains, derivativeFilter: number): TransferFunction {
  for (const name of ['kp', 'ki', 'kd'] as const) {
    if (!Number.isFinite(gains[name])) {
      throw new SpeedbandError('controller.invalidGains', `${name} is ${gains[name]} — expected a finite number`, { details: { ...gains } });
    }
  }
  const { kp, ki, kd } = gains;
  const tf = derivativeFilterTime_s(gains, derivativeFilter);
  if (ki === 0) return transferFunction([kp * tf + kd, kp], [tf, 1]);
  return transferFunction([kp * tf + kd, kp + ki * tf, ki], [tf, 1, 0]);
}
