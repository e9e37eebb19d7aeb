/**
 * The schedule as CSV for spreadsheets (RFC 4180: comma separated, CRLF line ends, header row).
 * One row per breakpoint; units in the header (ASCII); empty cell where a margin does not exist.
 */
import type { ScheduleFile } from '../schedule/schedule-types.js';
import { toAscii } from './ascii.js';

const cell = (value: number | boolean | string | null): string => {
  if (value === null) return '';
  const text = String(value);
  return /[",\r\n]/.test(text) ? `"${text.replace(/"/g, '""')}"` : text;
};

/**
 * CSV text: speed_mps, kp/ki/kd with the loop's units, set-point weights, feed-forward gain and lead time,
 * margins, verdict, the time-domain figures (empty where they do not apply), whether refinement inserted the row,
 * the controller settings.
 */
export function exportCsv(schedule: ScheduleFile): string {
  const { units } = schedule;
  const header = [
    'speed_mps',
    `kp (${toAscii(units.kp)})`,
    `ki (${toAscii(units.ki)})`,
    `kd (${toAscii(units.kd)})`,
    'setpointWeightProportional',
    'setpointWeightDerivative',
    `feedForward (${toAscii(units.feedForward)})`,
    'feedForwardLeadTime_s',
    'lowerGainMargin_dB',
    'upperGainMargin_dB',
    'phaseMargin_deg',
    'delayMargin_s',
    'sensitivityPeak',
    'complementarySensitivityPeak',
    'verdict',
    'overshoot_pct',
    'settlingTime_s',
    'misalignmentPeakError',
    'misalignmentRecoveryTime_s',
    'lateralForcePeakError',
    'lateralForceRecoveryTime_s',
    'laneChangePeakError_m',
    'curveEntryErrorAfterSettle_m',
    'largestReferenceWithinActuator',
    'insertedByRefinement',
    // The controller the gains assume, on every row (a spreadsheet row stands alone).
    'sampleTime_s',
    'computationLatency_s',
    'derivativeFilter',
    'discretisation',
  ];
  const rows = schedule.breakpoints.map((row) => {
    const t = row.timeDomain;
    return [
      row.speed_mps,
      row.kp,
      row.ki,
      row.kd,
      row.setpointWeightProportional,
      row.setpointWeightDerivative,
      row.feedForward,
      row.feedForwardLeadTime_s,
      row.margins.lowerGainMargin_dB,
      row.margins.upperGainMargin_dB,
      row.margins.phaseMargin_deg,
      row.margins.delayMargin_s,
      row.margins.sensitivityPeak,
      row.margins.complementarySensitivityPeak,
      row.margins.verdict,
      t?.referenceStep.overshoot_pct ?? null,
      t?.referenceStep.settlingTime_s ?? null,
      t?.steeringMisalignment.peakError ?? null,
      t?.steeringMisalignment.recoveryTime_s ?? null,
      t?.lateralForce?.peakError ?? null,
      t?.lateralForce?.recoveryTime_s ?? null,
      t?.laneChange?.peakError_m ?? null,
      t?.curveEntry?.errorAfterSettle_m ?? null,
      t?.actuator.largestReference ?? null,
      row.insertedByRefinement,
      schedule.controller.sampleTime_s,
      schedule.controller.computationLatency_s,
      schedule.controller.derivativeFilter,
      schedule.controller.discretisation,
    ]
      .map(cell)
      .join(',');
  });
  return [header.map(cell).join(','), ...rows].map((line) => `${line}\r\n`).join('');
}
