import type { ControllerSettings } from '../controller/types.js';
import type { OverSpeed } from '../core/by-speed.js';
import type { FailingInterval } from '../schedule/failing-intervals.js';
import type { AcceptanceThresholds, WorstMargins } from '../schedule/types.js';
import type { InstabilityFound, RobustFigure, VariationSet, WorstFigure } from '../schedule/variation-types.js';
/**
 * Records of a schedule comparison (after a vehicle change: load, tyres, actuator, firmware rate).
 * Plain, readonly, JSON-able. Speeds in m/s; gains in each schedule's own units (parallel PID,
 * src/schedule/schedule-types.ts); gain margins in dB (the lower one negative), phase margin in degrees.
 */

/** When a change is flagged; defaults in COMPARE_DEFAULTS (compare/defaults.ts). */
export interface CompareThresholds {
  /** A gain is flagged when |100·(new − old)/old| ≥ this, %. */
  readonly gainChange_pct: number;
  /**
   * A gain whose old value is 0 has no % change (null): it is flagged when |new − old| > this,
   * in the gain's own unit (0: any gain term that appears is flagged).
   */
  readonly gainChangeFromZero: number;
  /** Upper gain margin flagged when it decreases by this or more, dB; lower gain margin when it moves this much closer to 0 dB. */
  readonly gainMarginDrop_dB: number;
  /** Phase margin flagged when it decreases by this or more, degrees. */
  readonly phaseMarginDrop_deg: number;
  /**
   * Breakpoints of the two schedules closer than this are the same compared speed, and low-speed
   * floors closer than this are the same setting, m/s (breakpoints at measured test speeds move by mm/s).
   */
  readonly speedTolerance_mps: number;
}

/** One gain at one compared speed. */
export interface GainChange {
  readonly old: number;
  readonly new: number;
  /** new − old, in the gain's unit; null when the schedules are not comparable gain by gain. */
  readonly change: number | null;
  /** 100·(new − old)/old, %; null when old = 0 (the absolute change decides) or not comparable. */
  readonly change_pct: number | null;
  readonly flagged: boolean;
}

/**
 * One margin at one compared speed. null = no such crossing (the margin is unbounded, as in the
 * schedule file). `change` is new − old when both are finite, else null.
 */
export interface MarginChange {
  readonly old: number | null;
  readonly new: number | null;
  readonly change: number | null;
  readonly flagged: boolean;
}

/** Where a compared speed's values come from in each schedule. */
export type SpeedSource = 'breakpoint' | 'interpolated';

export interface ComparedSpeed {
  readonly speed_mps: number;
  /** Speed at which each schedule was read, m/s: equal to speed_mps except for two breakpoints matched within the speed tolerance. */
  readonly oldSpeed_mps: number;
  readonly newSpeed_mps: number;
  /** 'breakpoint': the table row itself; 'interpolated': the schedule's lookup (gains) and linear interpolation of its breakpoint margins. */
  readonly oldSource: SpeedSource;
  readonly newSource: SpeedSource;
  readonly kp: GainChange;
  readonly ki: GainChange;
  readonly kd: GainChange;
  readonly lowerGainMargin_dB: MarginChange;
  readonly upperGainMargin_dB: MarginChange;
  readonly phaseMargin_deg: MarginChange;
  /** Informative, not flagged. */
  readonly delayMargin_s: MarginChange;
  /** Informative, not flagged. */
  readonly sensitivityPeak: MarginChange;
  readonly oldStable: boolean;
  readonly newStable: boolean;
}

/** A setting both schedules carry, when it differs. */
export interface SettingChange {
  /** Dotted path in the schedule file, e.g. 'controller.sampleTime_s'. */
  readonly setting: string;
  readonly old: string | number | null;
  readonly new: string | number | null;
  /** True when the change makes gains not comparable one by one (loop kind, preview, controller form, sample time, discretisation). */
  readonly breaksGainComparison: boolean;
}

/** One parameter of the single-track model in both schedules' provenance. */
export interface ModelParameterDrift {
  readonly name: string;
  readonly old: number;
  readonly new: number;
  readonly change: number;
  /** 100·(new − old)/|old|, %; null when old = 0. */
  readonly change_pct: number | null;
}

export type ModelDrift =
  | { readonly available: true; readonly parameters: readonly ModelParameterDrift[] }
  | { readonly available: false; readonly reason: string };

/** Worst margin of each schedule's dense check (value and speed), null when none. */
export interface WorstMarginChange {
  readonly old: { readonly value: number; readonly speed_mps: number } | null;
  readonly new: { readonly value: number; readonly speed_mps: number } | null;
  readonly change: number | null;
  readonly flagged: boolean;
}

