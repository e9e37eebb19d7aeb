/**
 * Compare two schedules after a vehicle change: what moved in the gains, in the proven margins,
 * in the model behind them and in the settings, and what moved past the thresholds (flags).
 * Pure: no files, no clock; the same inputs give the same record.
 */
import type { ScheduleFile } from '../schedule/schedule-types.js';
import { scheduleLookup } from '../schedule/schedule-lookup.js';
import type { GainsAtSpeed } from '../schedule/types.js';
import { gainChange, marginChange, marginDrop } from './changes.js';
import { resolveThresholds } from './defaults.js';
import { shown, shownPercent, shownSpeed } from './format.js';
import { modelDrift } from './model-drift.js';
import { marginsAtSpeed, matchSpeeds, type ComparedPoint } from './resample.js';
import { settingChanges } from './settings.js';
import { oldGainsFlagMessage } from './old-gains-words.js';
import type {
  OldGainsOnNewVehicle,
  CompareThresholds,
  ComparedSpeed,
  ComparisonFlag,
  ScheduleComparison,
  ScheduleSummary,
  WorstMarginChange,
} from './types.js';

const GAINS = ['kp', 'ki', 'kd'] as const;

const NOT_CHECKED: OldGainsOnNewVehicle = {
  available: false,
  reason: 'not checked (the caller gave no dense check of the old gains on the new vehicle model)',
};
const FLAGGED_MARGINS = ['lowerGainMargin_dB', 'upperGainMargin_dB', 'phaseMargin_deg'] as const;
type FlaggedMargin = (typeof FLAGGED_MARGINS)[number];

const MARGIN_WORDS: Record<FlaggedMargin, { name: string; unit: string; kind: ComparisonFlag['kind'] }> = {
  lowerGainMargin_dB: { name: 'lower gain margin', unit: 'dB', kind: 'lowerGainMarginCloser' },
  upperGainMargin_dB: { name: 'upper gain margin', unit: 'dB', kind: 'upperGainMarginDrop' },
  phaseMargin_deg: { name: 'phase margin', unit: '°', kind: 'phaseMarginDrop' },
};

function summary(schedule: ScheduleFile): ScheduleSummary {
  return {
    vehicle: schedule.vehicle.name,
    status: schedule.status,
    loopKind: schedule.loop.kind,
    breakpoints: schedule.breakpoints.length,
    checksum: schedule.checksum.value,
    units: { kp: schedule.units.kp, ki: schedule.units.ki, kd: schedule.units.kd },
    controller: {
      derivativeFilter: schedule.controller.derivativeFilter,
      sampleTime_s: schedule.controller.sampleTime_s,
      discretisation: schedule.controller.discretisation,
      computationLatency_s: schedule.controller.computationLatency_s,
    },
  };
}

interface Side {
  readonly schedule: ScheduleFile;
  readonly lookup: GainsAtSpeed;
}

function compareAtSpeed(old: Side, next: Side, point: ComparedPoint, comparable: boolean, thresholds: CompareThresholds): ComparedSpeed {
  const { speed_mps, oldSpeed_mps, newSpeed_mps } = point;
  const oldGains = old.lookup(oldSpeed_mps);
  const newGains = next.lookup(newSpeed_mps);
  const oldMargins = marginsAtSpeed(old.schedule, oldSpeed_mps);
  const newMargins = marginsAtSpeed(next.schedule, newSpeed_mps);
  const flaggedMargin = (name: FlaggedMargin) =>
    marginChange(oldMargins.value(name), newMargins.value(name), name === 'lowerGainMargin_dB' ? 'towardZero' : 'decrease', marginDrop(name, thresholds));
  return {
    speed_mps,
    oldSpeed_mps,
    newSpeed_mps,
    oldSource: oldMargins.atBreakpoint ? 'breakpoint' : 'interpolated',
    newSource: newMargins.atBreakpoint ? 'breakpoint' : 'interpolated',
    kp: gainChange({ old: oldGains.kp, new: newGains.kp, comparable, thresholds }),
    ki: gainChange({ old: oldGains.ki, new: newGains.ki, comparable, thresholds }),
    kd: gainChange({ old: oldGains.kd, new: newGains.kd, comparable, thresholds }),
    lowerGainMargin_dB: flaggedMargin('lowerGainMargin_dB'),
    upperGainMargin_dB: flaggedMargin('upperGainMargin_dB'),
    phaseMargin_deg: flaggedMargin('phaseMargin_deg'),
    delayMargin_s: marginChange(oldMargins.value('delayMargin_s'), newMargins.value('delayMargin_s'), 'none', 0),
    sensitivityPeak: marginChange(oldMargins.value('sensitivityPeak'), newMargins.value('sensitivityPeak'), 'none', 0),
    oldStable: oldMargins.stable,
    newStable: newMargins.stable,
  };
}

