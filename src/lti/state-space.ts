/**
 * State-space realisations of transfer functions (delay-free part only).
 */
import { SpeedbandError } from '../core/errors.js';
import { relativeDegree } from './transfer-function.js';
import type { StateSpaceModel, TransferFunction } from './types.js';

/**
 * Controllable canonical realisation of the rational part N(s)/D(s) of a proper g
 * (the delay is ignored: callers add it). With D monic, D = s^n + a1 s^(n−1) + … + an
 * and N padded to degree n as b0 s^n + … + bn:
 *   A = [[−a1 … −an], [1 0 … 0], …, [0 … 1 0]],  B = [1, 0, …, 0]ᵀ,
 *   C = [b1 − b0·a1, …, bn − b0·an],  D = b0.
 * Same form as scipy.signal.tf2ss (Kailath 1980, Linear Systems, §2.1 "controller form").
 * Throws `lti.improperTransferFunction` when deg N > deg D (no state-space form).
 */
export function controllableCanonicalForm(g: TransferFunction): StateSpaceModel {
  if (relativeDegree(g) < 0) {
    throw new SpeedbandError(
      'lti.improperTransferFunction',
      `a state-space realisation needs a proper transfer function, found numerator degree ${g.numerator.length - 1} above denominator degree ${g.denominator.length - 1} — add a derivative filter or extra poles`,
      { details: { numerator: [...g.numerator], denominator: [...g.denominator] } },
    );
  }
  const lead = g.denominator[0];
  const a = g.denominator.map((c) => c / lead);
  const n = a.length - 1;
  const b = new Array<number>(n + 1).fill(0);
  for (let i = 0; i < g.numerator.length; i++) b[n + 1 - g.numerator.length + i] = g.numerator[i] / lead;
  const stateMatrix: number[][] = Array.from({ length: n }, () => new Array<number>(n).fill(0));
  for (let j = 0; j < n; j++) stateMatrix[0][j] = -a[j + 1];
  for (let i = 1; i < n; i++) stateMatrix[i][i - 1] = 1;
  const inputVector = new Array<number>(n).fill(0);
  if (n > 0) inputVector[0] = 1;
  const outputVector = Array.from({ length: n }, (_, j) => b[j + 1] - b[0] * a[j + 1]);
  return { stateMatrix, inputVector, outputVector, feedthrough: b[0] };
}
