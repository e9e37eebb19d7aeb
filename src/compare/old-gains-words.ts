/** The key fact of a refit in words: do the old gains hold on the changed vehicle, and where not (terminal, Markdown, report). */
import { failingIntervalWords } from '../schedule/failing-intervals.js';
import { shownSpeed } from './format.js';
import type { OldGainsOnNewVehicle } from './types.js';

type Checked = Extract<OldGainsOnNewVehicle, { available: true }>;

const rangeWords = (record: Checked): string => `${shownSpeed(record.range.minimum_mps)}–${shownSpeed(record.range.maximum_mps)} m/s`;

/** Where the old gains fail: every failing interval, or the first few and how many more. */
export function failingWhere(record: Checked, shownIntervals = 4): string {
  const intervals = record.failingIntervals.slice(0, shownIntervals).map(failingIntervalWords);
  const more = record.failingIntervals.length - intervals.length;
  return `${intervals.join('; ')}${more > 0 ? `; and ${more} more interval${more === 1 ? '' : 's'}` : ''}`;
}

/** One sentence leading a comparison: "The old gains still hold on the new vehicle model: …" or where they do not. */
export function oldGainsLead(record: OldGainsOnNewVehicle): string {
  if (!record.available) return `Old gains on the new vehicle model: not checked — ${record.reason}.`;
  if (record.passed)
    return `The old gains still hold on the new vehicle model: within the old schedule's limits at all ${record.gridSize} speeds checked, ${rangeWords(record)}.`;
  return `The old gains do NOT hold on the new vehicle model: they break the old schedule's limits at ${record.failedSpeeds} of ${record.gridSize} speeds checked (${rangeWords(record)}) — at ${failingWhere(record)}.`;
}

/** The flag of failing old gains. */
export function oldGainsFlagMessage(record: Checked): string {
  return `the old gains fail on the new vehicle model at ${record.failedSpeeds} of ${record.gridSize} speeds: ${failingWhere(record)}`;
}

/** The model the check ran on, in words, or null when not checked. */
export function oldGainsModelWords(record: OldGainsOnNewVehicle): string | null {
  return record.available
    ? `checked on the new schedule's vehicle model — ${record.model} — at its check speeds, with the old schedule's loop, controller and limits`
    : null;
}
