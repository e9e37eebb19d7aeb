/**
 * The terminal report of a schedule: breakpoints with gains and proven margins, the worst grid
 * point of the dense check, inserted breakpoints, failures, and the safety cautions.
 */
import { describeControllerSettings } from '../controller/defaults.js';
import { escapeControlCharacters } from '../core/quote.js';
import { fixedOrDash, precisionOrDash, textTable } from '../core/text-table.js';
import type { BreakpointMargins, ScheduleFile } from '../schedule/schedule-types.js';
import type { AcceptanceThresholds, CheckCriterion, DenseCheckResult, WorstMargins } from '../schedule/types.js';
import { judgeMargins } from '../schedule/dense-check.js';
import { modelWords } from '../schedule/schedule-text.js';
import type { LoopMargins } from '../verify/types.js';
import { SAFETY_CAUTIONS } from '../core/safety.js';

/** One line per worst figure: value, unit and the speed where it occurs. */
export function formatWorstMargins(worst: WorstMargins): string[] {
  const entry = (label: string, value: { value: number; speed_mps: number } | null, digits: number, unit: string): string =>
    value === null ? `  ${label}: none on the grid` : `  ${label}: ${value.value.toFixed(digits)} ${unit} at ${value.speed_mps.toFixed(2)} m/s`;
  return [
    entry('lower gain margin (closest to 0 dB)', worst.lowerGainMargin_dB, 2, 'dB'),
    entry('upper gain margin (smallest)', worst.upperGainMargin_dB, 2, 'dB'),
    entry('phase margin (smallest)', worst.phaseMargin_deg, 1, '°'),
    entry('delay margin (smallest)', worst.delayMargin_s, 4, 's'),
    entry('peak sensitivity Ms (largest)', worst.sensitivityPeak, 3, ''),
  ];
}

/** The rule's parameters as the plan wrote them, and those that vary with speed as resolved at the breakpoints. */
export function formatRuleParameters(schedule: ScheduleFile): string[] {
  const written = Object.entries(schedule.provenance.rule.parameters);
  if (written.length === 0) return [];
  const shown = (value: unknown): string =>
    typeof value === 'string' ? escapeControlCharacters(value) : typeof value === 'number' ? String(value) : `table over speed ${JSON.stringify(value)}`;
  const lines = [`  rule parameters: ${written.map(([name, value]) => `${name} = ${shown(value)}`).join('; ')}`];
  const atBreakpoints = schedule.provenance.rule.parametersAtBreakpoints ?? [];
  for (const [name, value] of written) {
    if (typeof value === 'number' || name === 'controllerType' || atBreakpoints.length === 0) continue;
    const values = atBreakpoints.map((entry) => entry.parameters[name]).map((v) => (typeof v === 'number' ? String(Number(v.toPrecision(4))) : String(v)));
    lines.push(`    ${name} at the breakpoints: ${values.join(', ')}`);
  }
  return lines;
}

/** The margins a criterion names, in the words of the table's header. */
export const CRITERION_WORDS: Readonly<Record<CheckCriterion, string>> = {
  stability: 'unstable',
  lowerGainMargin: 'lower GM',
  upperGainMargin: 'upper GM',
  phaseMargin: 'PM',
  delayMargin: 'delay margin',
  sensitivityPeak: 'Ms',
};

/** "pass", or "FAIL: PM, Ms": a breakpoint's margins against the schedule's limits (the verdict column says only whether the loop is stable). */
export function limitsCell(margins: BreakpointMargins, thresholds: AcceptanceThresholds): string {
  const failures = judgeMargins(margins as unknown as LoopMargins, thresholds);
  return failures.length === 0 ? 'pass' : `FAIL: ${failures.map((failure) => CRITERION_WORDS[failure.criterion]).join(', ')}`;
}

/** Breakpoint table, check summary and cautions of a schedule. */
export function formatSchedule(schedule: ScheduleFile): string {
  const lines: string[] = [];
  const loop = schedule.loop;
  lines.push(
    `Schedule for ${schedule.vehicle.name}: ${loop.kind} loop${loop.kind === 'path' ? ` (preview ${loop.preview_m} m from the ${loop.referencePoint})` : ''}, ` +
      `rule ${schedule.provenance.rule.name}, ${schedule.interpolation.method} interpolation`,
  );
  lines.push(`  controller the gains assume: ${describeControllerSettings(schedule.controller)}`);
  lines.push(`  error: ${loop.error}`);
  lines.push(`  units: kp ${schedule.units.kp}; ki ${schedule.units.ki}; kd ${schedule.units.kd}`);
  lines.push(...formatRuleParameters(schedule));
  lines.push('');
  const rows = [['speed m/s', 'kp', 'ki', 'kd', 'lower GM dB', 'upper GM dB', 'PM °', 'delay margin s', 'Ms', 'closed loop', 'limits', '']];
  for (const breakpoint of schedule.breakpoints) {
    const m = breakpoint.margins;
    rows.push([
      breakpoint.speed_mps.toFixed(2),
      precisionOrDash(breakpoint.kp, 4),
      precisionOrDash(breakpoint.ki, 4),
      precisionOrDash(breakpoint.kd, 4),
      fixedOrDash(m.lowerGainMargin_dB, 2),
      fixedOrDash(m.upperGainMargin_dB, 2),
      fixedOrDash(m.phaseMargin_deg, 1),
      fixedOrDash(m.delayMargin_s, 4),
      fixedOrDash(m.sensitivityPeak, 3),
      m.verdict,
      limitsCell(m, schedule.check.thresholds),
      breakpoint.insertedByRefinement ? 'inserted' : '',
    ]);
  }
  lines.push(...textTable(rows, [true, true, true, true, true, true, true, true, true, false, false, false]).map((line) => `  ${line}`));
  lines.push('');
  lines.push(...formatCheck(schedule.check.model.kind, schedule.check.passed, schedule.check.gridSize, schedule.check.failedSpeeds, schedule.check.worst, schedule));
  if (schedule.check.insertions.length > 0) {
    lines.push('', '  breakpoints inserted by refinement:');
    for (const insertion of schedule.check.insertions) lines.push(`    ${insertion.speed_mps.toFixed(2)} m/s: ${insertion.reason}`);
  }
  if (schedule.check.failures.length > 0) {
    lines.push('', '  failing speeds (first 10):');
    for (const failure of schedule.check.failures.slice(0, 10)) lines.push(`    ${failure.speed_mps.toFixed(2)} m/s: ${failure.messages.join('; ')}`);
  }
  return `${lines.join('\n')}\n`;
}

