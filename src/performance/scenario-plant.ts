/**
 * The plant of a scenario run between two samples: the single-track vehicle relative to the path
 * (path-frame-vehicle.ts) at the speed of the moment, driven through the steering actuator's pieces
 * (actuator-motion.ts) with the command held.
 *
 * Integration. Over a sample in which the speed does not change the plant is linear and time-invariant between
 * the actuator's switching instants, so each piece is integrated exactly with the matrix exponential (Åström &
 * Wittenmark, Computer-Controlled Systems, §2.3; exact-pieces.ts; the exogenous signals — curvature, force,
 * misalignment — taken at the middle of each piece and held). Over a sample in which the speed changes the model
 * is re-evaluated at the instantaneous speed and integrated by the classical fourth-order Runge–Kutta method
 * (Kutta 1901) with a fixed number of steps per sample, each actuator piece on its own (no switch inside a step).
 *
 * The run's state is one plain record and the steps are functions of this module (not closures made per run), so
 * that every run goes through the same compiled code: a one-shot build runs a few dozen scenarios, mostly before
 * the JavaScript engine has finished optimising them.
 */
import type { SingleTrackParameters } from '../vehicle/types.js';
import { actuatorPiecesInto, PIECE_FIELDS, PIECE_FREE } from './actuator-motion.js';
import { exactAtSpeed, type ExactAtSpeed, type PieceKind } from './exact-pieces.js';
import { INPUTS, lateralVelocityRateAt, pathFrameDerivativeAt, pathFrameDerivativeRow, STATE, STATES } from './path-frame-vehicle.js';
import type { ScenarioSetup, StepChange } from './scenario-simulation.js';
import { distanceAt_m, speedAt_mps } from './speed-profile.js';

const STEER = STATE.steerAngle;
// The state and input counts integratePiece's product is written out for: a change of either fails to compile.
[STATES, INPUTS] satisfies [5, 4];

/** The plant's state during a run (mutable; made by startPlant, advanced by advancePlant). */
export interface ScenarioPlant {
  readonly parameters: SingleTrackParameters;
  readonly setup: ScenarioSetup;
  readonly sampleTime_s: number;
  readonly stepsPerSample: number;
  /** The actuator's lag τa, s (0: none). */
  readonly lag_s: number;
  readonly maxSteerRate_radps: number;
  /** x = [vy, r, eψ, ey, δ] (path-frame-vehicle.ts). */
  readonly x: Float64Array;
  /** [w, κ, F, b] at the last time asked (inputsAt). */
  readonly inputs: Float64Array;
  /** The exact pieces of this sample, or null when the speed changes in it (Runge–Kutta). */
  exact: ExactAtSpeed | null;
  exactSpeed_mps: number;
  exactOfSpeed: ExactAtSpeed | null;
  rungeKuttaUsed: boolean;
  /** Largest wheel rate at a piece's start so far, rad/s; time the wheel moved at its rate limit, s. */
  peakSteerRate_radps: number;
  timeAtRateLimit_s: number;
  readonly k1: Float64Array;
  readonly k2: Float64Array;
  readonly k3: Float64Array;
  readonly k4: Float64Array;
  readonly stage: Float64Array;
  readonly pieces: Float64Array;
}

/** The plant at the start of `setup` (lateral offset and heading error as it says, all else at rest). */
export function startPlant(
  parameters: SingleTrackParameters,
  setup: ScenarioSetup,
  options: { readonly sampleTime_s: number; readonly stepsPerSample: number; readonly maxSteerRate_radps: number },
): ScenarioPlant {
  const ts = options.sampleTime_s;
  const x = new Float64Array(STATES);
  x[STATE.lateralOffset] = setup.initialLateralOffset_m;
  x[STATE.headingError] = setup.initialHeadingError_rad;
  return {
    parameters,
    setup,
    sampleTime_s: ts,
    stepsPerSample: options.stepsPerSample,
    lag_s: parameters.actuatorLag_s < 1e-6 * ts ? 0 : parameters.actuatorLag_s,
    maxSteerRate_radps: options.maxSteerRate_radps,
    x,
    inputs: new Float64Array(INPUTS),
    exact: null,
    exactSpeed_mps: Number.NaN,
    exactOfSpeed: null,
    rungeKuttaUsed: false,
    peakSteerRate_radps: 0,
    timeAtRateLimit_s: 0,
    k1: new Float64Array(STATES),
    k2: new Float64Array(STATES),
    k3: new Float64Array(STATES),
    k4: new Float64Array(STATES),
    stage: new Float64Array(STATES),
    pieces: new Float64Array(2 * PIECE_FIELDS),
  };
}

/** A step change's value at `time_s`: its size from its time on, else 0. */
export function valueAt(change: StepChange | null, time_s: number): number {
  return change !== null && time_s >= change.time_s ? change.size : 0;
}

/** Distance along the path of the centre of gravity at `time_s`, m (s = 0 where the path's manoeuvre starts). */
export function pathDistanceAt_m(setup: ScenarioSetup, time_s: number): number {
  return distanceAt_m(setup.speed, time_s) - setup.pathStart_m;
}

/** The inputs [w, κ, F, b] at `time_s` with the actuator input `w`, into plant.inputs (returned). */
export function inputsAt(plant: ScenarioPlant, time_s: number, w: number): Float64Array {
  const { setup, inputs } = plant;
  inputs[0] = w;
  inputs[1] = setup.path.curvature(pathDistanceAt_m(setup, time_s));
  inputs[2] = valueAt(setup.lateralForce, time_s);
  inputs[3] = valueAt(setup.misalignment, time_s);
  return inputs;
}

