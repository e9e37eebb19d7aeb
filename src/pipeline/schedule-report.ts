/**
 * The terminal report of a schedule: breakpoints with gains and proven margins, the worst grid
 * point of the dense check, inserted breakpoints, failures, and the safety cautions.
 */
import { atSpeed, overSpeedText } from '../core/by-speed.js';
import { describeControllerSettings } from '../controller/defaults.js';
import { formatScenarioCheck, formatSpeedChange } from './scenario-report.js';
import { scheduleSpeedChanges } from './simulate-schedule.js';
import { escapeControlCharacters } from '../core/quote.js';
import { fixedOrDash, precisionOrDash, textTable } from '../core/text-table.js';
import type { BreakpointMargins, ScheduleFile } from '../schedule/schedule-types.js';
import type { AcceptanceThresholds, CheckCriterion, DenseCheckResult, WorstMargins } from '../schedule/types.js';
import { judgeMargins } from '../schedule/dense-check.js';
import { modelWords, previewText, referencePointText } from '../schedule/schedule-text.js';
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
    entry('peak complementary sensitivity Mt (largest)', worst.complementarySensitivityPeak, 3, ''),
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
  complementarySensitivityPeak: 'Mt',
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
    `Schedule for ${schedule.vehicle.name}: ${loop.kind} loop${loop.kind === 'path' ? ` (preview ${previewText(loop.preview_m ?? 0, loop.previewTime_s ?? 0)} from the ${referencePointText(loop.referencePoint ?? 'cg')})` : ''}, ` +
      `rule ${schedule.provenance.rule.name}${schedule.provenance.rule.tuneFor === 'fastest-passing' ? ` (fastest passing${schedule.provenance.rule.searchOn === 'worst-case' ? ' in the worst case over the variations' : ''})` : ''}, ${schedule.interpolation.method} interpolation`,
  );
  lines.push(`  controller the gains assume: ${describeControllerSettings(schedule.controller)}`);
  lines.push(`  error: ${loop.error}`);
  lines.push(`  units: kp ${schedule.units.kp}; ki ${schedule.units.ki}; kd ${schedule.units.kd}`);
  lines.push(...formatRuleParameters(schedule));
  lines.push('');
  const rows = [['speed m/s', 'kp', 'ki', 'kd', 'lower GM dB', 'upper GM dB', 'PM °', 'delay margin s', 'Ms', 'Mt', 'closed loop', 'limits', '']];
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
      fixedOrDash(m.complementarySensitivityPeak, 3),
      m.verdict,
      limitsCell(m, atSpeed(schedule.check.thresholds, breakpoint.speed_mps)),
      breakpoint.insertedByRefinement ? 'inserted' : '',
    ]);
  }
  lines.push(...textTable(rows, [true, true, true, true, true, true, true, true, true, true, false, false, false]).map((line) => `  ${line}`));
  lines.push('');
  lines.push(...formatTimeDomain(schedule));
  lines.push('');
  lines.push(
    ...formatCheck({
      modelKind: schedule.check.model.kind,
      passed: schedule.check.failedSpeeds === 0,
      gridSize: schedule.check.gridSize,
      failedSpeeds: schedule.check.failedSpeeds,
      worst: schedule.check.worst,
      schedule,
    }),
  );
  if (schedule.check.insertions.length > 0) {
    lines.push('', '  breakpoints inserted by refinement:');
    for (const insertion of schedule.check.insertions) lines.push(`    ${insertion.speed_mps.toFixed(2)} m/s: ${insertion.reason}`);
  }
  if (schedule.check.failures.length > 0) {
    lines.push('', '  failing speeds (first 10):');
    for (const failure of schedule.check.failures.slice(0, 10)) lines.push(`    ${failure.speed_mps.toFixed(2)} m/s: ${failure.messages.join('; ')}`);
  }
  if (schedule.check.scenarios !== undefined)
    lines.push('', formatScenarioCheck(schedule.check.scenarios, schedule.loop.kind, scheduleSpeedChanges(schedule)).trimEnd());
  if (schedule.check.speedChange !== undefined) lines.push(formatSpeedChange(schedule.check.speedChange).trimEnd());
  return `${lines.join('\n')}\n`;
}

