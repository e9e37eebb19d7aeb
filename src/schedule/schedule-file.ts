/**
 * schedule.json: assemble it from the build's results, write it (schema-checked, atomic) and read
 * it back (schema, table order, status and checksum verified, with typed errors naming the problem).
 */
import { basename } from 'node:path';
import { SAFETY_CAUTIONS } from '../core/safety.js';
import { SpeedbandError } from '../core/errors.js';
import { readTextFile, writeFileAtomic, type WriteOptions, type WriteOutcome } from '../core/files.js';
import { validateScheduleFile } from '../core/precompiled-validators.js';
import { makeValidator, parseJsonText } from '../core/schema.js';
import { VERSION } from '../version.js';
import { breakpointMargins } from './breakpoint-margins.js';
import { computeScheduleChecksum, verifyScheduleChecksum } from './checksum.js';
import { validateGainTable } from './interpolate.js';
import { failingSpeeds } from './dense-check.js';
import type { Plan } from './plan.js';
import { numericAcceptanceLimits, type AcceptanceLimits } from './acceptance-limits.js';
import type { BreakpointInsertion } from './refine.js';
import { SCHEDULE_SCHEMA } from './schedule-schema.js';
import { acceptancePassed, type ScheduleVariations } from './schedule-variations.js';
import { serialiseSchedule } from './schedule-json.js';
import { CONTROLLER_EQUATION, INTEGRATION_TEXT, controllerUpdateText, feedForwardText, gainUnits, interpolationText, loopErrorText } from './schedule-text.js';
import {
  SCHEDULE_FORMAT,
  SCHEDULE_FORMAT_VERSION,
  type ScheduleFile,
  type ScheduleRuleParametersAt,
  type ScheduleSearchAt,
  type ScheduleScenarioCheck,
  type SpeedChangeCertificate,
} from './schedule-types.js';
import type { TimeDomainFigures } from '../performance/types.js';
import type { DenseCheckResult, GainTable, WorstMargins, WorstValue } from './types.js';

/** At most this many failing speeds are listed in the file (all are counted). */
export const LISTED_FAILURES = 100;

export interface ScheduleInput {
  readonly vehicle: { readonly name: string; readonly file: string; readonly sha256: string };
  readonly plan: Plan;
  /** The plan's acceptance limits as the checks read them (acceptance-limits.ts); absent: the plan's, which then holds no expression. */
  readonly limits?: AcceptanceLimits;
  /** Final table (after refinement). */
  readonly table: GainTable;
  /** Per breakpoint, true when refinement inserted it (defaults to all false). */
  readonly insertedByRefinement?: readonly boolean[];
  /** Dense check of the final table; its grid must contain every breakpoint. */
  readonly check: DenseCheckResult;
  readonly insertions?: readonly BreakpointInsertion[];
  /** Integrator clamp, rad: the vehicle's steer-angle limit. */
  readonly integratorClamp_rad: number;
  /** The vehicle's steering-rate limit, rad/s (the figures' actuator room and steps through the limits). */
  readonly maxSteerRate_radps: number;
  /** Input files (paths are reduced to base names), SHA-256 and role. */
  readonly inputs: readonly { readonly file: string; readonly sha256: string; readonly role: string }[];
  readonly modelSummary: Readonly<Record<string, unknown>>;
  readonly modelDescription: string;
  readonly ruleCitation?: string;
  /** The plan's rule parameters resolved at each final breakpoint (speed tables and expressions evaluated). */
  readonly ruleParametersAtBreakpoints?: readonly ScheduleRuleParametersAt[];
  /** The worst case over the plan's variations (schedule-variations.ts), when the plan gives them. */
  readonly variations?: ScheduleVariations;
  /** Per final breakpoint: set-point weights, feed-forward and the time-domain figures with the limits they break. */
  readonly breakpointExtras: readonly BreakpointExtras[];
  /** With tuneFor fastest-passing: the search at each final breakpoint. */
  readonly searchAtBreakpoints?: readonly ScheduleSearchAt[];
  /** The scenarios judged (src/pipeline/simulate-schedule.ts); a failure fails the schedule. */
  readonly scenarioCheck?: ScheduleScenarioCheck;
  readonly speedChange?: SpeedChangeCertificate;
}

