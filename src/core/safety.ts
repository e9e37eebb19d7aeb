/**
 * The cautions shown wherever speedband writes or prints a schedule.
 * A schedule steers a vehicle: output is engineering input, not approval.
 */
export const SAFETY_CAUTIONS: readonly string[] = [
  'These gains are engineering input, not approval to drive.',
  'First runs belong on a closed track, with a safety driver and an independent steering override, starting at low speed and raising speed in steps.',
  "Your organisation's safety process, local regulations and licensed engineering practice decide whether and how this schedule is used.",
];

export const SAFETY_EPILOGUE = `Safety: ${SAFETY_CAUTIONS.join(' ')}`;
