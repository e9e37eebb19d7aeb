/**
 * The schedule as JSON: exactly the bytes of schedule.json (src/schedule/schedule-json.ts), after
 * the schema and checksum are verified — so readSchedule of an export returns the same schedule.
 */
import { parseSchedule } from '../schedule/schedule-file.js';
import { serialiseSchedule } from '../schedule/schedule-json.js';
import type { ScheduleFile } from '../schedule/schedule-types.js';

/** The schedule as canonical JSON text (the bytes the checksum is computed over, plus the checksum). */
export function exportJson(schedule: ScheduleFile): string {
  const text = serialiseSchedule(schedule);
  parseSchedule(JSON.parse(text), '(export)');
  return text;
}
