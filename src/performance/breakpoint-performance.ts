/**
 * The time-domain figures at one breakpoint, from the exact sampled linear closed loop
 * (closed-loop-simulation.ts, THE controller equation of src/controller/firmware-step.ts), and the
 * set-point weights chosen there: the largest proportional weight b in [0, 1] whose reference step
 * overshoots at most the limit — the linear step, and for heading and yaw-rate loops also a large step
 * through the actuator's angle and rate limits (limited-loop-simulation.ts) — (the derivative weight c is 0:
 * no derivative kick). Set-point weights
 * change only the response to the reference; the loop, its margins and every disturbance response are
 * those of the one-degree-of-freedom controller (Åström & Hägglund 2006, §3.4). The response to a
 * reference step is linear in b, so y(b) = y(0) + b·(y(1) − y(0)) exactly and b is found by bisection on it.
 *
 * Scenarios (src/performance/defaults.ts): a unit reference step (yaw rate, heading, or for the path loop a
 * commanded lateral offset from the path); a constant steering misalignment at the road wheels; a lateral
 * force step at the centre of gravity (single-track model only); path loop: a 3.5 m lane change over
 * max(4 s of travel, 20 m) and a curve entry, both as planned path with the feed-forward on.
 */
import type { PidGains } from '../controller/types.js';
import type { AntiWindup, FirmwareGains, FirmwareSettings } from '../controller/firmware-step.js';
import { simulateLimitedLoop } from './limited-loop-simulation.js';
import { stepResponse } from '../lti/time-response.js';
import { simulateClosedLoop } from './closed-loop-simulation.js';
import { SCENARIO_DEFAULTS } from './defaults.js';
import { actuatorRoom } from './actuator-room.js';
import { overshoot_pct, peakMagnitude, settlingTime_s } from './figures.js';
import { judgeTimeDomain } from './time-domain-limits.js';
import type { PerformanceLoop } from './loop-at-speed.js';
import { curveEntryPath, laneChangePath, sampledPath } from './scenarios.js';
import type { BreakpointTraces, DisturbanceFigures, TimeDomainFigures, TimeDomainLimits } from './types.js';

export interface SetpointWeights {
  /** b: the proportional term acts on b·r − y. */
  readonly proportional: number;
  /** c: the derivative term acts on c·r − y. */
  readonly derivative: number;
}

/** Input of breakpointPerformance: the loop at the speed, gains, controller, limits of the actuator and of the plan. */
export interface BreakpointPerformanceInput {
  readonly loop: PerformanceLoop;
  readonly gains: PidGains;
  readonly limits: TimeDomainLimits;
  readonly vehicleLimits: { readonly maxSteerAngle_rad: number; readonly maxSteerRate_radps: number };
  /** −Ts/ln|z| of the slowest closed-loop pole, s (from the loop analysis); sets how long to simulate. */
  readonly slowestTimeConstant_s: number | null;
  /** Given weights (a schedule being re-verified); absent: chosen for the overshoot limit. */
  readonly setpointWeights?: SetpointWeights;
  /** The firmware's anti-windup, for the step through the actuator's limits. */
  readonly antiWindup: AntiWindup;
  /** Keep the simulated responses behind the figures (`traces`), e.g. to draw them. */
  readonly keepTraces?: boolean;
}

/** The figures breakpointPerformance computes and the time-domain limits they break. */
export interface BreakpointPerformance {
  readonly setpointWeights: SetpointWeights;
  readonly figures: TimeDomainFigures;
  /** The limits broken, in words (empty: within every limit). */
  readonly failures: readonly string[];
  /** The responses behind the figures (only with `keepTraces`). */
  readonly traces?: BreakpointTraces;
}

/** Steps of the bisection on b (2^−14 of the unit interval). */
const WEIGHT_BISECTION_STEPS = 14;
/** Steps of the bisection on b for the step through the actuator's limits (each a nonlinear simulation). */
const LIMITED_WEIGHT_STEPS = 6;

