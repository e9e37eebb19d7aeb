/**
 * The closed loop with the steering actuator's limits: THE controller equation (firmware-step.ts, with its
 * command limit and anti-windup) sampling the loop output, the command passing the computation latency and
 * the actuator delay, and the actuator — a first-order position loop whose rate is limited,
 * δ̇ = clamp((c − δ)/τa, ±δ̇max), c the delayed command clamped to ±δmax — driving the linear vehicle and loop
 * (src/loops). As in the open-loop simulator (src/vehicle/simulate.ts): with c held, the actuator ramps at
 * ±δ̇max until |c − δ| = τa·δ̇max and then approaches c exponentially, the switching instant is known in
 * closed form, and each piece is integrated exactly with the matrix exponential of the state [x, δ] — so
 * the response is exact at every sample, saturation included. What a rate limit does to a loop (a phase lag
 * growing with amplitude; limit cycles, Gelb & Vander Velde 1968) shows here and in no linear figure.
 */
import { firmwareStep, initialFirmwareState, type FirmwareGains, type FirmwareSettings } from '../controller/firmware-step.js';
import { actuatorPiecesInto, PIECE_FIELDS, PIECE_TRACK } from './actuator-motion.js';
import { matrixExponential } from '../lti/matrix-exponential.js';
import { controllableCanonicalForm } from '../lti/state-space.js';
import type { TransferFunction } from '../lti/types.js';
import { splitDelay } from '../verify/sampled-plant.js';

export interface LimitedLoopInput {
  /** Road-wheel angle → loop output, without actuator or delay (strictly proper). */
  readonly vehicle: TransferFunction;
  /** Actuator lag τa (s) and command delay (actuator delay + computation latency, s). */
  readonly actuator: { readonly lag_s: number; readonly delay_s: number };
  readonly maxSteerAngle_rad: number;
  readonly maxSteerRate_radps: number;
  readonly gains: FirmwareGains;
  /** The controller; its commandLimit_rad and integratorClamp_rad are what the firmware clamps to. */
  readonly settings: FirmwareSettings;
  readonly reference: Float64Array;
  readonly feedForwardInput?: Float64Array;
  /**
   * End the run at the first sample whose output exceeds this (a search that asks only whether a bound on the output is
   * kept: what follows cannot undo it); the traces then end at that sample. Absent: the whole run.
   */
  readonly stopAboveOutput?: number;
}

export interface LimitedLoopSimulation {
  readonly output: Float64Array;
  readonly error: Float64Array;
  readonly command: Float64Array;
  /** Road-wheel angle at each sample, rad. */
  readonly steerAngle: Float64Array;
}

interface Piece {
  readonly phi: Float64Array;
  readonly gamma: Float64Array;
}

