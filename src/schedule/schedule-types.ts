/**
 * The schedule file (schedule.json) as TypeScript records; schedule-schema.ts is its JSON Schema.
 * What firmware needs (docs/domain.md §7): breakpoints and gains, the exact controller equation,
 * interpolation and out-of-range behaviour, limits, units, proven margins, provenance, checksum.
 */
import type { OverSpeed } from '../core/by-speed.js';
import type { AntiWindup } from '../controller/firmware-step.js';
import type { Discretisation } from '../controller/types.js';
import type { TimeDomainFigures, TimeDomainLimits } from '../performance/types.js';
import type { ScenarioFailure, ScenarioLimits } from '../performance/scenario-limits.js';
import type { InterpolationMethod, AcceptanceThresholds, WorstMargins } from './types.js';
import type { LoopKind, ReferencePoint } from './plan.js';
import type { ScheduleVariations } from './schedule-variations.js';

export const SCHEDULE_FORMAT = 'speedband-schedule';
/**
 * 4: each acceptance limit in the check (thresholds, time-domain and scenario limits) one number or a table over
 * speed (a plan's expression of speed at its check speeds); 3: set-point weights, feed-forward and time-domain figures per breakpoint, Mt and the time-domain limits
 * in the check (version 2 had none of them); 2: the checksum covers every field (version 1 covered the
 * table and controller settings only).
 */
export const SCHEDULE_FORMAT_VERSION = 4;

/** Margins proven at one breakpoint (from LoopMargins; null where there is no such crossing). */
export interface BreakpointMargins {
  readonly stable: boolean;
  readonly verdict: 'stable' | 'unstable' | 'marginal';
  readonly lowerGainMargin_dB: number | null;
  readonly upperGainMargin_dB: number | null;
  readonly phaseMargin_deg: number | null;
  readonly delayMargin_s: number | null;
  readonly sensitivityPeak: number | null;
  readonly complementarySensitivityPeak: number | null;
}

export interface ScheduleBreakpoint {
  readonly speed_mps: number;
  readonly kp: number;
  readonly ki: number;
  readonly kd: number;
  /** b: the proportional term acts on b·r − y (chosen for the overshoot limit). */
  readonly setpointWeightProportional: number;
  /** c: the derivative term acts on c·r − y. */
  readonly setpointWeightDerivative: number;
  /** kff, in units.feedForward: the command added per unit of the feed-forward input. */
  readonly feedForward: number;
  /** T_ff, s: the feed-forward input is read this long ahead (negative: behind). */
  readonly feedForwardLeadTime_s: number;
  /** True when the dense check's refinement inserted this breakpoint. */
  readonly insertedByRefinement: boolean;
  readonly margins: BreakpointMargins;
  /** Figures of the exact sampled linear closed loop at this speed; null when the loop is not stable there. */
  readonly timeDomain: TimeDomainFigures | null;
}

export interface ScheduleLoop {
  readonly kind: LoopKind;
  /** Path loop only. */
  readonly referencePoint?: ReferencePoint;
  /** Path loop only: preview distance ahead of the reference point at standstill, m. */
  readonly preview_m?: number;
  /** Path loop only: preview time, s (the preview is preview_m + previewTime_s·speed). */
  readonly previewTime_s?: number;
  /** The error the controller acts on, in words with its unit. */
  readonly error: string;
}

export interface ScheduleController {
  readonly form: 'parallel';
  readonly derivativeFilter: number;
  readonly discretisation: Discretisation;
  readonly sampleTime_s: number;
  readonly computationLatency_s: number;
  /** The feed-forward plus the integrator state is kept within ±this, rad (the steer-angle limit); the command too. */
  readonly integratorClamp_rad: number;
  readonly antiWindup: AntiWindup;
  /** The continuous-time law, as text. */
  readonly equation: string;
  /** What the feed-forward input is and when it is read, as text. */
  readonly feedForward: string;
  /** The per-sample update the firmware runs, as text. */
  readonly update: readonly string[];
  /** How the integrator accumulates (ki·e·Ts, bumpless under gain changes). */
  readonly integration: string;
}