/** The dense check's verdict, its thresholds and worst figures. */
export function formatCheck(modelKind: string, passed: boolean, gridSize: number, failedSpeeds: number, worst: WorstMargins, schedule: ScheduleFile): string[] {
  const t = schedule.check.thresholds;
  return [
    `  dense check on the ${modelWords(modelKind)}, ${gridSize} speeds from ${schedule.check.range.minimum_mps.toFixed(2)} to ${schedule.check.range.maximum_mps.toFixed(2)} m/s: ` +
      (passed ? 'PASSED' : `FAILED at ${failedSpeeds} speeds`),
    `  limits: lower GM ≤ ${t.maximumLowerGainMargin_dB} dB, upper GM ≥ ${t.minimumUpperGainMargin_dB} dB, PM ≥ ${t.minimumPhaseMargin_deg}°, ` +
      `Ms ≤ ${t.maximumSensitivityPeak}, delay margin ≥ ${t.minimumDelayMargin_s.toFixed(3)} s`,
    '  worst over the grid:',
    ...formatWorstMargins(worst).map((line) => `  ${line}`),
  ];
}

/** A dense check result against a schedule's own settings (for `check` and the baseline check). */
export function formatRecheck(title: string, result: DenseCheckResult, schedule: ScheduleFile, modelKind: string): string {
  const lines = [title, ...formatCheck(modelKind, result.passed, result.points.length, result.failedCount, result.worst, schedule)];
  const failing = result.points.filter((point) => point.failures.length > 0);
  if (failing.length > 0) {
    lines.push('  failing speeds (first 10):');
    for (const point of failing.slice(0, 10)) lines.push(`    ${point.speed_mps.toFixed(2)} m/s: ${point.failures.map((failure) => failure.message).join('; ')}`);
  }
  return `${lines.join('\n')}\n`;
}

/** The cautions, as a block to print wherever a schedule is written. */
export function formatCautions(): string {
  return `Safety:\n${SAFETY_CAUTIONS.map((caution) => `  - ${caution}`).join('\n')}\n`;
}

/** Side by side at each new breakpoint: the new gains and margins, and the old gains' margins on the new vehicle. */
export function formatBaseline(title: string, baseline: import('./baseline.js').BaselineCheck, old: ScheduleFile, modelKind: string): string {
  const rows = [['speed m/s', 'new kp', 'new ki', 'new kd', 'new PM °', 'new upper GM dB', '|', 'old kp', 'old ki', 'old kd', 'old PM °', 'old upper GM dB', 'old Ms', 'old gains']];
  for (const row of baseline.rows) {
    rows.push([
      row.speed_mps.toFixed(2),
      precisionOrDash(row.newGains.kp, 4),
      precisionOrDash(row.newGains.ki, 4),
      precisionOrDash(row.newGains.kd, 4),
      fixedOrDash(row.newMargins.phaseMargin_deg, 1),
      fixedOrDash(row.newMargins.upperGainMargin_dB, 2),
      '|',
      precisionOrDash(row.oldGains.kp, 4),
      precisionOrDash(row.oldGains.ki, 4),
      precisionOrDash(row.oldGains.kd, 4),
      fixedOrDash(row.oldMargins.phaseMargin_deg, 1),
      fixedOrDash(row.oldMargins.upperGainMargin_dB, 2),
      fixedOrDash(row.oldMargins.sensitivityPeak, 3),
      row.oldFailures.length === 0 ? 'within limits' : `FAIL: ${row.oldFailures.join('; ')}`,
    ]);
  }
  const table = textTable(rows, [true, true, true, true, true, true, false, true, true, true, true, true, true, false]).map((line) => `  ${line}`);
  return `${formatRecheck(title, baseline.check, old, modelKind)}\n  at the new breakpoints, side by side (same vehicle model, each with its own controller settings):\n${table.join('\n')}\n`;
}
