/**
 * Settings two schedules must share to be compared gain by gain. A different loop (kind, preview
 * distance, reference point), controller form, sample time or discretisation changes what a gain
 * means or what the firmware computes from it: the gains are then not comparable one by one.
 * Other differences (derivative filter, interpolation, floor, integrator clamp, latency) are
 * reported and flagged but leave the gains comparable.
 */
import type { ScheduleFile } from '../schedule/schedule-types.js';
import type { SettingChange } from './types.js';

type Value = string | number | null;

interface SettingDefinition {
  readonly setting: string;
  readonly read: (schedule: ScheduleFile) => Value;
  readonly breaksGainComparison: boolean;
  /** Values closer than this count as equal (speeds use the comparison's speed tolerance); exact otherwise. */
  readonly speedLike?: boolean;
}

const SETTINGS: readonly SettingDefinition[] = [
  { setting: 'loop.kind', read: (s) => s.loop.kind, breaksGainComparison: true },
  { setting: 'loop.preview_m', read: (s) => s.loop.preview_m ?? null, breaksGainComparison: true },
  { setting: 'loop.previewTime_s', read: (s) => s.loop.previewTime_s ?? 0, breaksGainComparison: true },
  { setting: 'loop.referencePoint', read: (s) => s.loop.referencePoint ?? null, breaksGainComparison: true },
  { setting: 'controller.form', read: (s) => s.controller.form, breaksGainComparison: true },
  { setting: 'controller.sampleTime_s', read: (s) => s.controller.sampleTime_s, breaksGainComparison: true },
  { setting: 'controller.discretisation', read: (s) => s.controller.discretisation, breaksGainComparison: true },
  { setting: 'controller.derivativeFilter', read: (s) => s.controller.derivativeFilter, breaksGainComparison: false },
  { setting: 'controller.computationLatency_s', read: (s) => s.controller.computationLatency_s, breaksGainComparison: false },
  { setting: 'controller.integratorClamp_rad', read: (s) => s.controller.integratorClamp_rad, breaksGainComparison: false },
  { setting: 'controller.antiWindup', read: (s) => s.controller.antiWindup, breaksGainComparison: false },
  { setting: 'interpolation.method', read: (s) => s.interpolation.method, breaksGainComparison: false },
  { setting: 'interpolation.lowSpeedFloor_mps', read: (s) => s.interpolation.lowSpeedFloor_mps, breaksGainComparison: false, speedLike: true },
];

const same = (before: Value, after: Value, tolerance: number): boolean =>
  before === after || (typeof before === 'number' && typeof after === 'number' && Math.abs(before - after) <= tolerance);

/**
 * Every listed setting whose value differs, in the order above: exact comparison, except speeds
 * (the low-speed floor, often the lowest measured test speed) which are equal within `speedTolerance_mps`.
 */
export function settingChanges(old: ScheduleFile, next: ScheduleFile, speedTolerance_mps: number): SettingChange[] {
  const changes: SettingChange[] = [];
  for (const definition of SETTINGS) {
    const before = definition.read(old);
    const after = definition.read(next);
    if (!same(before, after, definition.speedLike === true ? speedTolerance_mps : 0))
      changes.push({ setting: definition.setting, old: before, new: after, breaksGainComparison: definition.breaksGainComparison });
  }
  return changes;
}