export function simulateLimitedLoop(input: LimitedLoopInput): LimitedLoopSimulation {
  const model = controllableCanonicalForm(input.vehicle);
  const n = model.inputVector.length;
  const size = n + 1;
  const ts = input.settings.sampleTime_s;
  const lag = input.actuator.lag_s < 1e-6 * ts ? 0 : input.actuator.lag_s;
  const rate = input.maxSteerRate_radps;
  const angleLimit = input.maxSteerAngle_rad;
  // ż = F z + g w: tracking the command through the lag (w = c) or a wheel angle moving at a fixed rate (w = δ̇).
  const free: number[][] = Array.from({ length: size }, (_, i) =>
    Array.from({ length: size }, (_, j) => (i < n ? (j < n ? model.stateMatrix[i][j] : model.inputVector[i]) : 0)),
  );
  const track = free.map((row, i) => (i === n && lag > 0 ? row.map((_, j) => (j === n ? -1 / lag : 0)) : row));
  const trackInput = Array.from({ length: size }, (_, i) => (i === n && lag > 0 ? 1 / lag : 0));
  const rateInput = Array.from({ length: size }, (_, i) => (i === n ? 1 : 0));
  const { wholeSamples, fraction_s } = splitDelay(input.actuator.delay_s, ts);
  const exponential = (kind: 'track' | 'free', h: number): Piece => {
    const f = kind === 'track' ? track : free;
    const g = kind === 'track' ? trackInput : rateInput;
    const augmented = Array.from({ length: size + 1 }, (_, i) =>
      Array.from({ length: size + 1 }, (_, j) => (i < size ? (j < size ? f[i][j] * h : g[i] * h) : 0)),
    );
    const e = matrixExponential(augmented);
    return {
      phi: Float64Array.from(e.slice(0, size).flatMap((row) => row.slice(0, size))),
      gamma: Float64Array.from(e.slice(0, size).map((row) => row[size])),
    };
  };
  // The pieces of the durations every sample has (Ts, or the fractional delay m and Ts − m), made once when first
  // needed; the others (an actuator switching inside a stretch) each time.
  const standardDurations = [ts, fraction_s, ts - fraction_s];
  const standard: Record<'track' | 'free', (Piece | null)[]> = { track: [null, null, null], free: [null, null, null] };
  const piece = (kind: 'track' | 'free', h: number): Piece => {
    const slot = h === standardDurations[0] ? 0 : h === standardDurations[1] ? 1 : h === standardDurations[2] ? 2 : -1;
    if (slot < 0) return exponential(kind, h);
    const pieces = standard[kind];
    const found = pieces[slot];
    if (found !== null) return found;
    const made = exponential(kind, h);
    pieces[slot] = made;
    return made;
  };
  const z = new Float64Array(size);
  const next = new Float64Array(size);
  const pieces = new Float64Array(2 * PIECE_FIELDS);
  const count = input.reference.length;
  const output = new Float64Array(count);
  const error = new Float64Array(count);
  const command = new Float64Array(count);
  const steerAngle = new Float64Array(count);
  const { outputVector, feedthrough } = model;
  const feedForwardInput = input.feedForwardInput;
  const stopAbove = input.stopAboveOutput ?? Number.POSITIVE_INFINITY;
  let state = initialFirmwareState();
  for (let k = 0; k < count; k++) {
    let y = feedthrough * z[n];
    for (let j = 0; j < n; j++) y += outputVector[j] * z[j];
    output[k] = y;
    error[k] = input.reference[k] - y;
    steerAngle[k] = z[n];
    if (y > stopAbove) {
      return { output: output.subarray(0, k + 1), error: error.subarray(0, k + 1), command: command.subarray(0, k), steerAngle: steerAngle.subarray(0, k + 1) };
    }
    const step = firmwareStep(input.gains, input.settings, state, {
      reference: input.reference[k],
      measurement: y,
      feedForwardInput: feedForwardInput === undefined ? 0 : feedForwardInput[k],
    });
    state = step.state;
    command[k] = step.command;
    // Over [t_k, t_k+1): the command issued ℓ + 1 samples ago until t_k + m, then the one issued ℓ samples ago,
    // each held (and angle-limited) through the actuator's pieces (actuator-motion.ts).
    for (let stretch = fraction_s > 0 ? 0 : 1; stretch < 2; stretch++) {
      const issued = stretch === 0 ? k - wholeSamples - 1 : k - wholeSamples;
      const held = issued < 0 ? 0 : Math.min(angleLimit, Math.max(-angleLimit, command[issued]));
      const duration = fraction_s > 0 ? (stretch === 0 ? fraction_s : ts - fraction_s) : ts;
      const pieceCount = actuatorPiecesInto(z[n], held, duration, lag, rate, pieces);
      for (let p = 0; p < pieceCount; p++) {
        const at = p * PIECE_FIELDS;
        if (!Number.isNaN(pieces[at + 3])) z[n] = pieces[at + 3];
        const { phi, gamma } = piece(pieces[at] === PIECE_TRACK ? 'track' : 'free', pieces[at + 1]);
        const w = pieces[at + 2];
        // z ← Φ·z + γ·w
        for (let i = 0; i < size; i++) {
          let sum = gamma[i] * w;
          for (let j = 0; j < size; j++) sum += phi[i * size + j] * z[j];
          next[i] = sum;
        }
        for (let i = 0; i < size; i++) z[i] = next[i];
      }
    }
  }
  return { output, error, command, steerAngle };
}