/**
 * The time-domain figures per breakpoint (exact sampled linear closed loop): set-point weight b, feed-forward
 * gain and lead time, reference-step overshoot and settling, disturbance recovery, lane change and curve
 * entry (path), a step through the actuator's limits (heading, yaw rate), the largest reference within them.
 */
export function formatTimeDomain(schedule: ScheduleFile): string[] {
  const path = schedule.loop.kind === 'path';
  const head = ['speed m/s', 'b', `kff ${schedule.units.feedForward}`, 'T_ff s', 'overshoot %', 'settle s', 'misalign. s', 'force s'];
  if (path) head.push('lane change m', 'curve m');
  else head.push('limited step', 'settle s');
  head.push(path ? 'largest lane change m' : 'largest step');
  const rows = [head];
  for (const breakpoint of schedule.breakpoints) {
    const t = breakpoint.timeDomain;
    const row = [
      breakpoint.speed_mps.toFixed(2),
      breakpoint.setpointWeightProportional.toFixed(2),
      precisionOrDash(breakpoint.feedForward, 4),
      fixedOrDash(breakpoint.feedForwardLeadTime_s, 2),
      fixedOrDash(t?.referenceStep.overshoot_pct ?? null, 1),
      fixedOrDash(t?.referenceStep.settlingTime_s ?? null, 2),
      fixedOrDash(t?.steeringMisalignment.recoveryTime_s ?? null, 1),
      fixedOrDash(t?.lateralForce?.recoveryTime_s ?? null, 1),
    ];
    if (path) row.push(fixedOrDash(t?.laneChange?.peakError_m ?? null, 3), fixedOrDash(t?.curveEntry?.errorAfterSettle_m ?? null, 3));
    else
      row.push(
        t?.limitedStep == null ? '—' : `${Number(t.limitedStep.size.toPrecision(3))}: ${fixedOrDash(t.limitedStep.overshoot_pct, 1)} %`,
        fixedOrDash(t?.limitedStep?.settlingTime_s ?? null, 2),
      );
    row.push(t === null ? '—' : `${precisionOrDash(t.actuator.largestReference, 3)} (${t.actuator.limitedBy})`);
    rows.push(row);
  }
  const l = schedule.check.timeDomain.limits;
  const limits = [
    `overshoot ≤ ${overSpeedText(l.maximumOvershoot_pct)} %`,
    `misalignment and force removed to 5 % within ${overSpeedText(l.maximumRecoveryTime_s)} s`,
  ];
  if (path) {
    limits.push(
      `lane-change error ≤ ${overSpeedText(l.maximumLaneChangeError_m)} m`,
      `curve-entry error ≤ ${overSpeedText(l.maximumCurveEntryError_m)} m 3 s after entry`,
    );
  } else if (schedule.loop.kind === 'heading') {
    limits.push('a step through the steering limits settles within the same overshoot limit');
  } else {
    // The yaw-rate loop's step through the limits must settle; its overshoot is shown, not limited (time-domain-limits.ts).
    limits.push('a step through the steering limits settles, judged on settling only (its overshoot shown, not limited)');
  }
  const lines = [
    `  time domain (exact sampled linear closed loop at each breakpoint; ${schedule.check.timeDomain.passed ? 'within every limit' : 'LIMITS BROKEN'}): ${limits.join('; ')}`,
    ...textTable(
      rows,
      rows[0].map((_, i) => i !== 9 || path),
    ).map((line) => `  ${line}`),
  ];
  for (const failure of schedule.check.timeDomain.failures.slice(0, 10)) lines.push(`    ${failure.speed_mps.toFixed(2)} m/s: ${failure.messages.join('; ')}`);
  const searches = schedule.provenance.rule.searchAtBreakpoints ?? [];
  if (searches.length > 0) {
    lines.push('  fastest-passing search:');
    for (const search of searches) lines.push(`    ${search.speed_mps.toFixed(2)} m/s: ${search.outcome}, ${search.reason}`);
  }
  return lines;
}

