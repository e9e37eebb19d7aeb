/**
 * Nyquist stability criterion with the exact delay: Z = N + P, where P is the number
 * of open-loop poles in the open right half-plane, N the number of clockwise
 * encirclements of −1 by L over the Nyquist contour, Z the number of closed-loop
 * poles in the right half-plane (Nyquist 1932; Franklin, Powell & Emami-Naeini §6.3).
 *
 * N is counted from crossings of the negative real axis left of −1 (each is one
 * signed passage around −1): the positive-frequency sweep counts twice (its mirror
 * image crosses at the same points in the same sense), the crossing at ω = 0 of a loop
 * without integrators counts once, and so does the indentation around m poles at the
 * origin — a half circle of radius ε → 0 to the right of s = 0 whose image is a
 * clockwise arc of angle m·π at radius → ∞. The large arc adds nothing for a strictly
 * proper loop, nor for a biproper one with |L(j∞)| < 1 (a neutral loop with
 * |L(j∞)| ≥ 1 is decided before this).
 */
import type { PhaseCrossover } from './crossings.js';

export interface EncirclementInput {
  readonly phaseCrossovers: readonly PhaseCrossover[];
  /** Open-loop poles at the origin (including ones numerically nudged within tolerance). */
  readonly originPoles: number;
  /** Open-loop poles in the open right half-plane. */
  readonly rightHalfPlanePoles: number;
  /** Open-loop poles on the imaginary axis away from the origin (not handled: the count is then undetermined). */
  readonly otherAxisPoles: number;
  /** Lowest grid frequency's continuous phase (rad) and magnitude. */
  readonly lowPhase_rad: number;
  readonly lowMagnitude: number;
  /** L(0) for a loop without integrators (real), otherwise null. */
  readonly zeroFrequencyValue: number | null;
  /** |L| within this relative distance of 1 at a crossing counts as passing through −1. */
  readonly magnitudeTolerance: number;
}

export interface EncirclementResult {
  /** Closed-loop poles in the right half-plane, Z = P − (counter-clockwise encirclements); null when undetermined. */
  readonly closedLoopRightHalfPlanePoles: number | null;
  readonly counterClockwiseEncirclements: number | null;
  /** Why the count is undetermined, when it is. */
  readonly reason: string | null;
}

/** Count of odd multiples of π strictly between a and b (a < b). */
function oddMultiplesOfPiBetween(a: number, b: number): number {
  const first = Math.floor((a / Math.PI - 1) / 2) + 1;
  const last = Math.ceil((b / Math.PI - 1) / 2) - 1;
  return Math.max(0, last - first + 1);
}

/** Z = N + P from the crossings of the negative real axis; see the module comment. */
export function nyquistCount(input: EncirclementInput): EncirclementResult {
  const undetermined = (reason: string): EncirclementResult => ({ closedLoopRightHalfPlanePoles: null, counterClockwiseEncirclements: null, reason });
  if (input.otherAxisPoles > 0) return undetermined('open-loop poles on the imaginary axis away from the origin');
  let sweep = 0;
  for (const crossing of input.phaseCrossovers) {
    if (Math.abs(crossing.magnitude - 1) <= input.magnitudeTolerance) return undetermined('the loop passes through −1 (marginal)');
    if (crossing.magnitude > 1) sweep += crossing.direction;
  }
  let once = 0;
  if (input.originPoles > 0) {
    if (input.lowMagnitude <= 1) return undetermined('the loop gain is not above 1 at the lowest frequency analysed');
    const m = input.originPoles;
    const phi = input.lowPhase_rad;
    const span = -2 * phi + 2 * Math.PI * Math.round((m * Math.PI + 2 * phi) / (2 * Math.PI));
    once -= oddMultiplesOfPiBetween(phi, phi + span);
  } else if (input.zeroFrequencyValue !== null && input.zeroFrequencyValue < 0) {
    const size = -input.zeroFrequencyValue;
    if (Math.abs(size - 1) <= input.magnitudeTolerance) return undetermined('L(0) = −1 (marginal)');
    if (size > 1) {
      const level = Math.PI * (2 * Math.round((input.lowPhase_rad / Math.PI - 1) / 2) + 1);
      if (input.lowPhase_rad === level) return undetermined('the phase does not leave −180° near ω = 0');
      once += input.lowPhase_rad > level ? 1 : -1;
    }
  }
  const counterClockwise = once + 2 * sweep;
  const z = input.rightHalfPlanePoles - counterClockwise;
  if (z < 0) return undetermined(`inconsistent count Z = ${z}`);
  return { closedLoopRightHalfPlanePoles: z, counterClockwiseEncirclements: counterClockwise, reason: null };
}
