/**
 * Records of the robust check at each speed and over a grid. The records a schedule file carries (the set, the
 * figures, combinations, the weakest parameter) are src/schedule/variation-types.ts, re-exported here.
 */
import type { PidGains } from '../controller/types.js';
import type { BreakpointMargins } from '../schedule/schedule-types.js';
import type { CheckFailure } from '../schedule/types.js';
import type { InstabilityFound, RobustFigure, WorstFigure, RobustWorstValue } from '../schedule/variation-types.js';

export type {
  VariedParameter,
  VariationDimension,
  VariationSet,
  RobustSearchSettings,
  RobustFigure,
  Combination,
  WorstFigure,
  InstabilityFound,
  RobustWorstValue,
  WeakestParameter,
  RobustTimeDomainFigure,
  WorstTimeDomainFigure,
  RobustTimeDomain,
} from '../schedule/variation-types.js';

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

/** The worst case over a variation set at every grid speed: each point's worst figures with the vehicle that gives them, the worst over the grid, pass or fail. */
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
