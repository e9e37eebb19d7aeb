/**
 * What `speedband build` reports of a build: the reasons for exit 1, the JSON summary and the text summary
 * (the schedule table, the model, the worst case, the rule's warnings, the baseline, what was written). The
 * command only gathers the inputs, runs the build and prints these.
 */
import { failingSpeeds } from '../schedule/dense-check.js';
import { breakpointMargins } from '../schedule/breakpoint-margins.js';
import type { ScheduleFile } from '../schedule/schedule-types.js';
import type { BaselineCheck } from './baseline.js';
import type { BuildResult } from './build-schedule.js';
import { extrapolationWords } from './extrapolation.js';
import { formatVariations } from './robust-report.js';
import { formatBaseline, formatCautions, formatSchedule } from './schedule-report.js';

/** A written report: its file, outcome, size and sections. */
export interface WrittenReport {
  readonly file: string;
  readonly outcome: string;
  readonly bytes: number;
  readonly sections: readonly string[];
}

/** Everything the build's summary speaks of. */
export interface BuildSummaryInput {
  readonly result: BuildResult;
  /** The schedule's path, whether it was written (passed, or --allow-failing) and what the write did. */
  readonly out: string;
  readonly written: boolean;
  readonly outcome: string | null;
  readonly modelsOut?: string;
  /** The baseline schedule given, its path and its check on the new vehicle. */
  readonly baseline?: { readonly file: string; readonly schedule: ScheduleFile; readonly check: BaselineCheck };
  /** The report asked for (its path) and, when written, what was written. */
  readonly reportOut?: string;
  readonly report: WrittenReport | null;
}

/** Why the build exits 1 (empty: exit 0): the new schedule failing, the old gains failing on the new vehicle or over its variations. */
export function buildExitReasons(input: BuildSummaryInput): string[] {
  const { schedule } = input.result;
  const passed = schedule.status === 'passed';
  const robustFailed = schedule.check.passed && !passed;
  const check = input.baseline?.check.check;
  const overSet = input.baseline?.check.overVariations?.record;
  const file = input.baseline?.file;
  return [
    ...(passed
      ? []
      : [
          `the new schedule fails ${robustFailed ? "the worst case over the plan's variations (robust acceptance)" : 'its dense check'}${input.written ? ' (written marked failed, --allow-failing)' : ' (nothing written)'}`,
        ]),
    ...(check === undefined || check.passed
      ? []
      : [
          `the OLD gains of the baseline ${file} fail on the new vehicle model at ${check.failedCount} of ${check.points.length} speeds${passed ? ' (the new schedule passed and was written)' : ''}`,
        ]),
    ...(overSet === undefined || overSet.acceptance === 'nominal' || overSet.passed || (check !== undefined && !check.passed)
      ? []
      : [
          `the OLD gains of the baseline ${file} pass on the new nominal model but fail in the worst case over the new vehicle's variations at ${overSet.failedSpeeds} of ${overSet.gridSize} speeds (robust acceptance)`,
        ]),
  ];
}

/** The JSON summary `build --json` prints. */
export function buildSummaryJson(input: BuildSummaryInput): Record<string, unknown> {
  const { result, baseline, report } = input;
  const { schedule } = result;
  const exitReasons = buildExitReasons(input);
  const check = baseline?.check.check;
  return {
    file: input.written ? input.out : null,
    outcome: input.outcome,
    status: schedule.status,
    checksum: schedule.checksum.value,
    model: { kind: result.checkModel.kind, description: result.checkModel.description },
    controller: schedule.controller,
    breakpoints: schedule.breakpoints,
    check: schedule.check,
    variations: schedule.variations ?? null,
    extrapolations: result.extrapolations,
    derivations: result.tuned.map((point, k) => ({
      speed_mps: schedule.breakpoints[k].speed_mps,
      rule: point.derivation.rule,
      citation: point.derivation.citation,
      designModel: point.derivation.designModel,
      intermediate: point.derivation.intermediate,
      warnings: point.derivation.warnings,
    })),
    baseline:
      baseline === undefined || check === undefined
        ? null
        : {
            file: baseline.file,
            passedOnNewModel: check.passed,
            failedSpeeds: check.failedCount,
            gridSize: check.points.length,
            worst: check.worst,
            failures: failingSpeeds(check.points),
            overVariations: baseline.check.overVariations?.record ?? null,
            atNewBreakpoints: baseline.check.rows,
          },
    report: report === null ? null : { file: report.file, outcome: report.outcome, bytes: report.bytes, sections: report.sections },
    exitCode: exitReasons.length === 0 ? 0 : 1,
    exitReasons,
    cautions: schedule.cautions,
  };
}

