/**
 * Records passed between the schedule stages: the gain table, the dense
 * ("frozen speed") check and breakpoint refinement. Plain, readonly, JSON-able.
 * Speeds in m/s; gains in the parallel PID form of src/controller/types.ts.
 */
import type { PidGains } from '../controller/types.js';
import type { LoopMargins } from '../verify/types.js';

/** How gains are read between breakpoints (see interpolate.ts). */
export type InterpolationMethod = 'linear' | 'monotone-cubic';

/** Breakpoint speeds (strictly increasing, m/s) and the gains tuned at each. */
export interface GainTable {
  readonly speeds_mps: readonly number[];
  readonly gains: readonly PidGains[];
}

/** What the lookup does between and outside breakpoints. */
export interface LookupSettings {
  readonly interpolation: InterpolationMethod;
  /** Below this speed the gains of this speed are used (gains grow like 1/vx², docs/domain.md §7), m/s. */
  readonly lowSpeedFloor_mps: number;
}

/** A closed speed interval, m/s. */
export interface SpeedRange {
  readonly minimum_mps: number;
  readonly maximum_mps: number;
}

/**
 * Acceptance limits of the dense check (common practice, docs/domain.md §5; all configurable in the plan).
 * Gain margins in dB: the lower gain margin is negative (reducing the gain by that much destabilises).
 */
export interface AcceptanceThresholds {
  /** The lower gain margin must be at most this, dB (−6: at least 6 dB of gain reduction tolerated). */
  readonly maximumLowerGainMargin_dB: number;
  /** The upper gain margin must be at least this, dB. */
  readonly minimumUpperGainMargin_dB: number;
  readonly minimumPhaseMargin_deg: number;
  /** Peak sensitivity Ms = max|1/(1 + L)| must be at most this. */
  readonly maximumSensitivityPeak: number;
  /** Peak complementary sensitivity Mt = max|L/(1 + L)| must be at most this. */
  readonly maximumComplementarySensitivityPeak: number;
  /** Delay margin must be at least this, s (measured latency plus room). */
  readonly minimumDelayMargin_s: number;
}

/** The loop analysis the check calls at each speed: L = C(gains)·G(speed), margins from src/verify/. */
export type AnalyseLoop = (speed_mps: number, gains: PidGains) => LoopMargins;

/** Gains the schedule gives at a speed (a lookup from makeGainLookup). */
export type GainsAtSpeed = (speed_mps: number) => PidGains;

export type CheckCriterion =
  | 'stability'
  | 'lowerGainMargin'
  | 'upperGainMargin'
  | 'phaseMargin'
  | 'delayMargin'
  | 'sensitivityPeak'
  | 'complementarySensitivityPeak';

/** One acceptance limit broken at one speed; `value` and `limit` in the criterion's unit. */
export interface CheckFailure {
  readonly criterion: CheckCriterion;
  readonly value: number | null;
  readonly limit: number | null;
  readonly message: string;
}

export interface CheckPoint {
  readonly speed_mps: number;
  readonly gains: PidGains;
  readonly margins: LoopMargins;
  readonly failures: readonly CheckFailure[];
}

/** The worst value of one figure over the grid and the speed where it occurs. */
export interface WorstValue {
  readonly value: number;
  readonly speed_mps: number;
}

/** Worst figures over the grid; null when no grid speed has that figure (e.g. no lower gain margin anywhere). */
export interface WorstMargins {
  /** Largest (closest to 0 dB) lower gain margin. */
  readonly lowerGainMargin_dB: WorstValue | null;
  /** Smallest upper gain margin. */
  readonly upperGainMargin_dB: WorstValue | null;
  readonly phaseMargin_deg: WorstValue | null;
  readonly delayMargin_s: WorstValue | null;
  /** Largest peak sensitivity. */
  readonly sensitivityPeak: WorstValue | null;
  /** Largest peak complementary sensitivity. */
  readonly complementarySensitivityPeak: WorstValue | null;
}

export interface DenseCheckResult {
  readonly passed: boolean;
  readonly points: readonly CheckPoint[];
  readonly failedCount: number;
  readonly worst: WorstMargins;
}

/** Progress of long work: `done` of `total` units of `stage`. */
export interface ProgressEvent {
  readonly stage: 'check' | 'refine';
  readonly done: number;
  readonly total: number;
  readonly note?: string;
}
export type ProgressCallback = (event: ProgressEvent) => void;
