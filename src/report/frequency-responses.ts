/**
 * The open-loop frequency response at a few speeds, for the report's Bode and Nyquist plots: the exact
 * sampled loop the dense check analyses (`sampledLoopDescription`), evaluated on a logarithmic grid from
 * two decades below the gain crossover up to the Nyquist frequency π/Ts.
 */
import { checkLoopPlant, sampledLoopDescription } from '../pipeline/loop-analysis.js';
import type { CheckModel } from '../pipeline/check-model.js';
import { scheduleLoopAndController } from '../pipeline/recheck-schedule.js';
import { SpeedbandError } from '../core/errors.js';
import { ratioToDecibels } from '../core/units.js';
import { scheduleLookup } from '../schedule/schedule-lookup.js';
import type { ScheduleFile } from '../schedule/schedule-types.js';
import { analyseLoop, openLoopOf } from '../verify/analyse-loop.js';
import { loopFrequencyResponse } from '../verify/frequency-points.js';
import { pointMargins } from './report-check.js';
import type { LoopResponse, ReportCheck } from './types.js';

/** Frequencies per plot, and the decades below the gain crossover where the plot starts. */
export const FREQUENCY_PLOT = { points: 240, decadesBelowCrossover: 2 } as const;

/** The speeds to draw, with why: those asked for, or the lowest and highest breakpoint and the check speed with the smallest phase margin. */
export function responseSpeeds(
  schedule: ScheduleFile,
  check: ReportCheck | null,
  asked: readonly number[] | undefined,
): { speed_mps: number; reason: string }[] {
  const { minimum_mps, maximum_mps } = schedule.check.range;
  if (asked !== undefined && asked.length > 0) {
    for (const speed_mps of asked) {
      if (!(speed_mps >= minimum_mps - 1e-9 && speed_mps <= maximum_mps + 1e-9)) {
        throw new SpeedbandError(
          'report.speedOutOfRange',
          `--response-speed-mps ${speed_mps} is outside the schedule's checked range ${minimum_mps.toFixed(3)}–${maximum_mps.toFixed(3)} m/s — give speeds inside it`,
          {
            details: { speed_mps, minimum_mps, maximum_mps },
          },
        );
      }
    }
    return [...new Set(asked)].sort((a, b) => a - b).map((speed_mps) => ({ speed_mps, reason: 'asked for' }));
  }
  const speeds = schedule.breakpoints.map((breakpoint) => breakpoint.speed_mps);
  const chosen = [
    { speed_mps: speeds[0], reason: 'lowest breakpoint' },
    { speed_mps: speeds[speeds.length - 1], reason: 'highest breakpoint' },
  ];
  let weakest: { speed_mps: number; value: number } | null = null;
  for (const point of check?.points ?? []) {
    const value = point.margins.phaseMargin_deg;
    if (value !== null && (weakest === null || value < weakest.value)) weakest = { speed_mps: point.speed_mps, value };
  }
  if (weakest !== null) {
    const same = chosen.find((entry) => Math.abs(entry.speed_mps - weakest.speed_mps) <= 1e-9);
    if (same === undefined) chosen.push({ speed_mps: weakest.speed_mps, reason: 'smallest phase margin of the dense check' });
    else same.reason += ', smallest phase margin of the dense check';
  }
  return chosen.sort((a, b) => a.speed_mps - b.speed_mps);
}

/** The response at one speed with the schedule's gains there, on `model` (the schedule's own loop and controller). */
export function loopResponseAt(schedule: ScheduleFile, model: CheckModel, speed_mps: number): LoopResponse {
  const { loop, controller } = scheduleLoopAndController(schedule);
  const gains = scheduleLookup(schedule)(speed_mps);
  const description = sampledLoopDescription(checkLoopPlant(model, loop, controller, speed_mps), gains, controller);
  const margins = analyseLoop(description);
  const nyquist_radps = Math.PI / controller.sampleTime_s;
  const crossover = margins.phaseMarginFrequency_radps ?? margins.sensitivityPeakFrequency_radps;
  const low = Math.min(crossover, nyquist_radps) / 10 ** FREQUENCY_PLOT.decadesBelowCrossover;
  const frequencies = Array.from({ length: FREQUENCY_PLOT.points }, (_, k) => low * (nyquist_radps / low) ** (k / (FREQUENCY_PLOT.points - 1)));
  frequencies[frequencies.length - 1] = nyquist_radps;
  const points = loopFrequencyResponse(openLoopOf(description), frequencies);
  return {
    gains,
    frequency_radps: frequencies,
    re: points.map((point) => point.re),
    im: points.map((point) => point.im),
    magnitude_dB: points.map((point) => ratioToDecibels(point.magnitude)),
    phase_deg: points.map((point) => point.phase_deg),
    margins: {
      ...pointMargins(margins),
      phaseMarginFrequency_radps: margins.phaseMarginFrequency_radps,
      upperGainMarginFrequency_radps: margins.upperGainMarginFrequency_radps,
      lowerGainMarginFrequency_radps: margins.lowerGainMarginFrequency_radps,
    },
    nyquistFrequency_radps: nyquist_radps,
  };
}
