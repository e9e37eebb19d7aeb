/**
 * A rational transfer function with a pure input delay:
 *   G(s) = (numerator[0]·s^m + … + numerator[m]) / (denominator[0]·s^n + … + denominator[n]) · e^(−delay_s·s)
 * Coefficients highest power first (the order scipy.signal and most textbooks use).
 */
export interface TransferFunction {
  readonly numerator: readonly number[];
  readonly denominator: readonly number[];
  readonly delay_s: number;
}

/** A complex number as plain data. */
export interface Complex {
  readonly re: number;
  readonly im: number;
}

/** A frequency response on a grid: real and imaginary parts per frequency (rad/s). */
export interface FrequencyResponse {
  readonly frequency_radps: Float64Array;
  readonly real: Float64Array;
  readonly imaginary: Float64Array;
}

/**
 * A single-input single-output state-space model ẋ = A·x + B·u, y = C·x + D·u,
 * as plain rows of numbers (n states; n = 0 for a static gain).
 */
export interface StateSpaceModel {
  /** n×n system matrix A, rows of numbers. */
  readonly stateMatrix: readonly (readonly number[])[];
  /** Input vector B (length n). */
  readonly inputVector: readonly number[];
  /** Output vector C (length n). */
  readonly outputVector: readonly number[];
  /** Direct feed-through D. */
  readonly feedthrough: number;
}

/** A sampled time response: output y at each time (s); input and output units are those of the system. */
export interface TimeResponse {
  readonly time_s: Float64Array;
  readonly output: Float64Array;
}