/** What a schedule records at a breakpoint besides its gains and margins. */
export interface BreakpointExtras {
  readonly setpointWeightProportional: number;
  readonly setpointWeightDerivative: number;
  readonly feedForward: number;
  readonly feedForwardLeadTime_s: number;
  /** Null when the loop is not stable at the breakpoint. */
  readonly timeDomain: TimeDomainFigures | null;
  /** The time-domain limits broken there, in words (a loop that is not stable breaks them all: one message). */
  readonly timeDomainFailures: readonly string[];
}

const finiteWorst = (worst: WorstValue | null): WorstValue | null => (worst !== null && Number.isFinite(worst.value) ? worst : null);

/** The worst margins as a schedule records them (non-finite figures as null). */
export function recordedWorst(worst: WorstMargins): WorstMargins {
  return {
    lowerGainMargin_dB: finiteWorst(worst.lowerGainMargin_dB),
    upperGainMargin_dB: finiteWorst(worst.upperGainMargin_dB),
    phaseMargin_deg: finiteWorst(worst.phaseMargin_deg),
    delayMargin_s: finiteWorst(worst.delayMargin_s),
    sensitivityPeak: finiteWorst(worst.sensitivityPeak),
    complementarySensitivityPeak: finiteWorst(worst.complementarySensitivityPeak),
  };
}

/**
 * Assemble a schedule file with its checksum. Status is 'passed' when the dense check passed (and, under
 * robust acceptance, the worst case over the variations), else 'failed' (the caller decides whether a failed schedule may be written: --allow-failing).
 * Deterministic: no clock, file names as base names only.
 */