/**
 * Begin the sample at `time_s` at speed `speed_mps`: exact when the speed is the same at its end, else Runge–Kutta.
 * Returns v̇y now (row 0 of ẋ; the actuator's row does not enter it), for the lateral acceleration.
 */
export function beginSample(plant: ScenarioPlant, time_s: number, speed_mps: number): number {
  if (speedAt_mps(plant.setup.speed, time_s + plant.sampleTime_s) === speed_mps) {
    if (speed_mps !== plant.exactSpeed_mps || plant.exactOfSpeed === null) {
      plant.exactOfSpeed = exactAtSpeed(plant.parameters, speed_mps, plant.lag_s);
      plant.exactSpeed_mps = speed_mps;
    }
    plant.exact = plant.exactOfSpeed;
    return pathFrameDerivativeRow(plant.exact.systems.free, plant.x, inputsAt(plant, time_s, 0), STATE.lateralVelocity);
  }
  plant.exact = null;
  plant.rungeKuttaUsed = true;
  return lateralVelocityRateAt(plant.parameters, speed_mps, plant.x, inputsAt(plant, time_s, 0));
}

function derivative(plant: ScenarioPlant, time_s: number, state: Float64Array, kind: PieceKind, w: number, out: Float64Array): void {
  pathFrameDerivativeAt(plant.parameters, speedAt_mps(plant.setup.speed, time_s), kind, plant.lag_s, state, inputsAt(plant, time_s, w), out);
}

function rungeKutta(plant: ScenarioPlant, t0: number, h: number, kind: PieceKind, w: number): void {
  const { x, k1, k2, k3, k4, stage } = plant;
  derivative(plant, t0, x, kind, w, k1);
  for (let i = 0; i < STATES; i++) stage[i] = x[i] + (h / 2) * k1[i];
  derivative(plant, t0 + h / 2, stage, kind, w, k2);
  for (let i = 0; i < STATES; i++) stage[i] = x[i] + (h / 2) * k2[i];
  derivative(plant, t0 + h / 2, stage, kind, w, k3);
  for (let i = 0; i < STATES; i++) stage[i] = x[i] + h * k3[i];
  derivative(plant, t0 + h, stage, kind, w, k4);
  for (let i = 0; i < STATES; i++) x[i] += (h / 6) * (k1[i] + 2 * k2[i] + 2 * k3[i] + k4[i]);
}

/** Integrate one piece from `time_s`; returns the wheel's rate at its start, rad/s. */
function integratePiece(plant: ScenarioPlant, time_s: number, kind: PieceKind, duration: number, input: number, startAngle: number, atLimit: boolean): number {
  const { x } = plant;
  if (!Number.isNaN(startAngle)) x[STEER] = startAngle;
  const rate = kind === 'free' ? input : (input - x[STEER]) / plant.lag_s;
  plant.peakSteerRate_radps = Math.max(plant.peakSteerRate_radps, Math.abs(rate));
  if (atLimit) plant.timeAtRateLimit_s += duration;
  if (plant.exact !== null) {
    const { phi, gamma } = plant.exact.piece(kind, duration);
    const inputs = inputsAt(plant, time_s + duration / 2, input);
    // x ← Φ·x + Γ·u written out for the five states and four inputs (path-frame-vehicle.ts; checked at the top of
    // this file): the scenarios' innermost step.
    const x0 = x[0];
    const x1 = x[1];
    const x2 = x[2];
    const x3 = x[3];
    const x4 = x[4];
    const u0 = inputs[0];
    const u1 = inputs[1];
    const u2 = inputs[2];
    const u3 = inputs[3];
    for (let i = 0, p = 0, g = 0; i < STATES; i++, p += STATES, g += INPUTS) {
      x[i] =
        phi[p] * x0 +
        phi[p + 1] * x1 +
        phi[p + 2] * x2 +
        phi[p + 3] * x3 +
        phi[p + 4] * x4 +
        gamma[g] * u0 +
        gamma[g + 1] * u1 +
        gamma[g + 2] * u2 +
        gamma[g + 3] * u3;
    }
  } else {
    const steps = Math.max(1, Math.ceil((duration / plant.sampleTime_s) * plant.stepsPerSample - 1e-9));
    const h = duration / steps;
    for (let s = 0; s < steps; s++) rungeKutta(plant, time_s + s * h, h, kind, input);
  }
  return rate;
}

/** Advance from `time_s` over `duration_s` with the (delayed, angle-limited) command held; returns the wheel rate at the start. */
export function advancePlant(plant: ScenarioPlant, time_s: number, command: number, duration_s: number): number {
  const { pieces } = plant;
  const count = actuatorPiecesInto(plant.x[STEER], command, duration_s, plant.lag_s, plant.maxSteerRate_radps, pieces);
  let pieceTime = time_s;
  let firstRate = Number.NaN;
  for (let p = 0; p < count; p++) {
    const at = p * PIECE_FIELDS;
    const duration = pieces[at + 1];
    const rate = integratePiece(plant, pieceTime, pieces[at] === PIECE_FREE ? 'free' : 'track', duration, pieces[at + 2], pieces[at + 3], pieces[at + 4] === 1);
    if (Number.isNaN(firstRate)) firstRate = rate;
    pieceTime += duration;
  }
  return Number.isNaN(firstRate) ? 0 : firstRate;
}
