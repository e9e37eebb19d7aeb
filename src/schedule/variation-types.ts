/**
 * Records of the worst case over a set of vehicles that a schedule file carries (its `variations` section) and
 * the plan's search settings: the set (a box of parameter changes around the check model), the figures, the
 * combination behind a worst figure, and the weakest parameter. Plain, readonly, JSON-able. A change is a factor
 * ('scale', dimensionless, nominal 1) or an offset ('add', in the parameter's unit, nominal 0) applied to the check
 * model's own value. The search that fills them is src/robust/.
 */

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

/** Worst value of one figure over the grid: where, and the combination. */
export interface RobustWorstValue {
  readonly value: number;
  readonly speed_mps: number;
  readonly combination: Combination;
}

/** Where the schedule is weakest over the set (src/robust/weakest-parameter.ts). */
export interface WeakestParameter {
  readonly speed_mps: number;
  /** The figure nearest its limit over the set, or 'stability' when the set holds an unstable loop. */
  readonly figure: RobustFigure | 'stability';
  readonly parameter: VariedParameter;
  /** The figure's worst value (null for stability). */
  readonly worst: number | null;
  /** The same figure with that parameter alone back at nominal (null when the loop is then not stable, or for stability). */
  readonly withParameterNominal: number | null;
  /** For stability: whether that parameter back at nominal makes the loop stable. */
  readonly restoresStability: boolean | null;
  /** The combination behind the worst figure. */
  readonly combination: Combination;
}

/**
 * The time-domain figures whose worst value over the set is found at each breakpoint (src/robust/time-domain.ts);
 * a larger value is worse for each.
 */
export type RobustTimeDomainFigure =
  | 'overshoot_pct'
  | 'settlingTime_s'
  | 'misalignmentRecoveryTime_s'
  | 'lateralForceRecoveryTime_s'
  | 'laneChangeError_m'
  | 'curveEntryError_m'
  | 'limitedStepOvershoot_pct'
  | 'limitedStepSettlingTime_s';

/** The worst value of a time-domain figure at a breakpoint and its combination; value null: a response that did not settle within the simulated time. */
export interface WorstTimeDomainFigure {
  readonly value: number | null;
  readonly combination: Combination;
}

/** The time-domain figures of a breakpoint's gains, set-point weights and feed-forward over the set. */
export interface RobustTimeDomain {
  /** Per figure; null where the loop has no such figure (a lane change on a heading loop, a lateral force on a lumped model). */
  readonly worst: Readonly<Record<RobustTimeDomainFigure, WorstTimeDomainFigure | null>>;
  /** The time-domain limits the worst case breaks, in words, each naming its combination (empty: none). */
  readonly failures: readonly string[];
  /** Vehicles of the set simulated there (stable loops only: an unstable one fails the breakpoint by its margins). */
  readonly vehicles: number;
}