export function assembleSchedule(input: ScheduleInput): ScheduleFile {
  const limits = input.limits ?? numericAcceptanceLimits(input.plan);
  const { plan, table, check } = input;
  validateGainTable(table);
  const inserted = input.insertedByRefinement ?? table.speeds_mps.map(() => false);
  if (input.breakpointExtras.length !== table.speeds_mps.length) {
    throw new SpeedbandError(
      'schedule.tableInvalid',
      `${input.breakpointExtras.length} breakpoint records for ${table.speeds_mps.length} breakpoints — give one per breakpoint`,
    );
  }
  const breakpoints = table.speeds_mps.map((speed_mps, k) => {
    const point = check.points.find((candidate) => candidate.speed_mps === speed_mps);
    if (point === undefined) {
      throw new SpeedbandError(
        'schedule.breakpointNotChecked',
        `breakpoint ${speed_mps} m/s is not among the checked speeds — build the grid with checkGrid(breakpoints, …)`,
      );
    }
    const gains = table.gains[k];
    const extra = input.breakpointExtras[k];
    return {
      speed_mps,
      kp: gains.kp,
      ki: gains.ki,
      kd: gains.kd,
      setpointWeightProportional: extra.setpointWeightProportional,
      setpointWeightDerivative: extra.setpointWeightDerivative,
      feedForward: extra.feedForward,
      feedForwardLeadTime_s: extra.feedForwardLeadTime_s,
      insertedByRefinement: inserted[k] ?? false,
      margins: breakpointMargins(point.margins),
      timeDomain: extra.timeDomain,
    };
  });
  const timeDomainFailures = table.speeds_mps
    .map((speed_mps, k) => ({ speed_mps, messages: [...input.breakpointExtras[k].timeDomainFailures] }))
    .filter((entry) => entry.messages.length > 0);
  const passed = check.passed && timeDomainFailures.length === 0 && (input.scenarioCheck?.passed ?? true);
  const path = plan.loop.kind === 'path';
  const worst = recordedWorst(check.worst);
  const withoutChecksum: Omit<ScheduleFile, 'checksum'> = {
    format: SCHEDULE_FORMAT,
    formatVersion: SCHEDULE_FORMAT_VERSION,
    status: acceptancePassed({ passed }, input.variations) ? 'passed' : 'failed',
    vehicle: { name: input.vehicle.name, file: basename(input.vehicle.file), sha256: input.vehicle.sha256 },
    loop: {
      kind: plan.loop.kind,
      ...(path
        ? {
            referencePoint: plan.loop.referencePoint,
            preview_m: plan.loop.preview_m,
            ...(plan.loop.previewTime_s === 0 ? {} : { previewTime_s: plan.loop.previewTime_s }),
          }
        : {}),
      error: loopErrorText(plan.loop.kind, plan.loop.preview_m, plan.loop.referencePoint, plan.loop.previewTime_s),
    },
    controller: {
      form: plan.controller.form,
      derivativeFilter: plan.controller.derivativeFilter,
      discretisation: plan.controller.discretisation,
      sampleTime_s: plan.controller.sampleTime_s,
      computationLatency_s: plan.controller.computationLatency_s,
      integratorClamp_rad: input.integratorClamp_rad,
      antiWindup: plan.controller.antiWindup,
      equation: CONTROLLER_EQUATION,
      feedForward: feedForwardText(plan.loop.kind),
      update: controllerUpdateText(plan.controller.discretisation, plan.controller.antiWindup),
      integration: INTEGRATION_TEXT,
    },
    interpolation: {
      method: plan.interpolation,
      outOfRange: 'clamp',
      lowSpeedFloor_mps: plan.speeds.lowSpeedFloor_mps,
      description: interpolationText(plan.interpolation, plan.speeds.lowSpeedFloor_mps),
    },
    units: gainUnits(plan.loop.kind),
    breakpoints,
    check: {
      passed,
      model: { kind: plan.check.model, description: input.modelDescription },
      range: { minimum_mps: plan.speeds.minimum_mps, maximum_mps: plan.speeds.maximum_mps },
      gridSpeeds: plan.check.gridSpeeds,
      gridSize: check.points.length,
      thresholds: limits.thresholds,
      worst,
      failedSpeeds: check.failedCount,
      failures: failingSpeeds(check.points, LISTED_FAILURES),
      insertions: (input.insertions ?? []).map((insertion) => ({ speed_mps: insertion.speed_mps, reason: insertion.reason })),
      timeDomain: {
        passed: timeDomainFailures.length === 0,
        limits: limits.timeDomain,
        steeringLimits: { maxSteerAngle_rad: input.integratorClamp_rad, maxSteerRate_radps: input.maxSteerRate_radps },
        failures: timeDomainFailures,
      },
      ...(input.scenarioCheck === undefined ? {} : { scenarios: input.scenarioCheck }),
      ...(input.speedChange === undefined ? {} : { speedChange: input.speedChange }),
    },
    ...(input.variations === undefined ? {} : { variations: input.variations }),
    provenance: {
      tool: 'speedband',
      toolVersion: VERSION,
      inputs: input.inputs.map((entry) => ({ file: basename(entry.file), sha256: entry.sha256, role: entry.role })),
      model: input.modelSummary,
      rule: {
        name: plan.rule.name,
        parameters: plan.rule.parameters as Readonly<Record<string, unknown>>,
        ...(input.ruleCitation === undefined ? {} : { citation: input.ruleCitation }),
        ...(input.ruleParametersAtBreakpoints === undefined ? {} : { parametersAtBreakpoints: input.ruleParametersAtBreakpoints }),
        tuneFor: plan.rule.tuneFor,
        ...(plan.rule.tuneFor === 'fastest-passing' ? { searchOn: plan.rule.searchOn } : {}),
        ...(input.searchAtBreakpoints === undefined ? {} : { searchAtBreakpoints: input.searchAtBreakpoints }),
      },
      plan: plan as unknown as Readonly<Record<string, unknown>>,
    },
    cautions: [...SAFETY_CAUTIONS],
  };
  return { ...withoutChecksum, checksum: computeScheduleChecksum(withoutChecksum) };
}

