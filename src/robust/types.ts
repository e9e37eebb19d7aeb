/**
 * Records of the robust check: the set of vehicles a schedule must hold on (a box of parameter
 * changes around the check model), the search settings, and the worst figures found over the set.
 * Plain, readonly, JSON-able. A change is a factor ('scale', dimensionless, nominal 1) or an
 * offset ('add', in the parameter's unit, nominal 0) applied to the check model's own value.
 */
import type { PidGains } from '../controller/types.js';
import type { BreakpointMargins } from '../schedule/schedule-types.js';
import type { CheckFailure } from '../schedule/types.js';

/** Parameters a set may vary: the single-track model's, or the interpolated lumped model's (per-speed FOPDT). */
export type VariedParameter =
  | 'mass_kg'
  | 'yawInertia_kgm2'
  | 'cgToFrontAxle_m'
  | 'frontCorneringStiffness_NPerRad'
  | 'rearCorneringStiffness_NPerRad'
  | 'actuatorLag_s'
  | 'actuatorDelay_s'
  | 'gain'
  | 'timeConstant_s'
  | 'deadTime_s';

/**
 * One side of the box. 'scale': the parameter times a factor in [minimum, maximum]; 'add': the parameter
 * plus an offset in [minimum, maximum] (cgToFrontAxle_m: the CG moves rearward by the offset, a grows and
 * b shrinks, the wheelbase stays). The nominal change (factor 1, offset 0) always lies inside.
 */
export interface VariationDimension {
  readonly parameter: VariedParameter;
  readonly change: 'scale' | 'add';
  readonly minimum: number;
  readonly maximum: number;
  /** Where the range comes from, in words (the plan's figure, the identification's 95 % interval). */
  readonly source: string;
}

/** The box of vehicles the schedule must hold on: only dimensions of non-zero width. */
export interface VariationSet {
  /** The check model the changes apply to. */
  readonly model: 'single-track' | 'interpolated-lumped';
  readonly dimensions: readonly VariationDimension[];
  /** Variations of the plan the model cannot take (e.g. mass on the lumped model), with the reason. */
  readonly notApplied: readonly { readonly field: string; readonly reason: string }[];
}

/** How the worst case is searched at each speed (defaults: VARIATION_DEFAULTS.search, src/schedule/plan-variations.ts). */
export interface RobustSearchSettings {
  /** Seeded points inside the box (the same normalised points at every speed), besides the corners. */
  readonly samples: number;
  /** Seed of those points (src/core/random.ts). */
  readonly seed: number;
  /** Most new loop analyses of the local search, per figure. */
  readonly localSearchEvaluations: number;
}

/** The figures searched for their worst value over the set. */
export type RobustFigure =
  | 'lowerGainMargin_dB'
  | 'upperGainMargin_dB'
  | 'phaseMargin_deg'
  | 'delayMargin_s'
  | 'sensitivityPeak'
  | 'complementarySensitivityPeak';

/** A point of the set: the change of each varied parameter (factor or offset), by parameter name. */
export type Combination = Readonly<Partial<Record<VariedParameter, number>>>;

/** The worst value of one figure at one speed and the combination that gives it. */
export interface WorstFigure {
  readonly value: number;
  readonly combination: Combination;
}

/** A combination whose closed loop is not stable: the worst case of all. */
export interface InstabilityFound {
  readonly verdict: 'unstable' | 'marginal';
  readonly combination: Combination;
  /** Largest closed-loop pole magnitude |z| of that loop (sampled loops; null when not known). */
  readonly largestPoleMagnitude: number | null;
}

/**
 * The robust figures at one speed. When the set holds a loop that is not stable, `instability` names it and
 * every worst figure is null (margins do not apply to a set with an unstable member, as for one loop).
 * A worst figure is also null when no point of the set has that figure (e.g. no lower gain margin anywhere).
 */
export interface RobustMargins {
  readonly speed_mps: number;
  readonly gains: PidGains;
  readonly nominal: BreakpointMargins;
  readonly instability: InstabilityFound | null;
  readonly worst: Readonly<Record<RobustFigure, WorstFigure | null>>;
  /** Loop analyses this speed took (nominal, corners, samples, local search). */
  readonly evaluations: number;
}

/** A speed of the robust check: its figures and the acceptance limits the worst case breaks. */
export interface RobustCheckPoint extends RobustMargins {
  readonly failures: readonly CheckFailure[];
}

/** Worst value of one figure over the grid: where, and the combination. */
export interface RobustWorstValue {
  readonly value: number;
  readonly speed_mps: number;
  readonly combination: Combination;
}

export interface RobustCheckResult {
  readonly passed: boolean;
  readonly points: readonly RobustCheckPoint[];
  readonly failedCount: number;
  /** Speeds where the set holds a loop that is not stable. */
  readonly unstableCount: number;
  readonly worst: Readonly<Record<RobustFigure, RobustWorstValue | null>>;
  /** Loop analyses over the whole grid. */
  readonly evaluations: number;
}

/** The robust analysis at one speed: the analogue of AnalyseLoop (src/schedule/types.ts) over a set. */
export type AnalyseOverSet = (speed_mps: number, gains: PidGains) => RobustMargins;