export interface ScheduleInterpolation {
  readonly method: InterpolationMethod;
  readonly outOfRange: 'clamp';
  readonly lowSpeedFloor_mps: number;
  readonly description: string;
}

export interface ScheduleUnits {
  readonly speed: 'm/s';
  readonly error: string;
  readonly output: 'rad';
  readonly kp: string;
  readonly ki: string;
  readonly kd: string;
  /** Unit of kff, and of its input. */
  readonly feedForward: string;
  readonly feedForwardInput: string;
}

export interface ScheduleCheck {
  readonly passed: boolean;
  readonly model: { readonly kind: 'single-track' | 'interpolated-lumped'; readonly description: string };
  readonly range: { readonly minimum_mps: number; readonly maximum_mps: number };
  /** Evenly spaced check speeds asked for (density). */
  readonly gridSpeeds: number;
  /** Speeds actually checked (density plus breakpoints and midpoints). */
  readonly gridSize: number;
  /** The frequency-domain limits every checked speed met or broke: numbers, or tables over speed (a plan's expressions at its check speeds, src/schedule/acceptance-limits.ts). */
  readonly thresholds: OverSpeed<AcceptanceThresholds>;
  readonly worst: WorstMargins;
  readonly failedSpeeds: number;
  /** The first failing speeds (at most 100), with what failed. */
  readonly failures: readonly { readonly speed_mps: number; readonly messages: readonly string[] }[];
  /** Breakpoints inserted by refinement, with the reason. */
  readonly insertions: readonly { readonly speed_mps: number; readonly reason: string }[];
  /** The time-domain limits at every breakpoint. */
  readonly timeDomain: {
    readonly passed: boolean;
    readonly limits: OverSpeed<TimeDomainLimits>;
    /** The vehicle's steering limits the figures were computed against (actuator room, steps through the limits). */
    readonly steeringLimits: { readonly maxSteerAngle_rad: number; readonly maxSteerRate_radps: number };
    readonly failures: readonly { readonly speed_mps: number; readonly messages: readonly string[] }[];
  };
  /** The scenarios (`speedband simulate`) judged against the scenario limits; absent when the plan turned them off or the model is not single-track. */
  readonly scenarios?: ScheduleScenarioCheck;
  /** The speed-change certificate (absent when the scenarios were not run). */
  readonly speedChange?: SpeedChangeCertificate;
}

/**
 * The largest acceleration and deceleration for which a speed change through the whole range, in the curve of the
 * speed-change scenarios, keeps the scenario limits (bisection over the rate). Frozen-speed margins say nothing of it.
 */
export interface SpeedChangeCertificate {
  /** m/s²; null when even the lowest rate searched fails; `searched_mps2.highest` when the highest passes. */
  readonly maximumAcceleration_mps2: number | null;
  readonly maximumDeceleration_mps2: number | null;
  readonly searched_mps2: { readonly lowest: number; readonly highest: number };
  readonly statement: string;
}

/** The scenario runs a build or check judged. */
export interface ScheduleScenarioCheck {
  readonly passed: boolean;
  /** The time-domain limits and the speed-change error limit in the loop's unit (maximumSpeedChangeError). */
  readonly limits: OverSpeed<ScenarioLimits>;
  /** The model the scenarios ran on, in words. */
  readonly model: string;
  /** Speeds of the per-speed scenarios (the breakpoints and low, middle and top speed), m/s. */
  readonly speeds_mps: readonly number[];
  readonly scenarios: readonly string[];
  readonly failures: readonly ScenarioFailure[];
}

