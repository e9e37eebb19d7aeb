/**
 * The closed loop of a scenario as the firmware runs it: at each sample the schedule's lookup at the measured
 * speed, THE controller equation (src/controller/firmware-step.ts: 2-DOF PID, filtered derivative, feed-forward,
 * integrator clamp, anti-windup, command limit); the command passes the computation latency and the actuator
 * delay, the actuator's rate and angle limits and its lag (actuator-motion.ts), and drives the single-track
 * vehicle relative to the path (path-frame-vehicle.ts) at the speed of the moment.
 *
 * The plant between samples, exact at constant speed and by fourth-order Runge–Kutta while the speed changes, is
 * scenario-plant.ts; scenario-run.ts chooses the Runge–Kutta steps per sample by halving the step until no metric
 * moves by more than 0.1 %.
 */
import { firmwareStep, initialFirmwareState, type FirmwareGains, type FirmwareSettings } from '../controller/firmware-step.js';
import { previewFromCg_m } from '../loops/build.js';
import type { LoopSpecification } from '../loops/types.js';
import { splitDelay } from '../verify/sampled-plant.js';
import type { SingleTrackParameters } from '../vehicle/types.js';
import { lateralAcceleration_mps2, STATE } from './path-frame-vehicle.js';
import { advancePlant, beginSample, pathDistanceAt_m, startPlant, valueAt } from './scenario-plant.js';
import type { PathShape } from './scenarios.js';
import { distanceAt_m, speedAt_mps, type SpeedProfile } from './speed-profile.js';

/** The firmware's controller: the loop it closes, its settings, and the scheduled numbers at a speed. */
export interface ScenarioController {
  readonly loop: LoopSpecification;
  /** commandLimit_rad: the steering-angle limit the firmware clamps to; integratorClamp_rad likewise. */
  readonly settings: FirmwareSettings;
  /** The lookup (interpolation, low-speed floor, clamp) at a measured speed, m/s. */
  readonly at: (speed_mps: number) => { readonly gains: FirmwareGains; readonly feedForwardLeadTime_s: number };
}

export interface ScenarioVehicle {
  /** The single-track model with the actuator's lag and delay. */
  readonly parameters: SingleTrackParameters;
  readonly maxSteerAngle_rad: number;
  readonly maxSteerRate_radps: number;
}

/** A change that starts at `time_s` and then holds. */
export interface StepChange {
  readonly time_s: number;
  readonly size: number;
}

/** What happens in a scenario (scenario-catalogue.ts builds these). */
export interface ScenarioSetup {
  readonly duration_s: number;
  readonly speed: SpeedProfile;
  /** The path to follow; its s = 0 lies `pathStart_m` ahead of the centre of gravity's start. */
  readonly path: PathShape;
  readonly pathStart_m: number;
  /** Added to the loop's reference (heading rad, yaw rate rad/s, lateral offset m). */
  readonly referenceStep: StepChange | null;
  /** Lateral force at the centre of gravity, N. */
  readonly lateralForce: StepChange | null;
  /** Road-wheel angle misalignment, rad. */
  readonly misalignment: StepChange | null;
  readonly initialLateralOffset_m: number;
  readonly initialHeadingError_rad: number;
  /** From this time on no input changes any more (steps made, manoeuvre and speed change over), s. */
  readonly restAfter_s: number;
}

export interface ScenarioTraces {
  readonly time_s: Float64Array;
  readonly speed_mps: Float64Array;
  readonly distance_m: Float64Array;
  /** Loop reference, measurement and error e = r − y, in the loop's unit. */
  readonly reference: Float64Array;
  readonly measurement: Float64Array;
  readonly error: Float64Array;
  /** What the controller read as its feed-forward input (path curvature 1/m, or yaw-rate reference rad/s), already taken T_ff ahead. */
  readonly feedForwardInput: Float64Array;
  readonly command_rad: Float64Array;
  readonly steerAngle_rad: Float64Array;
  /** The wheel's rate at the sample instant, rad/s. */
  readonly steerRate_radps: Float64Array;
  readonly yawRate_radps: Float64Array;
  readonly lateralAcceleration_mps2: Float64Array;
  /** Offset and heading error of the centre of gravity from the path. */
  readonly lateralOffset_m: Float64Array;
  readonly headingError_rad: Float64Array;
  /** Largest wheel rate at any instant (a piece's start), rad/s. */
  readonly peakSteerRate_radps: number;
  /** Time the controller's command was clamped at the angle limit, s. */
  readonly timeAtAngleLimit_s: number;
  /** Time the actuator moved at its rate limit, s. */
  readonly timeAtRateLimit_s: number;
  readonly integrator: { readonly name: 'exact' | 'runge-kutta-4'; readonly stepsPerSample: number };
}