function speedFlags(row: ComparedSpeed, thresholds: CompareThresholds): ComparisonFlag[] {
  const at = `at ${shownSpeed(row.speed_mps)} m/s`;
  const flags: ComparisonFlag[] = [];
  for (const name of GAINS) {
    const gain = row[name];
    if (!gain.flagged) continue;
    const message =
      gain.change_pct === null
        ? `${name} ${at}: ${shown(gain.old)} → ${shown(gain.new)} (from 0: change ${shown(gain.change)} is past ${shown(thresholds.gainChangeFromZero)})`
        : `${name} ${at}: ${shown(gain.old)} → ${shown(gain.new)} (${shownPercent(gain.change_pct)}, limit ±${thresholds.gainChange_pct} %)`;
    flags.push({ kind: 'gainChange', speed_mps: row.speed_mps, quantity: name, message });
  }
  for (const name of FLAGGED_MARGINS) {
    const margin = row[name];
    if (!margin.flagged) continue;
    const words = MARGIN_WORDS[name];
    const message =
      margin.old === null
        ? `${words.name} ${at}: none before (unbounded), now ${shown(margin.new)} ${words.unit}`
        : `${words.name} ${at}: ${shown(margin.old)} → ${shown(margin.new)} ${words.unit} (${name === 'lowerGainMargin_dB' ? 'closer to 0 dB' : 'lost'} by ${shown(Math.abs(margin.change ?? 0))} ${words.unit}, limit ${marginDrop(name, thresholds)} ${words.unit})`;
    flags.push({ kind: words.kind, speed_mps: row.speed_mps, quantity: name, message });
  }
  if (row.oldStable && !row.newStable) {
    flags.push({ kind: 'stabilityLost', speed_mps: row.speed_mps, quantity: 'stable', message: `the loop ${at} was proven stable before and is not now` });
  }
  return flags;
}

function worstChange(old: ScheduleFile, next: ScheduleFile, name: FlaggedMargin, thresholds: CompareThresholds): WorstMarginChange {
  const before = old.check.worst[name];
  const after = next.check.worst[name];
  const change = marginChange(
    before?.value ?? null,
    after?.value ?? null,
    name === 'lowerGainMargin_dB' ? 'towardZero' : 'decrease',
    marginDrop(name, thresholds),
  );
  return { old: before, new: after, change: change.change, flagged: change.flagged };
}

/**
 * Compare schedule `old` with schedule `next` (both as read by readSchedule).
 * - Compared speeds: the union of both breakpoint speeds inside the common breakpoint range, two
 *   breakpoints within thresholds.speedTolerance_mps being one speed (resample.ts matchSpeeds);
 *   gains from each schedule's own lookup, margins from its breakpoints (linear between them,
 *   see resample.ts); breakpoints outside the common range are listed as not compared.
 * - Gain changes in each gain's unit and in % (100·(new − old)/old; null when old = 0, when the
 *   absolute change decides), flagged at ±thresholds.gainChange_pct.
 * - Margins (dB, degrees): flagged when the upper gain margin drops by gainMarginDrop_dB, the lower
 *   gain margin moves that much closer to 0 dB, the phase margin drops by phaseMarginDrop_deg, or a
 *   crossing appears; the same for the worst margins of each dense check; a speed proven stable
 *   before and not now, and a passed check that now fails, are flagged.
 * - Settings: a different loop kind, preview, reference point, controller form, sample time or
 *   discretisation makes the gains not comparable one by one (gainsComparable false: gain changes
 *   null and not flagged); every setting change is flagged.
 * - Model drift from provenance.model (model-drift.ts); an understeering model that became
 *   oversteering (understeer gradient K > 0 → K < 0, Gillespie 1992 §6) is flagged.
 * - `oldGainsOnNewVehicle`: the dense check of the old gains on the new vehicle model, when the caller ran it
 *   (`oldGainsOnNewVehicle` in src/pipeline/baseline.ts; this function stays pure) — it leads the record and, when
 *   the old gains fail, the flags.
 * Thresholds default to COMPARE_DEFAULTS.
 */
