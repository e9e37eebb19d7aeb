/**
 * The supported path for a deliberate hand edit of a schedule (`speedband reverify`): the edited file
 * (its checksum no longer matches) is re-checked densely — its own gains, lookup, loop, controller,
 * range and thresholds, on a vehicle model — and its time-domain figures recomputed at its breakpoints
 * (its own gains, set-point weights, feed-forward and limits); only when both pass is it given back with the
 * figures of this check (status, breakpoint margins, worst margins), its texts regenerated from its
 * numbers (loop error, controller equations, interpolation, units, cautions), a record in
 * `provenance.handEdits` saying it was edited by hand and re-verified (which sections had changed,
 * the model, the version), and a fresh checksum. Nothing the hand edit wrote about margins or
 * status is kept: only what the check proves. A schedule that records variations has their worst case
 * re-checked too (its `variations` section regenerated); under robust acceptance it must pass as well.
 */
import { atSpeed as readAtSpeed } from '../core/by-speed.js';
import { judgeScheduleScenarios, scheduleSpeedChanges } from './simulate-schedule.js';
import { scheduleSpeedChangeCertificate } from './scenario-stage.js';
import type { ScheduleScenarioCheck, SpeedChangeCertificate } from '../schedule/schedule-types.js';
import { SAFETY_CAUTIONS } from '../core/safety.js';
import { computeScheduleChecksum, verifyScheduleChecksum } from '../schedule/checksum.js';
import { breakpointMargins } from '../schedule/breakpoint-margins.js';
import { LISTED_FAILURES, recordedWorst } from '../schedule/schedule-file.js';
import {
  CONTROLLER_EQUATION,
  INTEGRATION_TEXT,
  controllerUpdateText,
  feedForwardText,
  gainUnits,
  interpolationText,
  loopErrorText,
} from '../schedule/schedule-text.js';
import { breakpointPerformance } from '../performance/breakpoint-performance.js';
import { performanceLoopAt } from '../performance/loop-at-speed.js';
import type { HandEditRecord, ScheduleFile } from '../schedule/schedule-types.js';
import type { DenseCheckResult } from '../schedule/types.js';
import { VERSION } from '../version.js';
import { acceptancePassed } from '../schedule/schedule-variations.js';
import type { CheckModel } from './check-model.js';
import type { RobustScheduleCheck } from './robust-schedule-check.js';
import { recheckSchedule, scheduleLoopAndController } from './recheck-schedule.js';

/** The outcome of reverifySchedule: the dense check of the edited gains and, when it passes, the schedule to write. */
export interface ReverifyResult {
  /** The dense check of the edited schedule. */
  readonly check: DenseCheckResult;
  /** The worst case over the variations it records (null when it records none). */
  readonly variations: RobustScheduleCheck | null;
  /** The time-domain limits the edited schedule breaks at its breakpoints, in words (empty: none). */
  readonly timeDomainFailures: readonly { readonly speed_mps: number; readonly messages: readonly string[] }[];
  /** Whether it passed: the dense check and time-domain limits kept and, under robust acceptance, the worst case. */
  readonly passed: boolean;
  /** What had changed against the checksum the file carried, in words (empty: nothing). */
  readonly changes: readonly string[];
  /** The re-verified schedule, or null when the check failed (nothing may be written). */
  readonly schedule: ScheduleFile | null;
}

/**
 * Re-verify a (hand-edited) schedule on a model; see the file comment. `modelRecorded`: the model is
 * the one the schedule records (its check.model and provenance.model are kept as they are).
 */
