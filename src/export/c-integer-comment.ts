/**
 * The fixed-point header's words on its arithmetic: the Q format of every column, the scales of the step
 * function's signals, the largest inputs it supports and its terms' ranges (integer-step-plan.ts), and the
 * quantisation error bound of its command against the floating-point step (fixed-point-bound.ts), stated with
 * this schedule's numbers.
 */
import type { ScheduleFile } from '../schedule/schedule-types.js';
import { formatName, type QuantisedTable } from './fixed-point.js';
import type { LookupField } from './c-lookup.js';
import {
  ACCUMULATOR_FRACTIONAL_BITS,
  ACCUMULATOR_LIMIT_RAD,
  COMPLEMENT_FRACTIONAL_BITS,
  SIGNAL_FRACTIONAL_BITS,
  SIGNAL_LIMIT,
  type IntegerStepPlan,
} from './integer-step-plan.js';

const shown = (x: number): string => x.toPrecision(3);

/** Comment lines (before commentSafe) describing the integer arithmetic of a fixed-point header. */
export function integerArithmeticLines(input: {
  readonly schedule: Pick<ScheduleFile, 'units'>;
  readonly quantisation: QuantisedTable;
  readonly plan: IntegerStepPlan;
  readonly prefix: string;
}): string[] {
  const { schedule, quantisation, plan, prefix } = input;
  const { units } = schedule;
  const S = SIGNAL_FRACTIONAL_BITS;
  const A = ACCUMULATOR_FRACTIONAL_BITS;
  const formats = { ...quantisation.formats, ...quantisation.extraFormats };
  const delta = (name: LookupField): string => shown(quantisation.lookupErrorBounds[name] ?? Number.NaN);
  const r = plan.ranges;
  const backCalculation = plan.antiWindup === 'back-calculation';
  return [
    'Arithmetic: integers only (no floating point). Speed in units of 2^-16 m/s. Each looked-up value in its Q format (value = integer / 2^F):',
    `  kp ${formatName(quantisation.formats.kp)}, ki ${formatName(quantisation.formats.ki)}, kd ${formatName(quantisation.formats.kd)}, ` +
      `set-point weights b ${formatName(formats.setpoint_weight_p!)} and c ${formatName(formats.setpoint_weight_d!)}, feed-forward ${formatName(formats.feed_forward!)}, lead time ${formatName(formats.feed_forward_lead_time_s!)};`,
    `  largest error against the exact lookup on 1,001 speeds: kp ${shown(quantisation.errors.kp.maxAbsoluteInterpolated)}, ki ${shown(quantisation.errors.ki.maxAbsoluteInterpolated)}, kd ${shown(quantisation.errors.kd.maxAbsoluteInterpolated)};`,
    `  bound at any speed (rounding, interpolation, speed rounding): kp ${delta('kp')}, ki ${delta('ki')}, kd ${delta('kd')}, b ${delta('setpoint_weight_p')}, c ${delta('setpoint_weight_d')}, kff ${delta('feed_forward')}.`,
    `Controller step function ${prefix}_step, integers only. Signals, each an int32 = round(x * 2^${S}): reference and measurement in 2^-${S} ${units.error},`,
    `  the feed-forward input in 2^-${S} ${units.feedForwardInput}, the command in 2^-${S} rad. Every int32 input is supported (+-${Math.round(SIGNAL_LIMIT)} units).`,
    `  Inside: the terms, the integral and the command in int64 units of 2^-${A} rad; each product exact in 128 bits, rounded once (half away from zero);`,
    `  each quotient rounded half up; the square root floored. Td = kd/kp in 2^-${plan.derivativeTimeBits} s, q = 1 - p of the derivative filter in 2^-${COMPLEMENT_FRACTIONAL_BITS},`,
    `  kd/T and the filter gain g in 2^-${plan.derivativeGainBits}, ki*T in 2^-${plan.integralGainBits}${backCalculation ? `, T/Tt in 2^-${plan.trackingBits}` : ''}.`,
    `  No overflow for any int32 inputs (checked at export; a schedule beyond it is refused): largest feed-forward term ${shown(r.feedForward)} rad,`,
    `  proportional ${shown(r.proportional)} rad, derivative ${shown(r.derivative)} rad, integral increment ${shown(r.increment)} rad, unlimited command ${shown(r.unlimited)} rad`,
    `  (the accumulator holds +-2^${Math.log2(ACCUMULATOR_LIMIT_RAD)} rad).`,
    `Quantisation error bound: on the same inputs the command differs from the floating-point header's step (exact lookup)`,
    `  by at most B[k] + 2^-${S + 1} rad at sample k, B the radius of an interval evaluation of this step around the floating-point one, operation by operation:`,
    `  inputs within 2^-${S + 1} of their units; looked-up values within the bounds above; each product and quotient within half a unit of its format`,
    `  (2^-${A + 1} rad in the accumulator); the square root within one unit. Per sample, to first order in the errors (d = the bound of each quantity):`,
    `    dF = dkff*|w| + |kff|*2^-${S + 1} + 2^-${A + 1};  dP = dkp*|b*r - y| + |kp|*(db*|r| + (|b| + 2)*2^-${S + 1}) + 2^-${A + 1};`,
    `    dD[k] = |p|*dD[k-1] + dp*|D[k-1]| + dg*|d[k] - d[k-1]| + |g|*2*(dc*|r| + 3*2^-${S + 1}) + 2^-${A}   (the derivative filter forgets old errors);`,
    `    dI[k] = dI[k-1] + T*(dki*|e| + 2*|ki|*2^-${S + 1}) + 2^-${A + 1}${backCalculation ? ' + d(T/Tt)*|u - v| + (T/Tt)*d(u - v)' : ''}   (the integral adds them up);`,
    '    du[k] <= dF + dP + dI + dD; the clamps add nothing (1-Lipschitz); both commands at the limit are equal.',
    ...(backCalculation
      ? []
      : [
          '  Where the unlimited command is within the bound of the limit, conditional integration may decide otherwise: the bound takes both outcomes',
          '  (the integrators may then stand one sample apart, one increment T*ki*e).',
        ]),
    '  B for a recorded run: fixedPointCommandBound (speedband/internal/export/fixed-point-bound.js); a test holds the compiled step to it on simulated runs.',
  ];
}
