/**
 * The exact discretisation of the path-frame vehicle (path-frame-vehicle.ts) over one actuator piece at constant
 * speed: e^([[A, B], [0, 0]]·h) = [[Φ, Γ], [0, I]] (Åström & Wittenmark, Computer-Controlled Systems, §2.3), so
 * that x(t + h) = Φ·x(t) + Γ·[w, κ, F, b] with the inputs held over the piece.
 *
 * Kept for reuse: the scenarios of one schedule run at a handful of constant speeds, nearly every piece lasting a
 * whole sample (or the two parts of a sample the actuator delay splits it into), so each Φ, Γ is computed once
 * for all the runs at that speed rather than once per run. The store is keyed by the model's numbers, the speed and
 * the lag, and bounded (EXACT_PIECE_STORE, the oldest speed dropped first); the numbers are those computed afresh.
 */
import { matrixExponentialOf } from '../lti/matrix-exponential.js';
import type { SingleTrackParameters } from '../vehicle/types.js';
import { INPUTS, pathFrameSystem, STATES } from './path-frame-vehicle.js';

/** Bounds of the store: models at a speed kept, and piece durations kept per model, speed and piece kind. */
export const EXACT_PIECE_STORE = { speeds: 256, durations: 64 } as const;

/** Φ (5×5) and Γ (5×4), row-major. */
export interface ExactPiece {
  readonly phi: Float64Array;
  readonly gamma: Float64Array;
}

export type PieceKind = 'free' | 'track';

/** The continuous system of both piece kinds at one speed and the exact pieces over durations h. */
export interface ExactAtSpeed {
  readonly systems: Readonly<Record<PieceKind, { readonly a: Float64Array; readonly b: Float64Array }>>;
  readonly piece: (kind: PieceKind, duration_s: number) => ExactPiece;
}

const store = new Map<string, ExactAtSpeed>();

function exactPiece(system: { readonly a: Float64Array; readonly b: Float64Array }, h: number): ExactPiece {
  const size = STATES + INPUTS;
  const augmented = new Float64Array(size * size);
  for (let i = 0; i < STATES; i++) {
    for (let j = 0; j < STATES; j++) augmented[i * size + j] = system.a[i * STATES + j] * h;
    for (let j = 0; j < INPUTS; j++) augmented[i * size + STATES + j] = system.b[i * INPUTS + j] * h;
  }
  const e = matrixExponentialOf(augmented, size);
  const phi = new Float64Array(STATES * STATES);
  const gamma = new Float64Array(STATES * INPUTS);
  for (let i = 0; i < STATES; i++) {
    for (let j = 0; j < STATES; j++) phi[i * STATES + j] = e[i * size + j];
    for (let j = 0; j < INPUTS; j++) gamma[i * INPUTS + j] = e[i * size + STATES + j];
  }
  return { phi, gamma };
}

function makeExactAtSpeed(parameters: SingleTrackParameters, speed_mps: number, lag_s: number): ExactAtSpeed {
  const systems = { free: pathFrameSystem(parameters, speed_mps, 'free', lag_s), track: pathFrameSystem(parameters, speed_mps, 'track', lag_s) };
  const pieces = { free: new Map<number, ExactPiece>(), track: new Map<number, ExactPiece>() };
  return {
    systems,
    piece: (kind, duration_s) => {
      const kept = pieces[kind];
      let found = kept.get(duration_s);
      if (found === undefined) {
        found = exactPiece(systems[kind], duration_s);
        if (kept.size < EXACT_PIECE_STORE.durations) kept.set(duration_s, found);
      }
      return found;
    },
  };
}

/** The exact pieces of the vehicle `parameters` at `speed_mps` (m/s > 0) with the actuator lag `lag_s` (0: none). */
export function exactAtSpeed(parameters: SingleTrackParameters, speed_mps: number, lag_s: number): ExactAtSpeed {
  const p = parameters;
  const key = `${p.mass_kg} ${p.yawInertia_kgm2} ${p.cgToFrontAxle_m} ${p.cgToRearAxle_m} ${p.frontCorneringStiffness_NPerRad} ${p.rearCorneringStiffness_NPerRad} ${speed_mps} ${lag_s}`;
  let found = store.get(key);
  if (found === undefined) {
    found = makeExactAtSpeed(parameters, speed_mps, lag_s);
    if (store.size >= EXACT_PIECE_STORE.speeds) store.delete(store.keys().next().value as string);
    store.set(key, found);
  }
  return found;
}