export function reverifySchedule(
  edited: ScheduleFile,
  model: CheckModel,
  options: {
    readonly modelRecorded?: boolean;
    /** When the schedule records variations: their worst case on `model` (robust-recheck.ts recheckOverVariations), run by the caller (it is asynchronous). */
    readonly variations?: RobustScheduleCheck | null;
  } = {},
): ReverifyResult {
  const recorded = options.modelRecorded === true;
  const verdict = verifyScheduleChecksum(edited);
  const check = recheckSchedule({ schedule: edited, model });
  const robust = options.variations ?? null;
  if (edited.variations !== undefined && robust === null)
    throw new Error('internal: a schedule with variations is re-verified with their worst case (recheckOverVariations)');
  if (!acceptancePassed(check, robust?.record))
    return { check, variations: robust, timeDomainFailures: [], passed: false, changes: verdict.changes, schedule: null };
  const points = edited.breakpoints.map((row) => {
    const point = check.points.find((candidate) => candidate.speed_mps === row.speed_mps);
    if (point === undefined) throw new Error(`breakpoint ${row.speed_mps} m/s missing from the check grid`);
    return point;
  });
  const margins = points.map((point) => breakpointMargins(point.margins));
  // The time-domain figures of the edited gains, set-point weights and feed-forward, against the schedule's own limits.
  const { loop: specification, controller: settings } = scheduleLoopAndController(edited);
  const figures = edited.breakpoints.map((row, k) => {
    const atSpeed = performanceLoopAt(model.modelAt(row.speed_mps), specification, row.speed_mps, settings);
    return breakpointPerformance({
      loop: { ...atSpeed, feedForward: { ...atSpeed.feedForward, gain: row.feedForward, leadTime_s: row.feedForwardLeadTime_s } },
      gains: { kp: row.kp, ki: row.ki, kd: row.kd },
      limits: readAtSpeed(edited.check.timeDomain.limits, row.speed_mps),
      vehicleLimits: edited.check.timeDomain.steeringLimits,
      slowestTimeConstant_s: points[k].margins.analysis?.sampledDataSlowestTimeConstant_s ?? null,
      setpointWeights: { proportional: row.setpointWeightProportional, derivative: row.setpointWeightDerivative },
      antiWindup: edited.controller.antiWindup,
    });
  });
  const timeDomainFailures = edited.breakpoints
    .map((row, k) => ({ speed_mps: row.speed_mps, messages: figures[k].failures }))
    .filter((entry) => entry.messages.length > 0);
  if (timeDomainFailures.length > 0) return { check, variations: robust, timeDomainFailures, passed: false, changes: verdict.changes, schedule: null };
  const breakpoints = edited.breakpoints.map((row, k) => ({ ...row, margins: margins[k], timeDomain: figures[k].figures }));
  const scenarioResult = rerunScenarios({ ...edited, breakpoints }, model);
  if (scenarioResult !== null && !scenarioResult.scenarios.passed) {
    const failures = scenarioResult.scenarios.failures;
    const speeds = [...new Set(failures.map((failure) => failure.speed_mps))];
    const byScenario = speeds.map((speed_mps) => ({
      speed_mps,
      messages: failures.filter((failure) => failure.speed_mps === speed_mps).map((failure) => failure.message),
    }));
    return { check, variations: robust, timeDomainFailures: byScenario, passed: false, changes: verdict.changes, schedule: null };
  }
  const record: HandEditRecord = {
    statement:
      verdict.sections.length > 0
        ? 'Edited by hand after it was written, then re-verified densely by speedband reverify: the figures are those of that check.'
        : 'Re-verified densely by speedband reverify (no change against the checksum it carried).',
    changedSections: verdict.sections,
    toolVersion: VERSION,
    model: recorded ? edited.check.model.description : model.description,
    gridSize: check.points.length,
  };
  const { loop, controller, interpolation } = edited;
  const withoutChecksum: Omit<ScheduleFile, 'checksum'> & { checksum?: unknown } = {
    ...edited,
    status: 'passed',
    loop: { ...loop, error: loopErrorText(loop.kind, loop.preview_m ?? 0, loop.referencePoint ?? 'cg', loop.previewTime_s ?? 0) },
    controller: {
      ...controller,
      equation: CONTROLLER_EQUATION,
      feedForward: feedForwardText(loop.kind),
      update: controllerUpdateText(controller.discretisation, controller.antiWindup),
      integration: INTEGRATION_TEXT,
    },
    interpolation: { ...interpolation, description: interpolationText(interpolation.method, interpolation.lowSpeedFloor_mps) },
    units: gainUnits(loop.kind),
    breakpoints,
    ...(robust === null ? {} : { variations: robust.record }),
    check: {
      ...withoutScenarios(edited.check),
      ...(scenarioResult === null ? {} : { scenarios: scenarioResult.scenarios, speedChange: scenarioResult.speedChange }),
      passed: true,
      model: recorded ? edited.check.model : { kind: model.kind, description: model.description },
      gridSize: check.points.length,
      worst: recordedWorst(check.worst),
      failedSpeeds: 0,
      failures: check.points
        .filter((point) => point.failures.length > 0)
        .slice(0, LISTED_FAILURES)
        .map((point) => ({ speed_mps: point.speed_mps, messages: point.failures.map((f) => f.message) })),
      timeDomain: { ...edited.check.timeDomain, passed: true, failures: [] },
    },
    provenance: {
      ...edited.provenance,
      model: recorded ? edited.provenance.model : (model.summary as unknown as Readonly<Record<string, unknown>>),
      handEdits: [...(edited.provenance.handEdits ?? []), record],
    },
    cautions: [...SAFETY_CAUTIONS],
  };
  delete withoutChecksum.checksum;
  return {
    check,
    variations: robust,
    timeDomainFailures: [],
    passed: true,
    changes: verdict.changes,
    schedule: { ...withoutChecksum, checksum: computeScheduleChecksum(withoutChecksum) },
  };
}

/** The check without its scenario records (they are re-run, or dropped when the model cannot run them). */
function withoutScenarios(check: ScheduleFile['check']): ScheduleFile['check'] {
  const { scenarios: _scenarios, speedChange: _speedChange, ...rest } = check;
  return rest;
}

/**
 * The edited schedule's scenarios and speed-change certificate on the model, with the limits and steering limits it
 * records; null when it records no scenarios or the model is not the single-track one.
 */
function rerunScenarios(schedule: ScheduleFile, model: CheckModel): { scenarios: ScheduleScenarioCheck; speedChange: SpeedChangeCertificate } | null {
  const recorded = schedule.check.scenarios;
  const at = model.modelAt(schedule.check.range.minimum_mps);
  if (recorded === undefined || at.kind !== 'single-track') return null;
  const steeringLimits = schedule.check.timeDomain.steeringLimits;
  const parameters = at.parameters;
  const input = { schedule, parameters, steeringLimits, limits: recorded.limits, model: model.description, sizes: scheduleSpeedChanges(schedule) };
  const scenarios = judgeScheduleScenarios(input);
  const speedChange = scheduleSpeedChangeCertificate(input);
  return { scenarios, speedChange };
}