const validateScheduleShape = makeValidator<ScheduleFile>({
  schema: SCHEDULE_SCHEMA,
  code: 'schedule.invalid',
  what: 'schedule file',
  precompiled: validateScheduleFile,
});

/** Refuse a schedule file of an earlier format version by name, before its schema is checked. */
function refuseOldVersion(value: unknown, file: string): void {
  if (typeof value !== 'object' || value === null) return;
  const { format, formatVersion } = value as { format?: unknown; formatVersion?: unknown };
  if (format === SCHEDULE_FORMAT && typeof formatVersion === 'number' && formatVersion < SCHEDULE_FORMAT_VERSION) {
    throw new SpeedbandError(
      'schedule.unsupportedVersion',
      `schedule format version ${formatVersion} was written by an earlier speedband (${
        formatVersion < 2
          ? 'its checksum covered only the table, not the margins, status, limits and texts'
          : 'it has no set-point weights, feed-forward or time-domain figures'
      }; this speedband reads version ${SCHEDULE_FORMAT_VERSION}) — rebuild the schedule with speedband build`,
      { location: { file, jsonPath: '/formatVersion' } },
    );
  }
}

/**
 * Check a parsed schedule without its checksum: schema (JSON path of the first problem), strictly
 * increasing breakpoint speeds and finite gains. For `speedband reverify`, which takes edited files.
 */
export function parseScheduleUnverified(value: unknown, file: string): ScheduleFile {
  refuseOldVersion(value, file);
  const schedule = validateScheduleShape(value, file);
  try {
    validateGainTable({ speeds_mps: schedule.breakpoints.map((row) => row.speed_mps), gains: schedule.breakpoints });
  } catch (error) {
    if (error instanceof SpeedbandError) {
      throw new SpeedbandError('schedule.invalid', error.message, { location: { ...error.location, file }, cause: error });
    }
    throw error;
  }
  return schedule;
}

/**
 * Check a parsed schedule: as parseScheduleUnverified, then status agreeing with the check, and the
 * checksum over every field (`schedule.checksumMismatch` naming the sections that changed). Returns it typed.
 */
export function parseSchedule(value: unknown, file: string): ScheduleFile {
  const schedule = parseScheduleUnverified(value, file);
  const verdict = verifyScheduleChecksum(schedule);
  if (!verdict.valid) {
    throw new SpeedbandError(
      'schedule.checksumMismatch',
      `the checksum does not match the file: changed since it was written — ${verdict.changes.join('; ')}. ` +
        'Do not load this table into firmware; rebuild the schedule, restore the original file, or (for a deliberate hand edit) ' +
        're-verify it with speedband reverify',
      { location: { file, jsonPath: '/checksum/value' }, details: { changes: verdict.changes } },
    );
  }
  if ((schedule.status === 'passed') !== acceptancePassed(schedule.check, schedule.variations)) {
    const robust =
      schedule.variations === undefined ? '' : ` and variations.passed is ${schedule.variations.passed} under ${schedule.variations.acceptance} acceptance`;
    throw new SpeedbandError(
      'schedule.invalid',
      `status is "${schedule.status}" but check.passed is ${schedule.check.passed}${robust} — the file is inconsistent; rebuild the schedule`,
      { location: { file, jsonPath: '/status' } },
    );
  }
  return schedule;
}

/** Read and verify schedule.json (see parseSchedule). */
export function readSchedule(path: string): ScheduleFile {
  return parseSchedule(parseJsonText(readTextFile(path), path), path);
}

/**
 * Write schedule.json atomically (src/core/files.ts writeFileAtomic: an existing different file is
 * replaced only with `options.force`). The schedule is schema-checked and its checksum verified first.
 */
export function writeSchedule(path: string, schedule: ScheduleFile, options: WriteOptions): WriteOutcome {
  parseSchedule(JSON.parse(serialiseSchedule(schedule)), path);
  return writeFileAtomic(path, serialiseSchedule(schedule), options);
}
