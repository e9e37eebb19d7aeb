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