const LINEAR: Omit<FirmwareSettings, keyof import('../controller/types.js').ControllerSettings> = {
  antiWindup: 'conditional-integration',
  commandLimit_rad: Number.POSITIVE_INFINITY,
  integratorClamp_rad: Number.POSITIVE_INFINITY,
};

/** The time-domain figures of the exact sampled closed loop at one breakpoint: set-point weights, reference step, disturbances, lane change and curve entry, a step through the actuator limits. */
export function breakpointPerformance(input: BreakpointPerformanceInput): BreakpointPerformance {
  const { loop, gains, limits } = input;
  const ts = loop.controller.sampleTime_s;
  const settings: FirmwareSettings = { ...loop.controller, ...LINEAR };
  const d = SCENARIO_DEFAULTS;
  const slow = input.slowestTimeConstant_s ?? d.shortestHorizon_s / d.horizonTimeConstants;
  const settle_s = Math.min(d.longestHorizon_s, Math.max(d.shortestHorizon_s, d.horizonTimeConstants * slow));
  const samples = (seconds: number): number => Math.max(2, Math.ceil(seconds / ts) + 1);
  const firmware = (b: number, c: number, feedForward: number): FirmwareGains => ({
    ...gains,
    setpointWeightProportional: b,
    setpointWeightDerivative: c,
    feedForward,
  });

  // Reference step: y(b) = y(0) + b·(y(1) − y(0)); c = 0.
  const stepCount = samples(settle_s);
  const reference = new Float64Array(stepCount).fill(1);
  const atZero = simulateClosedLoop({ plant: loop.plant, gains: firmware(0, 0, 0), settings, reference });
  const atOne = simulateClosedLoop({ plant: loop.plant, gains: firmware(1, 0, 0), settings, reference });
  const mix = (zero: Float64Array, one: Float64Array, b: number): Float64Array => zero.map((value, k) => value + b * (one[k] - value));
  let weights: SetpointWeights;
  if (input.setpointWeights !== undefined) {
    weights = input.setpointWeights;
  } else if (overshoot_pct(atOne.output) <= limits.maximumOvershoot_pct) {
    weights = { proportional: 1, derivative: 0 };
  } else {
    let low = 0;
    let high = 1;
    for (let i = 0; i < WEIGHT_BISECTION_STEPS; i++) {
      const middle = (low + high) / 2;
      if (overshoot_pct(mix(atZero.output, atOne.output, middle)) <= limits.maximumOvershoot_pct) low = middle;
      else high = middle;
    }
    weights = { proportional: low, derivative: 0 };
  }
  const step =
    weights.derivative === 0
      ? { output: mix(atZero.output, atOne.output, weights.proportional), command: mix(atZero.command, atOne.command, weights.proportional) }
      : simulateClosedLoop({ plant: loop.plant, gains: firmware(weights.proportional, weights.derivative, 0), settings, reference });
  const settling = settlingTime_s({ signal: step.output, target: 1, band: d.settlingBand, sampleTime_s: ts });
  let stepCommand = step.command;
  let stepOutput = step.output;
  let referenceStep: TimeDomainFigures['referenceStep'] = {
    overshoot_pct: overshoot_pct(step.output),
    settlingTime_s: settling,
    settlingDistance_m: settling === null ? null : settling * loop.speed_mps,
  };

  // Disturbances: the loop output's response outside the loop, added to the measurement (exact by superposition).
  const disturbance = (
    response: import('../lti/types.js').TransferFunction,
    size: number,
  ): { figures: DisturbanceFigures; run: { error: Float64Array; command: Float64Array } } => {
    const count = samples(settle_s);
    const time = Float64Array.from({ length: count }, (_, k) => k * ts);
    const open = stepResponse(response, time).output;
    const outputDisturbance = Float64Array.from(open, (y) => size * y);
    const run = simulateClosedLoop({
      plant: loop.plant,
      gains: firmware(weights.proportional, weights.derivative, 0),
      settings,
      reference: new Float64Array(count),
      outputDisturbance,
    });
    const peakError = peakMagnitude(run.error);
    return {
      figures: {
        size,
        peakError,
        recoveryTime_s: peakError === 0 ? 0 : settlingTime_s({ signal: run.error, target: 0, band: d.recoveryBand * peakError, sampleTime_s: ts }),
      },
      run,
    };
  };
  const misalignmentRun = disturbance(loop.misalignment, d.steeringMisalignment_rad);
  const lateralForceRun =
    loop.lateralForce === null || loop.mass_kg === null ? null : disturbance(loop.lateralForce, d.lateralForcePerWeight * loop.mass_kg * d.gravity_mps2);
  const steeringMisalignment = misalignmentRun.figures;
  const lateralForce = lateralForceRun?.figures ?? null;

  let laneChange: TimeDomainFigures['laneChange'] = null;
  let curveEntry: TimeDomainFigures['curveEntry'] = null;
  let laneChangeCommand: Float64Array | null = null;
  let laneRunKept: BreakpointTraces['laneChange'] = null;
  let curveRunKept: BreakpointTraces['curveEntry'] = null;
  if (loop.kind === 'path') {
    const v = loop.speed_mps;
    const ff = loop.feedForward;
    const full = firmware(weights.proportional, weights.derivative, ff.gain);
    const length = Math.max(d.laneChangeDuration_s * v, d.laneChangeShortestLength_m);
    const laneCount = samples(d.leadIn_s + length / v + settle_s);
    const lane = sampledPath({
      shape: laneChangePath(d.laneChangeSize_m, length),
      speed_mps: v,
      sampleTime_s: ts,
      leadIn_s: d.leadIn_s,
      feedForwardLead_s: ff.leadTime_s,
      count: laneCount,
    });
    const laneRun = simulateClosedLoop({
      plant: loop.plant,
      gains: full,
      settings,
      reference: new Float64Array(laneCount),
      outputDisturbance: lane.disturbance,
      feedForwardInput: lane.curvature,
    });
    laneChange = { size_m: d.laneChangeSize_m, length_m: length, peakError_m: peakMagnitude(laneRun.error) };
    laneChangeCommand = laneRun.command;
    laneRunKept = laneRun;
    const curvature = Math.min(d.curveLateralAcceleration_mps2 / (v * v), (d.curveSteerFraction * input.vehicleLimits.maxSteerAngle_rad) / Math.abs(ff.gain));
    const curveCount = samples(d.leadIn_s + settle_s);
    const curve = sampledPath({
      shape: curveEntryPath(curvature),
      speed_mps: v,
      sampleTime_s: ts,
      leadIn_s: d.leadIn_s,
      feedForwardLead_s: ff.leadTime_s,
      count: curveCount,
    });
    const curveRun = simulateClosedLoop({
      plant: loop.plant,
      gains: full,
      settings,
      reference: new Float64Array(curveCount),
      outputDisturbance: curve.disturbance,
      feedForwardInput: curve.curvature,
    });
    curveEntry = {
      curvature_perM: curvature,
      peakError_m: peakMagnitude(curveRun.error),
      errorAfterSettle_m: peakMagnitude(curveRun.error, Math.round((d.leadIn_s + d.curveEntrySettle_s) / ts)),
    };
    curveRunKept = curveRun;
  }

  let limitedStep: TimeDomainFigures['limitedStep'] = null;
  let limitedRunKept: BreakpointTraces['limitedStep'] = null;
  if (loop.actuator !== null && loop.kind !== 'path') {
    const actuatorModel = loop.actuator;
    const v = loop.speed_mps;
    const size =
      loop.kind === 'heading'
        ? d.limitedHeadingStep_rad
        : Math.min(
            d.limitedYawStepLateralAcceleration_mps2 / v,
            (d.curveSteerFraction * input.vehicleLimits.maxSteerAngle_rad) / Math.abs(loop.feedForward.gain),
          );
    const count = samples(settle_s);
    // A trial of the search for b below needs only whether its overshoot keeps the limit: an output this far above the
    // limit decides it (the 1e-9 keeps rounding from deciding), and the run stops there. Its figures are then not used.
    const decidedAbove = size * (1 + limits.maximumOvershoot_pct / 100) * (1 + 1e-9);
    const wholeRun = Number.POSITIVE_INFINITY;
    const limitedRun = (
      b: number,
      stopAboveOutput: number,
    ): NonNullable<TimeDomainFigures['limitedStep']> & { run: { output: Float64Array; steerAngle: Float64Array } } => {
      const run = simulateLimitedLoop({
        vehicle: loop.misalignment,
        actuator: actuatorModel,
        maxSteerAngle_rad: input.vehicleLimits.maxSteerAngle_rad,
        maxSteerRate_radps: input.vehicleLimits.maxSteerRate_radps,
        gains: firmware(b, weights.derivative, 0),
        settings: {
          ...loop.controller,
          antiWindup: input.antiWindup,
          commandLimit_rad: input.vehicleLimits.maxSteerAngle_rad,
          integratorClamp_rad: input.vehicleLimits.maxSteerAngle_rad,
        },
        reference: new Float64Array(count).fill(size),
        stopAboveOutput,
      });
      let peakRate = 0;
      for (let k = 1; k < run.steerAngle.length; k++) peakRate = Math.max(peakRate, Math.abs(run.steerAngle[k] - run.steerAngle[k - 1]) / ts);
      const normalised = run.output.map((y) => y / size);
      return {
        size,
        overshoot_pct: overshoot_pct(normalised),
        settlingTime_s: settlingTime_s({ signal: normalised, target: 1, band: d.settlingBand, sampleTime_s: ts }),
        peakSteerRate_radps: peakRate,
        run,
      };
    };
    // Chosen weights (heading loop): lower b until the step through the limits keeps the overshoot limit too (its overshoot grows with b).
    const lowering = loop.kind === 'heading' && input.setpointWeights === undefined && weights.proportional > 0;
    let limited = limitedRun(weights.proportional, lowering ? decidedAbove : wholeRun);
    if (lowering && limited.overshoot_pct > limits.maximumOvershoot_pct) {
      let low = 0;
      let high = weights.proportional;
      let best = limitedRun(0, wholeRun);
      if (best.overshoot_pct <= limits.maximumOvershoot_pct) {
        for (let i = 0; i < LIMITED_WEIGHT_STEPS; i++) {
          const middle = (low + high) / 2;
          const trial = limitedRun(middle, decidedAbove);
          if (trial.overshoot_pct <= limits.maximumOvershoot_pct) {
            low = middle;
            best = trial;
          } else high = middle;
        }
      }
      weights = { ...weights, proportional: low };
      limited = best;
      const lowered = mix(atZero.output, atOne.output, low);
      const settlingLowered = settlingTime_s({ signal: lowered, target: 1, band: d.settlingBand, sampleTime_s: ts });
      referenceStep = {
        overshoot_pct: overshoot_pct(lowered),
        settlingTime_s: settlingLowered,
        settlingDistance_m: settlingLowered === null ? null : settlingLowered * loop.speed_mps,
      };
      stepCommand = mix(atZero.command, atOne.command, low);
      stepOutput = lowered;
    }
    const { run, ...limitedFigures } = limited;
    limitedStep = limitedFigures;
    limitedRunKept = run;
  }
  const actuator = actuatorRoom(laneChangeCommand ?? stepCommand, laneChangeCommand === null ? 1 : d.laneChangeSize_m, loop, input.vehicleLimits);
  const figures: TimeDomainFigures = { referenceStep, steeringMisalignment, lateralForce, laneChange, curveEntry, actuator, limitedStep };
  const result = { setpointWeights: weights, figures, failures: judgeTimeDomain(figures, limits, loop.kind) };
  if (input.keepTraces !== true) return result;
  const traces: BreakpointTraces = {
    sampleTime_s: ts,
    leadIn_s: d.leadIn_s,
    referenceStep: { output: stepOutput, command: stepCommand },
    steeringMisalignment: misalignmentRun.run,
    lateralForce: lateralForceRun?.run ?? null,
    laneChange: laneRunKept,
    curveEntry: curveRunKept,
    limitedStep: limitedRunKept,
  };
  return { ...result, traces };
}

export { judgeTimeDomain } from './time-domain-limits.js';
