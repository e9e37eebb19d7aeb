/**
 * The quantisation error bound of the fixed-point header's command: how far the integer step function
 * (c-integer-controller.ts) can be from the floating-point controller equation (firmwareStep, the exact schedule
 * lookup) on the same run of inputs, sample by sample. A ball evaluation (error-ball.ts) of the integer step around
 * the floating-point one, each operation bounded from what the integer arithmetic does:
 * - inputs rounded to 2^−25 of their units; the integer lookup's values within its derived bound δ per column
 *   (lookup-error-bound.ts: gain quantisation, interpolation and speed rounding);
 * - each product rounded to half a unit of its format (2^−33 rad in the accumulator, 2^−25 in signal units), each
 *   quotient likewise, the square root floored (one unit); Td = |kd|/|kp|, q = 1 − p, g = (kd/T)·q and T/Tt bounded by
 *   their monotone formulas at the ends of the gains' balls;
 * - the clamps (integrator, command) are 1-Lipschitz in the value and the limits: they add nothing;
 * - where conditional integration or the back-calculation test can decide otherwise (the floating-point value within
 *   the radius of the limit or of 0), the ball holds both outcomes: a flip costs one increment, and is bounded.
 * The memory carries the radii: the integral's adds up (T·δki·|e| + 2·|ki|·T·2^−25 + 2^−33 per sample), the
 * derivative filter's shrinks by |p| per sample. Output rounding 2^−25 rad.
 */
import { derivativeFilterTime_s } from '../controller/pid.js';
import { firmwareStep, initialFirmwareState, trackingTime_s, type FirmwareState } from '../controller/firmware-step.js';
import { SpeedbandError } from '../core/errors.js';
import { scheduleFirmware } from '../schedule/schedule-lookup.js';
import type { ScheduleFile } from '../schedule/schedule-types.js';
import type { LookupField } from './c-lookup.js';
import { around, ball, clampBall, fromRange, high, low, minus, plus, times, widen, type Ball } from './error-ball.js';
import { backCalculationSum, conditionalIntegration, trackingRange } from './integral-bound.js';
import {
  ACCUMULATOR_FRACTIONAL_BITS,
  COMPLEMENT_FRACTIONAL_BITS,
  SIGNAL_FRACTIONAL_BITS,
  SIGNAL_LIMIT,
  type IntegerConstant,
  type IntegerStepPlan,
} from './integer-step-plan.js';

/** One run of inputs from a controller at rest: speed, m/s; reference, measurement and feed-forward input in their units. */
export interface BoundRun {
  readonly speed_mps: ArrayLike<number>;
  readonly reference: ArrayLike<number>;
  readonly measurement: ArrayLike<number>;
  readonly feedForwardInput: ArrayLike<number>;
}

/** Per sample: the floating-point controller's command (rad) and the bound on the integer command's distance from it (rad). */
export interface CommandBound {
  readonly command: Float64Array;
  readonly bound: Float64Array;
  /** 1 at a sample where conditional integration may decide otherwise in the integer step (the bound holds both outcomes). */
  readonly undecided: Uint8Array;
}

const ROUND_ACCUMULATOR = 2 ** -(ACCUMULATOR_FRACTIONAL_BITS + 1);
const ROUND_SIGNAL = 2 ** -(SIGNAL_FRACTIONAL_BITS + 1);
const value = (constant: IntegerConstant): number => Number(constant.value) / 2 ** constant.fractionalBits;
const half = (bits: number): number => 2 ** -(bits + 1);