/** A report written, in one line. */
export function reportWords(file: string, outcome: string, bytes: number, sections: readonly string[]): string {
  return `${outcome === 'written' ? 'Wrote' : 'Unchanged'} ${file} (${(bytes / 1024).toFixed(0)} KB; ${sections.join(', ')})\n`;
}

/** The text summary `build` prints. */
export function buildSummaryText(input: BuildSummaryInput): string {
  const { result, baseline, report } = input;
  const { schedule } = result;
  const passed = schedule.status === 'passed';
  const robustFailed = schedule.check.passed && !passed;
  const warnings = [...new Set([...result.extrapolations.map(extrapolationWords), ...result.tuned.flatMap((point) => point.derivation.warnings)])];
  let text = formatSchedule(schedule);
  text += `\n  model: ${result.checkModel.description}\n`;
  if (schedule.variations !== undefined) {
    text += `\n${formatVariations(
      schedule.variations,
      schedule.breakpoints.map((row) => row.margins),
      schedule.check.thresholds,
    )}`;
  }
  if (warnings.length > 0) text += `  rule warnings:\n${warnings.map((warning) => `    - ${warning}`).join('\n')}\n`;
  if (baseline !== undefined) {
    const verdict = baseline.check.check.passed ? 'still within the limits at every speed' : 'NOT within the limits everywhere';
    text += `\n${formatBaseline(`Baseline ${baseline.file}: its gains on the new vehicle model — ${verdict}`, baseline.check, baseline.schedule, result.checkModel.kind)}`;
    const overSet = baseline.check.overVariations?.record;
    if (overSet !== undefined) {
      const title = `Baseline ${baseline.file}: its gains in the worst case over the new vehicle's variations`;
      text += `\n${formatVariations(
        overSet,
        baseline.check.rows.map((row) => breakpointMargins(row.oldMargins)),
        baseline.schedule.check.thresholds,
        title,
      )}`;
    }
  }
  text += '\n';
  if (input.written) {
    text += `${input.outcome === 'written' ? 'Wrote' : 'Unchanged'} ${input.out} (status ${schedule.status}, checksum ${schedule.checksum.value.slice(0, 16)}…)\n`;
  } else {
    text += robustFailed
      ? `Nothing written: the schedule passes on the nominal model but not in the worst case over the plan's variations (see above). Retune for the weakest parameter, narrow the variations to what the vehicle really sees, set "variations": {"acceptance": "nominal"} to report the worst case without requiring it, or pass --allow-failing to write it marked failed for review.\n`
      : `Nothing written: the schedule fails its dense check, its time-domain limits or its scenarios (see above). Change the plan (rule parameters, breakpoints, limits) or pass --allow-failing to write it marked failed for review.\n`;
  }
  if (input.modelsOut !== undefined) text += `Wrote ${input.modelsOut}\n`;
  if (report !== null) text += reportWords(report.file, report.outcome, report.bytes, report.sections);
  else if (input.reportOut !== undefined) text += `No report written: it goes with the schedule, which was not written.\n`;
  const exitReasons = buildExitReasons(input);
  if (exitReasons.length > 0) text += `Exit 1: ${exitReasons.join('; and ')}.\n`;
  text += formatCautions();
  return text;
}
