/**
 * Time responses of transfer functions with delay, exact at the sample times for
 * inputs held constant between samples (zero-order hold): each hold interval is
 * propagated with the matrix exponential, x(t+h) = Φ(h)·x(t) + Γ(h)·u with
 * [[Φ, Γ], [0, 1]] = exp([[A, B], [0, 0]]·h) (Franklin, Powell & Workman, Digital
 * Control of Dynamic Systems, §4.3.3). The delay shifts the held input by θ; where
 * θ is not a whole number of samples the interval is split at the switching instant,
 * so a fractional-sample delay is exact too.
 */
import { SpeedbandError } from '../core/errors.js';
import { matrixExponentialOf } from './matrix-exponential.js';
import { controllableCanonicalForm } from './state-space.js';
import type { StateSpaceModel, TimeResponse, TransferFunction } from './types.js';

/** Exact zero-order-hold discretisation of a state-space model over h seconds. */
export interface HoldDiscretisation {
  /** Φ = e^(A·h), n×n. */
  readonly transition: readonly (readonly number[])[];
  /** Γ = ∫₀ʰ e^(A·τ) dτ · B, length n. */
  readonly inputGain: readonly number[];
}

/** Interval lengths equal to this many significant digits share one discretisation. */
const LENGTH_KEY_DIGITS = 12;

/**
 * Φ and Γ for a hold interval of step_s seconds (step_s ≥ 0), from the matrix
 * exponential of the augmented matrix [[A, B], [0, 0]]·h (Van Loan 1978).
 */
export function zeroOrderHoldDiscretisation(model: StateSpaceModel, step_s: number): HoldDiscretisation {
  const n = model.inputVector.length;
  const size = n + 1;
  const augmented = new Float64Array(size * size);
  for (let i = 0; i < n; i++) {
    for (let j = 0; j < n; j++) augmented[i * size + j] = model.stateMatrix[i][j] * step_s;
    augmented[i * size + n] = model.inputVector[i] * step_s;
  }
  const exponential = matrixExponentialOf(augmented, size);
  const transition: number[][] = [];
  const inputGain: number[] = [];
  for (let i = 0; i < n; i++) {
    transition.push(Array.from(exponential.subarray(i * size, i * size + n)));
    inputGain.push(exponential[i * size + n]);
  }
  return { transition, inputGain };
}

/**
 * Response y(t_k) of g to an input u held constant on [t_k, t_(k+1)) (ZOH), from
 * rest at time_s[0]; the input before time_s[0] is 0. The delay is applied to the
 * input: the system sees u(t − θ). Exact at every sample time up to rounding, also
 * for a fractional-sample delay and for non-uniform grids. y(t_k) includes the
 * feed-through D·u(t_k − θ). Units: those of g (input units in, output units out).
 * Throws `lti.invalidTimeGrid` / `lti.invalidInput` for a bad grid or input and
 * `lti.improperTransferFunction` for an improper g.
 */
export function inputResponse(g: TransferFunction, time_s: Float64Array, input: Float64Array | readonly number[]): TimeResponse {
  validateGrid(time_s);
  if (input.length !== time_s.length) {
    throw new SpeedbandError('lti.invalidInput', `input has ${input.length} samples but the time grid has ${time_s.length} — give one input value per time`, {
      details: { inputLength: input.length, timeLength: time_s.length },
    });
  }
  for (let k = 0; k < input.length; k++) {
    if (!Number.isFinite(input[k])) {
      throw new SpeedbandError('lti.invalidInput', `input sample ${k} is ${input[k]} — expected finite numbers`, { details: { index: k, value: input[k] } });
    }
  }
  const model = controllableCanonicalForm(g);
  const n = model.inputVector.length;
  const c = model.outputVector;
  const d = model.feedthrough;
  const delay = g.delay_s;
  const count = time_s.length;
  const output = new Float64Array(count);
  const cache = new Map<string, HoldDiscretisation>();
  // Each length as computed (a uniform grid gives a handful of them, differing in the last bits) looked up first, so
  // that its key is made once: the key is a string, and making it costs more than the step it selects.
  const byLength = new Map<number, HoldDiscretisation>();
  const discretisation = (length: number): HoldDiscretisation => {
    const known = byLength.get(length);
    if (known !== undefined) return known;
    const key = length.toPrecision(LENGTH_KEY_DIGITS);
    let found = cache.get(key);
    if (found === undefined) {
      found = zeroOrderHoldDiscretisation(model, length);
      cache.set(key, found);
    }
    byLength.set(length, found);
    return found;
  };
  let state = new Float64Array(n);
  let next = new Float64Array(n);
  let started = 0; // number of input samples whose delayed start time is ≤ the current instant
  const heldInput = (): number => (started === 0 ? 0 : input[started - 1]);
  for (let k = 0; k < count; k++) {
    const tolerance = 1e-9 * (k + 1 < count ? time_s[k + 1] - time_s[k] : k > 0 ? time_s[k] - time_s[k - 1] : 1);
    while (started < count && time_s[started] + delay <= time_s[k] + tolerance) started++;
    let y = d * heldInput();
    for (let i = 0; i < n; i++) y += c[i] * state[i];
    output[k] = y;
    if (k + 1 === count) break;
    let instant = time_s[k];
    const end = time_s[k + 1];
    for (;;) {
      const switching = started < count ? time_s[started] + delay : Number.POSITIVE_INFINITY;
      const segmentEnd = switching < end - tolerance ? switching : end;
      const { transition, inputGain } = discretisation(segmentEnd - instant);
      const u = heldInput();
      for (let i = 0; i < n; i++) {
        let value = inputGain[i] * u;
        const row = transition[i];
        for (let j = 0; j < n; j++) value += row[j] * state[j];
        next[i] = value;
      }
      [state, next] = [next, state];
      instant = segmentEnd;
      if (segmentEnd === end) break;
      while (started < count && time_s[started] + delay <= instant + tolerance) started++;
    }
  }
  return { time_s: Float64Array.from(time_s), output };
}

/**
 * Unit-step response of g applied at time_s[0] (input 1 from then on, 0 before),
 * sampled at time_s, with the exact delay: y = 0 until time_s[0] + θ. See inputResponse.
 */
export function stepResponse(g: TransferFunction, time_s: Float64Array): TimeResponse {
  return inputResponse(g, time_s, new Float64Array(time_s.length).fill(1));
}

function validateGrid(time_s: Float64Array): void {
  if (time_s.length === 0) {
    throw new SpeedbandError('lti.invalidTimeGrid', 'the time grid is empty — expected at least one time in s', { details: {} });
  }
  for (let k = 0; k < time_s.length; k++) {
    if (!Number.isFinite(time_s[k]) || (k > 0 && !(time_s[k] > time_s[k - 1]))) {
      throw new SpeedbandError(
        'lti.invalidTimeGrid',
        `time_s must be finite and strictly increasing: ${k > 0 ? `${time_s[k - 1]} then ` : ''}${time_s[k]} at index ${k} — sort the times and remove repeats`,
        { details: { index: k, value: time_s[k] } },
      );
    }
  }
}
