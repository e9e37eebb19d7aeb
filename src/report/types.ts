/**
 * Everything the report draws, as plain readonly data (report-data.ts gathers it; render/ turns it into one
 * HTML file). Each optional part is present only when its inputs were given — the sections of the report
 * (render/sections.ts) each say which parts they need, and a section whose parts are absent is left out.
 * Units as in the rest of speedband: m/s, rad, s, dB, degrees.
 */
import type { OldGainsOnNewVehicle, ScheduleComparison } from '../compare/types.js';
import type { PidGains } from '../controller/types.js';
import type { ModelsFile } from '../identify/models-schema.js';
import type { TimeDomainFigures } from '../performance/types.js';
import type { CheckCriterion } from '../schedule/types.js';
import type { ScheduleFile } from '../schedule/schedule-types.js';

/** The margins of one check point the report plots (null: no such crossing, or the loop is not stable). */
export interface PointMargins {
  readonly verdict: 'stable' | 'unstable' | 'marginal';
  readonly lowerGainMargin_dB: number | null;
  readonly upperGainMargin_dB: number | null;
  readonly phaseMargin_deg: number | null;
  readonly delayMargin_s: number | null;
  readonly sensitivityPeak: number | null;
  readonly complementarySensitivityPeak: number | null;
}

/** One speed of a dense check: the gains the lookup gives there, their margins and the limits they break. */
export interface ReportCheckPoint {
  readonly speed_mps: number;
  readonly gains: PidGains;
  readonly margins: PointMargins;
  readonly failures: readonly CheckCriterion[];
}

/** A dense check, point by point (the schedule file keeps only its worst figures and first failures). */
export interface ReportCheck {
  /** In words: what was checked, on which model. */
  readonly description: string;
  readonly passed: boolean;
  readonly points: readonly ReportCheckPoint[];
  /** Where it fails, in words: runs of consecutive failing speeds and the limits broken ("19.34–25 m/s (phase margin)"). */
  readonly failingIntervals: readonly string[];
}

/** The open-loop frequency response L of one schedule's loop at one speed, with the crossings that set the margins. */
export interface LoopResponse {
  readonly gains: PidGains;
  readonly frequency_radps: readonly number[];
  readonly re: readonly number[];
  readonly im: readonly number[];
  readonly magnitude_dB: readonly number[];
  readonly phase_deg: readonly number[];
  readonly margins: PointMargins & {
    readonly phaseMarginFrequency_radps: number | null;
    readonly upperGainMarginFrequency_radps: number | null;
    readonly lowerGainMarginFrequency_radps: number | null;
  };
  /** Nyquist frequency π/Ts of the sampled loop, rad/s. */
  readonly nyquistFrequency_radps: number;
}

/** The loop at one chosen speed: the new gains, and with a baseline the old gains on the new vehicle. */
export interface FrequencyResponseAtSpeed {
  readonly speed_mps: number;
  /** Why this speed was chosen, in words ("lowest breakpoint", "smallest phase margin", "asked for"). */
  readonly reason: string;
  readonly response: LoopResponse;
  readonly old: LoopResponse | null;
}

/** The check model's prediction of the per-speed FOPDT (Smith's two-point reading of its exact step response, or the interpolation itself). */
export interface ModelPrediction {
  readonly description: string;
  readonly speeds_mps: readonly number[];
  readonly gain: readonly (number | null)[];
  readonly timeConstant_s: readonly (number | null)[];
  readonly deadTime_s: readonly (number | null)[];
}

/** One measured step with its own FOPDT fit, decimated for drawing. */
export interface StepTrace {
  readonly file: string;
  readonly stepIndex: number;
  readonly direction: 'left' | 'right';
  /** Signed command change, rad. */
  readonly amplitude_rad: number;
  /** Time since the onset, s. */
  readonly time_s: readonly number[];
  /** (yaw rate − fitted bias)/command change, 1/s. */
  readonly measuredPerCommand_perS: readonly number[];
  /** The step's FOPDT fit on the same scale, 1/s. */
  readonly fitPerCommand_perS: readonly number[];
  /** Yaw rate − fit, rad/s. */
  readonly residual_radps: readonly number[];
  /** RMSE of the residual over the whole fitted window (every sample), rad/s. */
  readonly rmse_radps: number;
  readonly r2: number;
}

export interface StepTracesAtSpeed {
  readonly speed_mps: number;
  readonly steps: readonly StepTrace[];
  /** Steps of this speed in models.json whose log was not given. */
  readonly missing: number;
}