export type FlagKind =
  | 'settingChanged'
  | 'noCommonSpeeds'
  | 'gainChange'
  | 'upperGainMarginDrop'
  | 'lowerGainMarginCloser'
  | 'phaseMarginDrop'
  | 'stabilityLost'
  | 'checkNowFails'
  | 'understeerBecameOversteer'
  | 'oldGainsFailOnNewVehicle'
  | 'oldGainsFailOverVariations';

/** One thing past a threshold, in words, with the numbers. */
export interface ComparisonFlag {
  readonly kind: FlagKind;
  /** Compared speed, m/s; null for whole-schedule flags (settings, worst margins, status). */
  readonly speed_mps: number | null;
  /** What moved: 'kp', 'upperGainMargin_dB', 'controller.sampleTime_s', ... */
  readonly quantity: string;
  readonly message: string;
}

export interface ScheduleSummary {
  readonly vehicle: string;
  readonly status: 'passed' | 'failed';
  readonly loopKind: string;
  readonly breakpoints: number;
  readonly checksum: string;
  readonly units: { readonly kp: string; readonly ki: string; readonly kd: string };
  /** The controller the gains assume. */
  readonly controller: ControllerSettings;
}

/**
 * The key fact of a refit: the OLD schedule's gains (its own lookup, loop, controller and limits) densely
 * checked on the NEW schedule's vehicle model, at the speeds of the new schedule's check — do the gains in
 * use still hold on the changed vehicle, and where not? Not available when the new schedule records no
 * model speedband can rebuild (then `reason` says so).
 */
export type OldGainsOnNewVehicle =
  | {
      readonly available: true;
      readonly passed: boolean;
      /** The model checked on (the new schedule's), in words. */
      readonly model: string;
      readonly range: { readonly minimum_mps: number; readonly maximum_mps: number };
      readonly gridSize: number;
      readonly failedSpeeds: number;
      /** Consecutive failing speeds with the limits broken there. */
      readonly failingIntervals: readonly FailingInterval[];
      /** The old schedule's own limits, which the check applies. */
      readonly thresholds: OverSpeed<AcceptanceThresholds>;
      readonly worst: WorstMargins;
    }
  | { readonly available: false; readonly reason: string };

/** One schedule's gains at one compared speed, in the worst case over the new schedule's variation set. */
export interface WorstCaseSide {
  readonly instability: InstabilityFound | null;
  readonly worst: Readonly<Record<RobustFigure, WorstFigure | null>>;
  /** The schedule's own acceptance limits its worst case breaks, in words (empty: within them). */
  readonly failures: readonly string[];
}

/** Both schedules' gains over the new vehicle's variation set at one compared speed. */
export interface VariationsAtSpeed {
  readonly speed_mps: number;
  readonly old: WorstCaseSide;
  readonly new: WorstCaseSide;
}

/**
 * The old and the new gains in the worst case over the new schedule's variation set, on the model it records (the
 * same search as its robust check, each schedule with its own loop, controller and limits). Unavailable when the
 * new schedule records no variations or no model speedband can rebuild, or when not asked for.
 */
export type VariationsComparison =
  | {
      readonly available: true;
      readonly acceptance: 'robust' | 'nominal';
      readonly set: VariationSet;
      /** The model the set varies, in words. */
      readonly model: string;
      readonly speeds: readonly VariationsAtSpeed[];
    }
  | { readonly available: false; readonly reason: string };

/** What moved between two schedules: gain and margin changes per speed, model drift, setting changes, flags. */
export interface ScheduleComparison {
  readonly old: ScheduleSummary;
  readonly new: ScheduleSummary;
  /** Leads every output of a comparison: do the old gains hold on the new vehicle model, and where not. */
  readonly oldGainsOnNewVehicle: OldGainsOnNewVehicle;
  readonly thresholds: CompareThresholds;
  /** False when a setting change makes a gain-by-gain comparison meaningless (gain changes are then null and not flagged). */
  readonly gainsComparable: boolean;
  readonly settingChanges: readonly SettingChange[];
  /** First and last compared speed, m/s; null when the schedules' breakpoint ranges do not overlap. */
  readonly commonRange: { readonly minimum_mps: number; readonly maximum_mps: number } | null;
  /** True when both schedules have the same breakpoint speeds, within the speed tolerance (no resampling). */
  readonly sameBreakpoints: boolean;
  readonly speeds: readonly ComparedSpeed[];
  /** Breakpoints outside the common range, not compared. */
  readonly notCompared: { readonly old_mps: readonly number[]; readonly new_mps: readonly number[] };
  readonly worst: {
    readonly lowerGainMargin_dB: WorstMarginChange;
    readonly upperGainMargin_dB: WorstMarginChange;
    readonly phaseMargin_deg: WorstMarginChange;
  };
  readonly modelDrift: ModelDrift;
  /** The old gains over the new vehicle's variation set (compare/variations.ts); absent when not computed. */
  readonly overVariations?: VariationsComparison;
  readonly flags: readonly ComparisonFlag[];
}