export function compareSchedules(
  old: ScheduleFile,
  next: ScheduleFile,
  thresholdsGiven: Partial<CompareThresholds> = {},
  oldGainsOnNewVehicle: OldGainsOnNewVehicle = NOT_CHECKED,
): ScheduleComparison {
  const thresholds = resolveThresholds(thresholdsGiven);
  const settings = settingChanges(old, next, thresholds.speedTolerance_mps);
  const gainsComparable = settings.every((change) => !change.breaksGainComparison);
  const oldSpeeds = old.breakpoints.map((row) => row.speed_mps);
  const newSpeeds = next.breakpoints.map((row) => row.speed_mps);
  const match = matchSpeeds(oldSpeeds, newSpeeds, thresholds.speedTolerance_mps);
  const commonRange = match.commonRange;
  const oldSide: Side = { schedule: old, lookup: scheduleLookup(old) };
  const newSide: Side = { schedule: next, lookup: scheduleLookup(next) };
  const speeds = match.points.map((point) => compareAtSpeed(oldSide, newSide, point, gainsComparable, thresholds));

  const flags: ComparisonFlag[] = [];
  if (oldGainsOnNewVehicle.available && !oldGainsOnNewVehicle.passed) {
    flags.push({ kind: 'oldGainsFailOnNewVehicle', speed_mps: null, quantity: 'oldGainsOnNewVehicle', message: oldGainsFlagMessage(oldGainsOnNewVehicle) });
  }
  flags.push(
    ...settings.map(
      (change): ComparisonFlag => ({
        kind: 'settingChanged',
        speed_mps: null,
        quantity: change.setting,
        message: `${change.setting}: ${String(change.old ?? 'none')} → ${String(change.new ?? 'none')}${
          change.breaksGainComparison ? ' — the gains are not comparable one by one; compare the margins and re-verify the new schedule' : ''
        }`,
      }),
    ),
  );
  if (commonRange === null) {
    flags.push({
      kind: 'noCommonSpeeds',
      speed_mps: null,
      quantity: 'speed_mps',
      message: `the breakpoint ranges do not overlap (${shownSpeed(oldSpeeds[0])}–${shownSpeed(oldSpeeds[oldSpeeds.length - 1])} m/s before, ${shownSpeed(newSpeeds[0])}–${shownSpeed(newSpeeds[newSpeeds.length - 1])} m/s now): nothing to compare speed by speed`,
    });
  }
  for (const row of speeds) flags.push(...speedFlags(row, thresholds));

  const worst = {
    lowerGainMargin_dB: worstChange(old, next, 'lowerGainMargin_dB', thresholds),
    upperGainMargin_dB: worstChange(old, next, 'upperGainMargin_dB', thresholds),
    phaseMargin_deg: worstChange(old, next, 'phaseMargin_deg', thresholds),
  };
  for (const name of FLAGGED_MARGINS) {
    const change = worst[name];
    if (!change.flagged) continue;
    const words = MARGIN_WORDS[name];
    const where = (value: { value: number; speed_mps: number } | null) =>
      value === null ? 'none' : `${shown(value.value)} ${words.unit} at ${shownSpeed(value.speed_mps)} m/s`;
    flags.push({
      kind: words.kind,
      speed_mps: null,
      quantity: `worst ${name}`,
      message: `worst ${words.name} of the dense check: ${where(change.old)} → ${where(change.new)}`,
    });
  }
  if (old.status === 'passed' && next.status === 'failed') {
    const overSet = next.check.passed && next.variations !== undefined;
    flags.push({
      kind: 'checkNowFails',
      speed_mps: null,
      quantity: 'status',
      message: overSet
        ? `the new schedule fails the worst case over its variations (${next.variations!.failedSpeeds} of ${next.variations!.gridSize} speeds, robust acceptance); the old one passed`
        : `the new schedule's dense check fails (${next.check.failedSpeeds} of ${next.check.gridSize} speeds); the old one passed`,
    });
  }

  const drift = modelDrift(old, next);
  if (drift.available) {
    const gradient = drift.parameters.find((parameter) => parameter.name === 'understeerGradient_radPerMps2');
    if (gradient !== undefined && gradient.old > 0 && gradient.new < 0) {
      flags.push({
        kind: 'understeerBecameOversteer',
        speed_mps: null,
        quantity: 'understeerGradient_radPerMps2',
        message: `the model now oversteers: understeer gradient ${shown(gradient.old)} → ${shown(gradient.new)} rad per m/s² — above its critical speed the vehicle is open-loop unstable`,
      });
    }
  }

  return {
    old: summary(old),
    new: summary(next),
    oldGainsOnNewVehicle,
    thresholds,
    gainsComparable,
    settingChanges: settings,
    commonRange,
    sameBreakpoints:
      oldSpeeds.length === newSpeeds.length &&
      speeds.length === oldSpeeds.length &&
      speeds.every((row) => row.oldSource === 'breakpoint' && row.newSource === 'breakpoint'),
    speeds,
    notCompared: match.notCompared,
    worst,
    modelDrift: drift,
    flags,
  };
}