/** The fastest-passing search at one breakpoint. */
export interface ScheduleSearchAt {
  readonly speed_mps: number;
  readonly parameter: string;
  readonly value: number;
  /** 'fastest passing', or 'none passed' (the value closest to passing is used and the schedule fails). */
  readonly outcome: 'fastest passing' | 'none passed';
  readonly candidates: number;
  readonly reason: string;
}

/** The rule's parameters at one breakpoint: numbers (the controller type stays text). */
export interface ScheduleRuleParametersAt {
  readonly speed_mps: number;
  readonly parameters: Readonly<Record<string, number | string>>;
}

export interface ScheduleProvenance {
  readonly tool: 'speedband';
  readonly toolVersion: string;
  /** Every input file: base name, SHA-256, role (log, vehicle, plan...). */
  readonly inputs: readonly { readonly file: string; readonly sha256: string; readonly role: string }[];
  /** Summary of the model used (JSON-able). */
  readonly model: Readonly<Record<string, unknown>>;
  readonly rule: {
    readonly name: string;
    /** As written in the plan (numbers, speed tables, expressions in speed_mps). */
    readonly parameters: Readonly<Record<string, unknown>>;
    readonly citation?: string;
    /** The parameters as resolved at each breakpoint, when the plan gives any or a search chose them. */
    readonly parametersAtBreakpoints?: readonly ScheduleRuleParametersAt[];
    readonly tuneFor: 'rule-parameters' | 'fastest-passing';
    /** With tuneFor fastest-passing: whether the search judged its candidates on the nominal model or in the worst case over the variations. */
    readonly searchOn?: 'nominal' | 'worst-case';
    /** With tuneFor fastest-passing: at each breakpoint, the parameter searched, the value chosen and why. */
    readonly searchAtBreakpoints?: readonly ScheduleSearchAt[];
  };
  /** The resolved plan. */
  readonly plan: Readonly<Record<string, unknown>>;
  /** Present when the schedule was edited by hand and re-verified (`speedband reverify`), one record per time. */
  readonly handEdits?: readonly HandEditRecord[];
}

/** A hand edit that `speedband reverify` re-verified densely before writing a fresh checksum. */
export interface HandEditRecord {
  /** In words: edited by hand, then re-verified. */
  readonly statement: string;
  /** The sections that differed from the checksum the file carried (JSON pointers; empty when it could not tell). */
  readonly changedSections: readonly string[];
  /** speedband version that re-verified. */
  readonly toolVersion: string;
  /** The model the dense check ran on, in words. */
  readonly model: string;
  /** Speeds checked. */
  readonly gridSize: number;
}

export interface ScheduleChecksum {
  readonly algorithm: 'SHA-256';
  /** How the checksummed bytes are formed, in words. */
  readonly canonicalForm: string;
  /** SHA-256 (lowercase hex) of the canonical JSON of every field but the checksum. */
  readonly value: string;
  /** Digests by JSON pointer (a top-level field, or a child of one), to name what changed when the value does not match. */
  readonly sections: Readonly<Record<string, string>>;
}

/** schedule.json: the loop, the controller equation, breakpoints with gains and proven margins, the dense check, provenance, cautions and a checksum. */
export interface ScheduleFile {
  readonly format: typeof SCHEDULE_FORMAT;
  readonly formatVersion: typeof SCHEDULE_FORMAT_VERSION;
  readonly status: 'passed' | 'failed';
  readonly vehicle: { readonly name: string; readonly file: string; readonly sha256: string };
  readonly loop: ScheduleLoop;
  readonly controller: ScheduleController;
  readonly interpolation: ScheduleInterpolation;
  readonly units: ScheduleUnits;
  readonly breakpoints: readonly ScheduleBreakpoint[];
  readonly check: ScheduleCheck;
  /** Present when the plan gave variations: the worst case over them (schedule-variations.ts). */
  readonly variations?: ScheduleVariations;
  readonly provenance: ScheduleProvenance;
  readonly cautions: readonly string[];
  readonly checksum: ScheduleChecksum;
}
