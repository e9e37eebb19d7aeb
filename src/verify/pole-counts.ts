/**
 * Open-loop poles of a continuous plant as the loop analysis classifies them: at the origin, in the
 * open right half-plane, or on the imaginary axis away from the origin. A root with
 * |Re| ≤ 1e−9·max(1 rad/s, largest root magnitude) is on the axis, so a pole that numerical
 * conversion nudges from 0 to +1e−14 counts as an integrator (ANALYSIS_DEFAULTS.axisRelativeTolerance).
 */
import type { Complex } from '../lti/types.js';
import { ANALYSIS_DEFAULTS } from './defaults.js';
import { analysisRoots } from './small-roots.js';

export interface PlantPoleCounts {
  readonly originPoles: number;
  readonly rightHalfPlanePoles: number;
  readonly otherAxisPoles: number;
}

/** The counts and the poles themselves (rad/s), snapped: a pole at the origin within tolerance is exactly 0, one on the axis has Re exactly 0. */
export interface PlantPoles extends PlantPoleCounts {
  readonly poles: readonly Complex[];
}

/** The axis tolerance (rad/s) for a loop whose roots are `roots`: axisRelativeTolerance × max(1, largest |root|). */
export function axisToleranceOf(roots: readonly Complex[]): number {
  let scale = 1;
  for (const r of roots) scale = Math.max(scale, Math.hypot(r.re, r.im));
  return ANALYSIS_DEFAULTS.axisRelativeTolerance * scale;
}

/** Classify and snap `poles` with the absolute axis tolerance (rad/s). */
export function classifyPoles(poles: readonly Complex[], axisTolerance: number): PlantPoles {
  let originPoles = 0;
  let rightHalfPlanePoles = 0;
  let otherAxisPoles = 0;
  const snapped: Complex[] = [];
  for (const p of poles) {
    if (Math.hypot(p.re, p.im) <= axisTolerance) {
      originPoles++;
      snapped.push({ re: 0, im: 0 });
    } else if (Math.abs(p.re) <= axisTolerance) {
      otherAxisPoles++;
      snapped.push({ re: 0, im: p.im });
    } else {
      if (p.re > 0) rightHalfPlanePoles++;
      snapped.push(p);
    }
  }
  return { originPoles, rightHalfPlanePoles, otherAxisPoles, poles: snapped };
}

/** The poles of the plant with this denominator (coefficients highest power first), classified. */
export function plantPoleCounts(denominator: readonly number[]): PlantPoles {
  const poles = denominator.length > 1 ? analysisRoots(denominator) : [];
  return classifyPoles(poles, axisToleranceOf(poles));
}
