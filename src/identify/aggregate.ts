import type { FopdtModel } from './types.js';
import type { IdentifyOptions } from './defaults.js';
import type { StepIdentification } from './identify-step.js';

/** One FOPDT parameter combined over steps: value, standard error and 95 % interval. */
export interface CombinedValue {
  readonly value: number;
  readonly standardError: number;
  readonly ci95: readonly [number, number];
  /** Birge ratio √(χ²/(k − 1)) of the repeats about the weighted mean (1 when k = 1). */
  readonly birgeRatio: number;
}

/** The FOPDT model at one nominal speed, combined from its accepted steps. */
export interface SpeedModel {
  /** Mean of the steps' speeds, m/s. */
  readonly speed_mps: number;
  readonly stepCount: number;
  /** The steps combined, by file and step index. */
  readonly steps: readonly { readonly file: string; readonly stepIndex: number }[];
  readonly model: FopdtModel;
  readonly gain: CombinedValue;
  readonly timeConstant_s: CombinedValue;
  readonly deadTime_s: CombinedValue;
  /** |K_left − K_right| / mean |K| × 100 when both directions were tested, else null. */
  readonly asymmetry_pct: number | null;
  /** (max − min)/mean of the step gains × 100, %. */
  readonly repeatSpread_pct: number;
  /** Root mean square of the steps' FOPDT residuals, rad/s. */
  readonly fopdtRmse_radps: number;
  readonly warnings: readonly string[];
}

/**
 * Inverse-variance weighted mean of independent estimates x_i with standard errors s_i:
 *   x̄ = Σ(x_i/s_i²)/Σ(1/s_i²),  SE = 1/√Σ(1/s_i²)
 * (e.g. Taylor 1997, An Introduction to Error Analysis, §7.2). When the repeats scatter
 * more than their errors allow, the SE is multiplied by the Birge ratio √(χ²/(k − 1))
 * if above 1 (Birge 1932; common practice in metrology). Interval x̄ ± 1.96·SE.
 */
export function inverseVarianceMean(values: readonly number[], standardErrors: readonly number[]): CombinedValue {
  const k = values.length;
  let sumW = 0;
  let sumWX = 0;
  for (let i = 0; i < k; i++) {
    const w = 1 / Math.max(standardErrors[i], 1e-300) ** 2;
    sumW += w;
    sumWX += w * values[i];
  }
  const value = sumWX / sumW;
  let chi2 = 0;
  for (let i = 0; i < k; i++) chi2 += ((values[i] - value) / Math.max(standardErrors[i], 1e-300)) ** 2;
  const birgeRatio = k > 1 ? Math.sqrt(chi2 / (k - 1)) : 1;
  const standardError = Math.max(1, birgeRatio) / Math.sqrt(sumW);
  return { value, standardError, ci95: [value - 1.96 * standardError, value + 1.96 * standardError], birgeRatio };
}

/**
 * Group accepted steps by nominal speed: sorted by speed, a new group starts when a step is more than
 * min(tolerance_mps, toleranceFraction × speed) above the group's first (absolute at road speeds,
 * relative for slow machines tested at speeds a fraction of a m/s apart).
 */
export function groupBySpeed(steps: readonly StepIdentification[], tolerance_mps: number, toleranceFraction: number): StepIdentification[][] {
  const sorted = [...steps].sort((a, b) => a.speed_mps - b.speed_mps || a.file.localeCompare(b.file) || a.stepIndex - b.stepIndex);
  const groups: StepIdentification[][] = [];
  for (const step of sorted) {
    const current = groups[groups.length - 1];
    const limit_mps = current === undefined ? 0 : Math.min(tolerance_mps, toleranceFraction * current[0].speed_mps);
    if (current !== undefined && step.speed_mps - current[0].speed_mps <= limit_mps) current.push(step);
    else groups.push([step]);
  }
  return groups;
}

const mean = (x: readonly number[]): number => x.reduce((a, b) => a + b, 0) / x.length;

/** Combine one group's FOPDT fits (inverse-variance weighting) and report asymmetry and spread with warnings past the thresholds. */
export function aggregateSpeed(group: readonly StepIdentification[], options: IdentifyOptions): SpeedModel {
  const pick = (i: number): CombinedValue =>
    inverseVarianceMean(
      group.map((s) => s.fopdt.fit.parameters[i]),
      group.map((s) => s.fopdt.fit.uncertainty.standardErrors[i]),
    );
  const gain = pick(0);
  const timeConstant_s = pick(1);
  const deadTime_s = pick(2);
  const speed_mps = mean(group.map((s) => s.speed_mps));
  const gains = group.map((s) => s.fopdt.model.gain);
  const meanAbsGain = mean(gains.map(Math.abs));
  const left = group.filter((s) => s.direction === 'left').map((s) => s.fopdt.model.gain);
  const right = group.filter((s) => s.direction === 'right').map((s) => s.fopdt.model.gain);
  const asymmetry_pct = left.length > 0 && right.length > 0 ? (100 * Math.abs(mean(left) - mean(right))) / meanAbsGain : null;
  const repeatSpread_pct = (100 * (Math.max(...gains) - Math.min(...gains))) / meanAbsGain;
  const warnings: string[] = [];
  const where = `at ${speed_mps.toFixed(2)} m/s`;
  if (asymmetry_pct !== null && asymmetry_pct > options.asymmetryWarning_pct) {
    warnings.push(
      `${where}: left and right yaw gains differ by ${asymmetry_pct.toFixed(1)} % (left ${mean(left).toFixed(3)}, right ${mean(right).toFixed(3)} 1/s; ` +
        `threshold ${options.asymmetryWarning_pct} %) — check steering centre calibration and the yaw-rate sensor offset`,
    );
  }
  if (repeatSpread_pct > options.repeatSpreadWarning_pct) {
    warnings.push(
      `${where}: repeated steps spread by ${repeatSpread_pct.toFixed(1)} % in yaw gain (threshold ${options.repeatSpreadWarning_pct} %) — ` +
        'check that speed, load and surface were the same for every repeat',
    );
  }
  return {
    speed_mps,
    stepCount: group.length,
    steps: group.map((s) => ({ file: s.file, stepIndex: s.stepIndex })),
    model: { kind: 'fopdt', gain: gain.value, timeConstant_s: timeConstant_s.value, deadTime_s: deadTime_s.value },
    gain,
    timeConstant_s,
    deadTime_s,
    asymmetry_pct,
    repeatSpread_pct,
    fopdtRmse_radps: Math.sqrt(mean(group.map((s) => s.fopdt.fit.quality.rmse ** 2))),
    warnings,
  };
}