/** A previous schedule: the old against the new on each plot, and the old gains checked on the new vehicle. */
export interface ReportBaseline {
  readonly file: string;
  readonly schedule: ScheduleFile;
  readonly comparison: ScheduleComparison;
  readonly oldGainsOnNewVehicle: OldGainsOnNewVehicle;
  /** The old gains' dense check on the new model (null when the new schedule records no model to rebuild). */
  readonly check: ReportCheck | null;
  /** The old gains' time-domain figures on the new model at each breakpoint of the new schedule (null where not stable; null altogether without a model). */
  readonly timeDomain: readonly (TimeDomainFigures | null)[] | null;
  /** The old schedule's lookup at the new schedule's check speeds. */
  readonly gainCurve: GainCurve;
  /** The old schedule's vehicle model read as FOPDT per speed (null when it records none to rebuild). */
  readonly prediction: ModelPrediction | null;
  /** The comparison in words, as `speedband compare` writes it: the lead sentence, the model it was checked on, the summary line. */
  readonly lead: string;
  readonly leadModel: string | null;
  readonly summary: string;
  readonly speedTable: TextTable;
  readonly worstTable: TextTable;
  readonly driftTable: TextTable | null;
  readonly driftUnavailable: string | null;
  readonly flags: readonly string[];
}

/** A table of words (header and rows of cells). */
export interface TextTable {
  readonly header: readonly string[];
  readonly rows: readonly (readonly string[])[];
}

/** Gains a schedule's lookup gives over a speed grid (what the firmware's table computes between breakpoints). */
export interface GainCurve {
  readonly speeds_mps: readonly number[];
  readonly kp: readonly number[];
  readonly ki: readonly number[];
  readonly kd: readonly number[];
}

/** One simulated signal, thinned for drawing: time since the start of the simulation, s, and its value. */
export interface TraceSignal {
  readonly time_s: readonly number[];
  readonly value: readonly number[];
}

/** The closed-loop responses at one breakpoint (closed-loop-traces.ts); angles rad, rates rad/s, errors in the loop's unit. */
export interface ClosedLoopTracesAtSpeed {
  readonly speed_mps: number;
  /** Why this breakpoint was drawn, in words. */
  readonly reason: string;
  /** The figures of the simulation the traces come from (equal to the schedule's when it is reproduced). */
  readonly figures: TimeDomainFigures;
  /** Loop output per unit of a reference step, with the breakpoint's set-point weights (linear loop). */
  readonly referenceStep: TraceSignal;
  /** The step of `size` through the steering limits: output per unit of the step, road-wheel angle and its rate. */
  readonly limitedStep: { readonly size: number; readonly output: TraceSignal; readonly angle: TraceSignal; readonly rate: TraceSignal } | null;
  /** Error after a steering misalignment and after a lateral force step, each as a fraction of its own peak. */
  readonly steeringMisalignment: TraceSignal;
  readonly lateralForce: TraceSignal | null;
  /** Path loop: the lane change's error, the angle commanded and the steering rate asked of the actuator. */
  readonly laneChange: { readonly error: TraceSignal; readonly angle: TraceSignal; readonly rate: TraceSignal } | null;
  /** Path loop: the curve entry's error. */
  readonly curveEntry: TraceSignal | null;
}

export interface ClosedLoopTraces {
  /** Unit of the loop's error and output (schedule units.error). */
  readonly errorUnit: string;
  /** Straight driving before the lane change and the curve entry, s; the curve-entry error is judged from this long after entry on, s. */
  readonly leadIn_s: number;
  readonly curveEntrySettle_s: number;
  /** Settling band of a step and recovery band of a disturbance, fractions. */
  readonly settlingBand: number;
  readonly recoveryBand: number;
  readonly speeds: readonly ClosedLoopTracesAtSpeed[];
}

/** Everything one report draws (gatherReportData gathers it, renderReportHtml turns it into HTML). */
export interface ReportData {
  readonly toolVersion: string;
  /** The schedule as the user named it (base name). */
  readonly scheduleFile: string;
  readonly schedule: ScheduleFile;
  /** The schedule's dense check re-run point by point on the model it records (null: it records none speedband can rebuild, with `checkUnavailable` saying why). */
  readonly check: ReportCheck | null;
  readonly checkUnavailable: string | null;
  /** Whether the re-run reproduces the schedule's recorded worst figures and failure count (null when not re-run). */
  readonly checkReproduced: boolean | null;
  /** The schedule's lookup at the speeds of its dense check. */
  readonly gainCurve: GainCurve;
  readonly frequencyResponses: readonly FrequencyResponseAtSpeed[];
  readonly models: { readonly file: string; readonly content: ModelsFile } | null;
  readonly prediction: ModelPrediction | null;
  readonly stepTraces: readonly StepTracesAtSpeed[] | null;
  readonly baseline: ReportBaseline | null;
  /** The schedule's worst case over its variations, in words (null: the plan gave none); its figures are drawn from schedule.variations. */
  readonly variations: { readonly verdict: string; readonly weakest: string | null } | null;
  /** The closed-loop responses behind the time-domain figures at a few breakpoints (null: no model to rebuild, or no figures). */
  readonly closedLoop: ClosedLoopTraces | null;
}
