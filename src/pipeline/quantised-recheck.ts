/**
 * The export command's re-check of fixed-point gains: the dense check of the quantised table on
 * the model the schedule records (src/pipeline/recheck-schedule.ts), or null when the schedule
 * records no model speedband can rebuild.
 */
import type { ScheduleFile } from '../schedule/schedule-types.js';
import type { DenseCheckResult, GainTable } from '../schedule/types.js';
import { makeGainLookup } from '../schedule/interpolate.js';
import { scheduleLookupSettings } from '../schedule/schedule-lookup.js';
import { recheckSchedule, recordedCheckModel } from './recheck-schedule.js';

export function recheckWithRecordedModel(schedule: ScheduleFile, quantised: GainTable): DenseCheckResult | null {
  const model = recordedCheckModel(schedule);
  if (model === null) return null;
  return recheckSchedule({ schedule, model, gainsAt: makeGainLookup(quantised, scheduleLookupSettings(schedule)) });
}