/** The bound along one run (see the file comment). `lookupErrorBounds`: QuantisedTable.lookupErrorBounds of the header's table. */
export function fixedPointCommandBound(
  schedule: Pick<ScheduleFile, 'breakpoints' | 'interpolation' | 'controller'>,
  plan: IntegerStepPlan,
  lookupErrorBounds: Readonly<Partial<Record<LookupField, number>>>,
  run: BoundRun,
): CommandBound {
  const { settings, at } = scheduleFirmware(schedule);
  const delta = (name: LookupField): number => {
    const bound = lookupErrorBounds[name];
    if (bound === undefined) throw new SpeedbandError('internal', `no lookup error bound for ${name}`);
    return bound;
  };
  const t = settings.sampleTime_s;
  const tustin = settings.discretisation === 'tustin';
  const backCalculation = settings.antiWindup === 'back-calculation';
  const f = plan.fractionalBits;
  const sampleTime = value(plan.sampleTime);
  const filterTime = value(plan.filterTime);
  const inverseSampleTime = value(plan.inverseSampleTime);
  const clampLimit = ball(
    settings.integratorClamp_rad,
    Math.abs(Number(plan.integratorClamp) / 2 ** ACCUMULATOR_FRACTIONAL_BITS - settings.integratorClamp_rad),
  );
  const commandLimit = ball(settings.commandLimit_rad, Math.abs(Number(plan.commandLimit) / 2 ** ACCUMULATOR_FRACTIONAL_BITS - settings.commandLimit_rad));
  const n = run.speed_mps.length;
  const command = new Float64Array(n);
  const bound = new Float64Array(n);
  let state: FirmwareState = initialFirmwareState();
  let integral = ball(0);
  let derivative = ball(0);
  let previousDerivativeInput = ball(0);
  let previousIntegrand = ball(0);
  let previousSaturation = ball(0);
  let previousOthers = ball(0);
  const undecided = new Uint8Array(run.speed_mps.length);
  const commandLimitValue = Number(plan.commandLimit) / 2 ** ACCUMULATOR_FRACTIONAL_BITS;
  const input = (x: number): Ball => {
    if (!(Math.abs(x) <= SIGNAL_LIMIT)) throw new SpeedbandError('internal', `input ${x} beyond the int32 signal range ±${SIGNAL_LIMIT}`);
    return ball(x, ROUND_SIGNAL);
  };
  for (let k = 0; k < n; k += 1) {
    const { gains } = at(run.speed_mps[k]);
    const [r, y, w] = [input(run.reference[k]), input(run.measurement[k]), input(run.feedForwardInput[k])];
    const g = (name: LookupField, x: number): Ball => ball(x, delta(name));
    const [kp, ki, kd] = [g('kp', gains.kp), g('ki', gains.ki), g('kd', gains.kd)];
    // The floating-point step, operation for operation as firmwareStep (checked against it below).
    const tf = derivativeFilterTime_s(gains, settings.derivativeFilter);
    const p = tustin ? (2 * tf - t) / (2 * tf + t) : tf / (tf + t);
    const gain = tustin ? (2 * gains.kd) / (2 * tf + t) : gains.kd / (tf + t);
    const exact = firmwareStep(gains, settings, state, { reference: r.m, measurement: y.m, feedForwardInput: w.m });

    const feedForward = around(widen(times(g('feed_forward', gains.feedForward), w), ROUND_ACCUMULATOR), gains.feedForward * w.m);
    const weighted = minus(widen(times(g('setpoint_weight_p', gains.setpointWeightProportional), r), ROUND_SIGNAL), y);
    const proportional = around(widen(times(kp, weighted), ROUND_ACCUMULATOR), gains.kp * (gains.setpointWeightProportional * r.m - y.m));
    const derivativeInput = around(
      minus(widen(times(g('setpoint_weight_d', gains.setpointWeightDerivative), r), ROUND_SIGNAL), y),
      gains.setpointWeightDerivative * r.m - y.m,
    );
    const difference =
      state.previousDerivativeInput === null
        ? ball(0)
        : around(minus(derivativeInput, previousDerivativeInput), derivativeInput.m - state.previousDerivativeInput);
    const integralGain = widen(times(ki, ball(sampleTime)), half(plan.integralGainBits));
    const integrand = around(widen(times(integralGain, minus(r, y)), ROUND_ACCUMULATOR), t * (gains.ki * (r.m - y.m)));

    // Td = |kd|/|kp| (0 when kd = 0), q = 1 − p, g = (kd/T)·q: monotone in Td, bounded at the ends.
    const kdLow = Math.max(0, Math.abs(kd.m) - kd.r);
    const kpLow = Math.abs(kp.m) - kp.r;
    const tdHigh = Math.min(plan.largestDerivativeTime, kpLow > 0 ? (Math.abs(kd.m) + kd.r) / kpLow : Number.POSITIVE_INFINITY) + half(plan.derivativeTimeBits);
    const tdLow = Math.max(0, kdLow / (Math.abs(kp.m) + kp.r) - half(plan.derivativeTimeBits));
    const complementOf = (td: number): number => (tustin ? (2 * filterTime) / (filterTime + 2 * td) : filterTime / (filterTime + td));
    const complement = fromRange(1 - p, complementOf(tdHigh) - half(COMPLEMENT_FRACTIONAL_BITS), complementOf(tdLow) + half(COMPLEMENT_FRACTIONAL_BITS));
    const pole = fromRange(p, 1 - high(complement), 1 - low(complement));
    const filterGain = around(
      widen(times(widen(times(kd, ball(inverseSampleTime)), half(plan.derivativeGainBits)), complement), half(plan.derivativeGainBits)),
      gain,
    );
    const derivativeNow = around(
      plus(widen(times(pole, derivative), ROUND_ACCUMULATOR), widen(times(filterGain, difference), ROUND_ACCUMULATOR)),
      exact.state.derivative,
    );

    const part = tustin ? widen(times(plus(integrand, previousIntegrand), ball(0.5)), ROUND_ACCUMULATOR) : integrand;
    let incrementExact = tustin ? (t / 2) * (gains.ki * (r.m - y.m) + state.previousIntegrand) : t * (gains.ki * (r.m - y.m));
    const upper = minus(clampLimit, feedForward);
    const lower = minus(ball(-clampLimit.m, clampLimit.r), feedForward);
    const clampIntegral = (x: number): number => (x > upper.m ? upper.m : x < lower.m ? lower.m : x);
    let beforeClamp: Ball;
    if (backCalculation) {
      const termExact = state.previousSaturation !== 0 && gains.ki !== 0 ? (t * state.previousSaturation) / trackingTime_s(gains) : 0;
      incrementExact += termExact;
      const [lowest, highest] = trackingRange(kp, kd, { plan, sampleTime, kdUnit: 2 ** -f.kd, integralGain });
      beforeClamp = backCalculationSum({
        integral,
        previousOthers,
        previousSaturation,
        part,
        tracking: [low(ki) <= 0 && high(ki) >= 0 ? 0 : lowest, highest],
        limit: commandLimitValue,
        termExact,
        m: state.integral + incrementExact,
      });
    } else {
      beforeClamp = around(plus(integral, part), state.integral + incrementExact);
    }
    const trial = clampBall(beforeClamp, lower, upper, clampIntegral(state.integral + incrementExact));
    const others = plus(plus(feedForward, proportional), derivativeNow);
    const terms = (i: Ball, m: number): Ball => around(plus(plus(plus(feedForward, proportional), i), derivativeNow), m);
    let integralNow = trial;
    let integralExpected = trial.m;
    if (!backCalculation) {
      const v = terms(trial, feedForward.m + proportional.m + trial.m + derivativeNow.m);
      if (Math.abs(v.m) > settings.commandLimit_rad && Math.sign(incrementExact) === Math.sign(v.m)) integralExpected = clampIntegral(state.integral);
      const dropped = clampBall(integral, lower, upper, clampIntegral(state.integral));
      const increment = around(part, incrementExact);
      const outcome = conditionalIntegration({ trial, dropped, increment, others, unlimited: v, limit: commandLimitValue, m: exact.state.integral });
      integralNow = outcome.integral;
      if (outcome.undecided) undecided[k] = 1;
    }
    const unlimited = terms(integralNow, exact.unlimited);
    const commandNow = clampBall(unlimited, ball(-commandLimit.m, commandLimit.r), commandLimit, exact.command);
    // The midpoints are firmwareStep's own values: its integral decision recomputed here must be the same.
    if (integralExpected !== exact.state.integral) throw new SpeedbandError('internal', 'the bound lost track of firmwareStep');
    command[k] = exact.command;
    bound[k] = commandNow.r + ROUND_SIGNAL;
    state = exact.state;
    integral = integralNow;
    derivative = derivativeNow;
    previousDerivativeInput = derivativeInput;
    previousIntegrand = integrand;
    previousSaturation = ball(exact.state.previousSaturation, unlimited.r + commandLimit.r);
    previousOthers = others;
  }
  return { command, bound, undecided };
}
