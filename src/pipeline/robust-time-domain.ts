/**
 * The time-domain figures of a breakpoint over the variation set (src/robust/time-domain.ts) as the firmware runs
 * it: on each vehicle simulated, the exact sampled closed loop (src/performance) with the breakpoint's own gains,
 * set-point weights and feed-forward — the feed-forward gain and lead time the schedule holds, not those the
 * changed vehicle would be given — and the vehicle's steering limits. The build, `check`, `reverify` and a
 * fastest-passing search aimed at the worst case all call it.
 */
import { atSpeed, type OverSpeed } from '../core/by-speed.js';
import type { AntiWindup } from '../controller/firmware-step.js';
import type { PidGains } from '../controller/types.js';
import { breakpointPerformance, type BreakpointPerformance, type SetpointWeights } from '../performance/breakpoint-performance.js';
import { performanceLoopAt } from '../performance/loop-at-speed.js';
import type { TimeDomainLimits } from '../performance/types.js';
import { worstTimeDomainOverSet } from '../robust/time-domain.js';
import type { RobustMargins, RobustTimeDomain } from '../robust/types.js';
import type { BreakpointExtras } from '../schedule/schedule-file.js';
import { operatingPointWith } from '../robust/variation-set.js';
import { analyseOperatingPoint } from './loop-analysis.js';
import type { RobustContext } from './robust-analysis.js';

/** What a breakpoint holds besides its gains: set-point weights and feed-forward. */
export interface BreakpointControl {
  readonly speed_mps: number;
  readonly gains: PidGains;
  readonly setpointWeights: SetpointWeights;
  readonly feedForward: number;
  readonly feedForwardLeadTime_s: number;
}

/** A breakpoint's gains, set-point weights and feed-forward, as the time-domain figures over the set take them. */
export function breakpointControl(
  speed_mps: number,
  gains: PidGains,
  extras: Pick<BreakpointExtras, 'setpointWeightProportional' | 'setpointWeightDerivative' | 'feedForward' | 'feedForwardLeadTime_s'>,
): BreakpointControl {
  return {
    speed_mps,
    gains: { kp: gains.kp, ki: gains.ki, kd: gains.kd },
    setpointWeights: { proportional: extras.setpointWeightProportional, derivative: extras.setpointWeightDerivative },
    feedForward: extras.feedForward,
    feedForwardLeadTime_s: extras.feedForwardLeadTime_s,
  };
}

/** The time-domain limits and what the simulations need of the vehicle and the firmware. */
export interface TimeDomainSettings {
  /** Numbers or tables over speed (src/schedule/acceptance-limits.ts), read at each breakpoint's speed. */
  readonly limits: OverSpeed<TimeDomainLimits>;
  readonly vehicleLimits: { readonly maxSteerAngle_rad: number; readonly maxSteerRate_radps: number };
  readonly antiWindup: AntiWindup;
}

/** One vehicle of the set under a breakpoint's control (vehiclePerformance). */
export interface VehiclePerformanceInput {
  /** The set's changes that make the vehicle, one per dimension, in order. */
  readonly values: readonly number[];
  /** The speed, gains, set-point weights and feed-forward. */
  readonly control: BreakpointControl;
  /** The model, loop, controller and the set of variations. */
  readonly context: RobustContext;
  /** The time-domain limits and the vehicle's and firmware's settings. */
  readonly settings: TimeDomainSettings;
  /** Choose the set-point weights on this vehicle for the overshoot limit instead of taking those of `control`; default false. */
  readonly chooseWeights?: boolean;
}

/**
 * The time-domain figures of one vehicle of the set (the changes `values`, one per dimension) under `control`, or
 * null when its loop is not stable. `chooseWeights`: the set-point weights are chosen on that vehicle for the
 * overshoot limit (breakpoint-performance.ts) instead of taken from `control`.
 */
export function vehiclePerformance(input: VehiclePerformanceInput): BreakpointPerformance | null {
  const { values, control, context, settings, chooseWeights = false } = input;
  const { speed_mps, gains } = control;
  const vehicle = operatingPointWith(context.model.modelAt(speed_mps), context.set, values);
  const margins = analyseOperatingPoint({ operatingPoint: vehicle, loop: context.loop, controller: context.controller, speed_mps, gains });
  if (!margins.stable || margins.verdict !== 'stable') return null;
  const loopHere = performanceLoopAt(vehicle, context.loop, speed_mps, context.controller);
  return breakpointPerformance({
    loop: { ...loopHere, feedForward: { ...loopHere.feedForward, gain: control.feedForward, leadTime_s: control.feedForwardLeadTime_s } },
    gains,
    limits: atSpeed(settings.limits, speed_mps),
    vehicleLimits: settings.vehicleLimits,
    slowestTimeConstant_s: margins.analysis?.sampledDataSlowestTimeConstant_s ?? null,
    ...(chooseWeights ? {} : { setpointWeights: control.setpointWeights }),
    antiWindup: settings.antiWindup,
  });
}

/**
 * The worst time-domain figures of `control` over the set, from the robust point of its speed and gains (its
 * worst margins name the combinations simulated besides the nominal vehicle and the corners); null when the
 * set holds a loop that is not stable there (the margins fail it already).
 */
export function worstTimeDomainAt(
  point: RobustMargins,
  control: BreakpointControl,
  context: RobustContext,
  settings: TimeDomainSettings,
): RobustTimeDomain | null {
  if (point.instability !== null) return null;
  return worstTimeDomainOverSet({
    set: context.set,
    combinations: Object.values(point.worst).flatMap((worst) => (worst === null ? [] : [worst.combination])),
    limits: atSpeed(settings.limits, control.speed_mps),
    kind: context.loop.kind,
    figuresAt: (values) => vehiclePerformance({ values, control, context, settings })?.figures ?? null,
  });
}