/**
 * Stopping at rest (for judging, not for traces): once every input has stopped changing (`setup.restAfter_s`) and for
 * REST.window_s the error, the command and the wheel angle have each changed by at most REST.relativeChange of their
 * largest magnitude so far per sample, the run holds its last values to the end (time, speed and distance still
 * advance). What is left out moves a figure by at most about count·relativeChange of its scale (our choice).
 */
export const REST = { window_s: 1, relativeChange: 1e-9 } as const;

/** What simulateScenario runs. */
export interface ScenarioSimulationInput {
  /** The single-track vehicle with its actuator and steering limits. */
  readonly vehicle: ScenarioVehicle;
  /** The firmware's controller: loop, settings, the schedule's lookup. */
  readonly controller: ScenarioController;
  /** What happens: duration, speed, path, steps and disturbances. */
  readonly setup: ScenarioSetup;
  /** Runge–Kutta steps per sample, used only over samples in which the speed changes (scenario-run.ts chooses it). */
  readonly stepsPerSample: number;
  /** Stop at rest and hold the last values (see REST): for judging, not for traces; default false (simulate to the end). */
  readonly stopAtRest?: boolean;
}

/** Simulate `input.setup` (see the file comment). */
export function simulateScenario(input: ScenarioSimulationInput): ScenarioTraces {
  const { vehicle, controller, setup, stepsPerSample, stopAtRest = false } = input;
  const { parameters } = vehicle;
  const settings = controller.settings;
  const ts = settings.sampleTime_s;
  const count = Math.floor(setup.duration_s / ts + 1e-9) + 1;
  const { wholeSamples, fraction_s } = splitDelay(parameters.actuatorDelay_s + settings.computationLatency_s, ts);
  const plant = startPlant(parameters, setup, { sampleTime_s: ts, stepsPerSample, maxSteerRate_radps: vehicle.maxSteerRate_radps });
  const x = plant.x;
  let atAngleLimit = 0;

  const traces = {
    time_s: new Float64Array(count),
    speed_mps: new Float64Array(count),
    distance_m: new Float64Array(count),
    reference: new Float64Array(count),
    measurement: new Float64Array(count),
    error: new Float64Array(count),
    feedForwardInput: new Float64Array(count),
    command_rad: new Float64Array(count),
    steerAngle_rad: new Float64Array(count),
    steerRate_radps: new Float64Array(count),
    yawRate_radps: new Float64Array(count),
    lateralAcceleration_mps2: new Float64Array(count),
    lateralOffset_m: new Float64Array(count),
    headingError_rad: new Float64Array(count),
  };
  // The traces as locals: the loop writes each at every sample (a property read less each, while the code is still interpreted).
  const { time_s: timeTrace, speed_mps: speedTrace, distance_m: distanceTrace, reference: referenceTrace, measurement: measurementTrace } = traces;
  const { error: errorTrace, feedForwardInput: feedForwardTrace, steerAngle_rad: angleTrace, steerRate_radps: rateTrace, yawRate_radps: yawRateTrace } = traces;
  const { lateralAcceleration_mps2: lateralAccelerationTrace, lateralOffset_m: offsetTrace, headingError_rad: headingErrorTrace } = traces;
  const command = traces.command_rad;
  const angleLimit = vehicle.maxSteerAngle_rad;
  const delayed = (j: number): number => (j < 0 ? 0 : Math.min(angleLimit, Math.max(-angleLimit, command[j])));
  const kind = controller.loop.kind;
  let state = initialFirmwareState();
  let lookedUpSpeed = Number.NaN;
  let scheduled = controller.at(setup.speed.initial_mps);
  const still = (values: Float64Array, k: number, largest: number): boolean => Math.abs(values[k] - values[k - 1]) <= REST.relativeChange * largest;
  const restWindow = Math.max(1, Math.round(REST.window_s / ts));
  let quietSamples = 0;
  let largestError = 0;
  let largestCommand = 0;
  let largestAngle = 0;
  for (let k = 0; k < count; k++) {
    const t = k * ts;
    if (stopAtRest && k > 0 && t > setup.restAfter_s && quietSamples >= restWindow) {
      // At rest: hold the last values to the end (see REST); time, speed and distance go on.
      for (const values of Object.values(traces)) values.fill(values[k - 1], k);
      traces.steerRate_radps.fill(0, k);
      for (let j = k; j < count; j++) {
        traces.time_s[j] = j * ts;
        traces.speed_mps[j] = speedAt_mps(setup.speed, j * ts);
        traces.distance_m[j] = distanceAt_m(setup.speed, j * ts);
      }
      break;
    }
    const v = speedAt_mps(setup.speed, t);
    const s = pathDistanceAt_m(setup, t);
    if (v !== lookedUpSpeed) {
      scheduled = controller.at(v);
      lookedUpSpeed = v;
    }
    const step = valueAt(setup.referenceStep, t);
    let reference: number;
    let measurement: number;
    let feedForwardInput: number;
    if (kind === 'path') {
      const d = previewFromCg_m(controller.loop, parameters.cgToFrontAxle_m, v);
      reference = step;
      measurement = x[STATE.lateralOffset] + d * x[STATE.headingError] - setup.path.offsetAhead(s, d);
      feedForwardInput = setup.path.curvature(s + d + v * scheduled.feedForwardLeadTime_s);
    } else if (kind === 'heading') {
      // The heading from the path's tangent, and the commanded heading offset: a set-point weight b < 1 on an absolute
      // heading would make the command depend on where heading 0 points (b·r grows without bound along a curve).
      reference = step;
      measurement = x[STATE.headingError];
      feedForwardInput = v * setup.path.curvature(s + v * scheduled.feedForwardLeadTime_s);
    } else {
      reference = v * setup.path.curvature(s) + step;
      measurement = x[STATE.yawRate];
      feedForwardInput = v * setup.path.curvature(s + v * scheduled.feedForwardLeadTime_s);
    }
    const out = firmwareStep(scheduled.gains, settings, state, { reference, measurement, feedForwardInput });
    state = out.state;
    command[k] = out.command;
    if (Math.abs(out.unlimited) > settings.commandLimit_rad) atAngleLimit += ts;
    // Exact over this sample when the speed does not change in it; v̇y now for the lateral acceleration.
    const lateralVelocityRate = beginSample(plant, t, v);
    timeTrace[k] = t;
    speedTrace[k] = v;
    distanceTrace[k] = distanceAt_m(setup.speed, t);
    referenceTrace[k] = reference;
    measurementTrace[k] = measurement;
    errorTrace[k] = reference - measurement;
    feedForwardTrace[k] = feedForwardInput;
    angleTrace[k] = x[STATE.steerAngle];
    yawRateTrace[k] = x[STATE.yawRate];
    lateralAccelerationTrace[k] = lateralAcceleration_mps2(lateralVelocityRate, x, v);
    offsetTrace[k] = x[STATE.lateralOffset];
    headingErrorTrace[k] = x[STATE.headingError];
    if (stopAtRest && k > 0) {
      largestError = Math.max(largestError, Math.abs(errorTrace[k]));
      largestCommand = Math.max(largestCommand, Math.abs(command[k]));
      largestAngle = Math.max(largestAngle, Math.abs(x[STATE.steerAngle]));
      const quiet = t > setup.restAfter_s && still(errorTrace, k, largestError) && still(command, k, largestCommand) && still(angleTrace, k, largestAngle);
      quietSamples = quiet ? quietSamples + 1 : 0;
    }
    // Over [t_k, t_k+1): the command issued ℓ + 1 samples ago until t_k + m, then the one issued ℓ samples ago.
    if (fraction_s > 0) {
      rateTrace[k] = advancePlant(plant, t, delayed(k - wholeSamples - 1), fraction_s);
      advancePlant(plant, t + fraction_s, delayed(k - wholeSamples), ts - fraction_s);
    } else {
      rateTrace[k] = advancePlant(plant, t, delayed(k - wholeSamples), ts);
    }
  }
  return {
    ...traces,
    peakSteerRate_radps: plant.peakSteerRate_radps,
    timeAtAngleLimit_s: atAngleLimit,
    timeAtRateLimit_s: plant.timeAtRateLimit_s,
    integrator: plant.rungeKuttaUsed ? { name: 'runge-kutta-4', stepsPerSample } : { name: 'exact', stepsPerSample: 1 },
  };
}