/** A dense check's outcome to print against a schedule's settings (formatCheck). */
export interface CheckSummary {
  /** The kind of model checked on (modelWords). */
  readonly modelKind: string;
  /** Whether every speed of the grid passed. */
  readonly passed: boolean;
  /** Speeds on the check grid. */
  readonly gridSize: number;
  /** Speeds that failed a limit. */
  readonly failedSpeeds: number;
  /** The worst figures over the grid. */
  readonly worst: WorstMargins;
  /** The schedule whose thresholds and range the check used. */
  readonly schedule: ScheduleFile;
}

/** The dense check's verdict, its thresholds and worst figures. */
export function formatCheck(summary: CheckSummary): string[] {
  const { modelKind, passed, gridSize, failedSpeeds, worst, schedule } = summary;
  const t = schedule.check.thresholds;
  return [
    `  dense check on the ${modelWords(modelKind)}, ${gridSize} speeds from ${schedule.check.range.minimum_mps.toFixed(2)} to ${schedule.check.range.maximum_mps.toFixed(2)} m/s: ` +
      (passed ? 'PASSED' : `FAILED at ${failedSpeeds} speeds`),
    `  limits: lower GM ≤ ${overSpeedText(t.maximumLowerGainMargin_dB)} dB, upper GM ≥ ${overSpeedText(t.minimumUpperGainMargin_dB)} dB, PM ≥ ${overSpeedText(t.minimumPhaseMargin_deg)}°, ` +
      `Ms ≤ ${overSpeedText(t.maximumSensitivityPeak)}, Mt ≤ ${overSpeedText(t.maximumComplementarySensitivityPeak)}, delay margin ≥ ${overSpeedText(t.minimumDelayMargin_s, (v) => v.toFixed(3))} s`,
    '  worst over the grid:',
    ...formatWorstMargins(worst).map((line) => `  ${line}`),
  ];
}

/** A dense check result against a schedule's own settings (for `check` and the baseline check). */
export function formatRecheck(title: string, result: DenseCheckResult, schedule: ScheduleFile, modelKind: string): string {
  const lines = [
    title,
    ...formatCheck({ modelKind, passed: result.passed, gridSize: result.points.length, failedSpeeds: result.failedCount, worst: result.worst, schedule }),
  ];
  const failing = result.points.filter((point) => point.failures.length > 0);
  if (failing.length > 0) {
    lines.push('  failing speeds (first 10):');
    for (const point of failing.slice(0, 10))
      lines.push(`    ${point.speed_mps.toFixed(2)} m/s: ${point.failures.map((failure) => failure.message).join('; ')}`);
  }
  return `${lines.join('\n')}\n`;
}

/** The cautions, as a block to print wherever a schedule is written. */
export function formatCautions(): string {
  return `Safety:\n${SAFETY_CAUTIONS.map((caution) => `  - ${caution}`).join('\n')}\n`;
}

/** Side by side at each new breakpoint: the new gains and margins, and the old gains' margins on the new vehicle. */
export function formatBaseline(title: string, baseline: import('./baseline.js').BaselineCheck, old: ScheduleFile, modelKind: string): string {
  const rows = [
    [
      'speed m/s',
      'new kp',
      'new ki',
      'new kd',
      'new PM °',
      'new upper GM dB',
      '|',
      'old kp',
      'old ki',
      'old kd',
      'old PM °',
      'old upper GM dB',
      'old Ms',
      'old gains',
    ],
  ];
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
