/**
 * The sampled closed loop in the time domain, exact at the sample instants: the plant's zero-order-hold
 * equivalent with its fractional delay (src/verify/sampled-plant.ts: x[k+1] = Φx[k] + Γ0·u[k−ℓ] + Γ1·u[k−ℓ−1],
 * y[k] = Cx[k] + D·u[k−ℓ−1]) driven by THE controller equation (src/controller/firmware-step.ts) one
 * sample at a time. For a linear plant with the command held between samples this recursion is the
 * exact solution at t = k·Ts (Åström & Wittenmark, Computer-Controlled Systems, 3rd ed., §2.3), so the
 * figures computed from it are those of the loop the firmware runs, not of an approximation; with
 * finite limits in the settings the controller's own clamp and anti-windup act as they would in
 * firmware (the plant itself stays linear here).
 * An output disturbance d[k] (the response of the loop output to a disturbance entering the vehicle,
 * computed exactly outside the loop) is added to the measurement: by superposition the result is exact.
 */
import { firmwareStep, initialFirmwareState, type FirmwareGains, type FirmwareSettings } from '../controller/firmware-step.js';
import type { SampledPlant } from '../verify/sampled-plant.js';

/** Input of simulateClosedLoop: the sampled plant, the controller equation's settings and gains, reference and disturbances. */
export interface LoopSimulationInput {
  readonly plant: SampledPlant;
  readonly gains: FirmwareGains;
  readonly settings: FirmwareSettings;
  /** r[k], one per sample (its length sets the number of samples). */
  readonly reference: Float64Array;
  /** w[k], the feed-forward input (absent: 0). */
  readonly feedForwardInput?: Float64Array;
  /** d[k], added to the loop output (absent: 0). */
  readonly outputDisturbance?: Float64Array;
}

/** Traces of a closed-loop simulation at the samples: reference, output, error, steer command. */
export interface LoopSimulation {
  /** y[k], the measured loop output (disturbance included). */
  readonly output: Float64Array;
  /** e[k] = r[k] − y[k]. */
  readonly error: Float64Array;
  /** u[k], the road-wheel angle command, rad. */
  readonly command: Float64Array;
}

/** Simulate the closed loop from rest (see the file comment). */
export function simulateClosedLoop(input: LoopSimulationInput): LoopSimulation {
  const { plant, gains, settings, reference } = input;
  const count = reference.length;
  const n = plant.inputGainCurrent.length;
  const ell = plant.wholeSampleDelay;
  const phi = new Float64Array(n * n);
  for (let i = 0; i < n; i++) for (let j = 0; j < n; j++) phi[i * n + j] = plant.transition[i][j];
  const gamma0 = Float64Array.from(plant.inputGainCurrent);
  const gamma1 = Float64Array.from(plant.inputGainPrevious);
  const c = Float64Array.from(plant.outputVector);
  const d = plant.feedthrough;
  const x = new Float64Array(n);
  const next = new Float64Array(n);
  const output = new Float64Array(count);
  const error = new Float64Array(count);
  const command = new Float64Array(count);
  const past = (k: number): number => (k < 0 ? 0 : command[k]);
  let state = initialFirmwareState();
  for (let k = 0; k < count; k++) {
    let y = d * past(k - ell - 1);
    for (let j = 0; j < n; j++) y += c[j] * x[j];
    if (input.outputDisturbance !== undefined) y += input.outputDisturbance[k];
    output[k] = y;
    error[k] = reference[k] - y;
    const step = firmwareStep(gains, settings, state, { reference: reference[k], measurement: y, feedForwardInput: input.feedForwardInput?.[k] ?? 0 });
    state = step.state;
    command[k] = step.command;
    const current = past(k - ell);
    const previous = past(k - ell - 1);
    for (let i = 0; i < n; i++) {
      let sum = gamma0[i] * current + gamma1[i] * previous;
      for (let j = 0; j < n; j++) sum += phi[i * n + j] * x[j];
      next[i] = sum;
    }
    // Copied element by element: TypedArray.prototype.set costs more than a handful of stores, at every sample.
    for (let i = 0; i < n; i++) x[i] = next[i];
  }
  return { output, error, command };
}
