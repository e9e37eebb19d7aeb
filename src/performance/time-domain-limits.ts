/** The time-domain limits at one breakpoint, judged on its figures. */
import type { LoopKind } from '../loops/types.js';
import { SCENARIO_DEFAULTS } from './defaults.js';
import type { TimeDomainFigures, TimeDomainLimits } from './types.js';

const shown = (value: number): string => String(Number(value.toPrecision(3)));

/**
 * The time-domain limits the figures break, in words. The step through the steering limits must settle (no limit
 * cycle) on every loop; a heading loop's must also keep the overshoot limit (a heading step is a manoeuvre the
 * loop is asked to make; a yaw-rate step that large saturates the rate by design).
 */
export function judgeTimeDomain(figures: TimeDomainFigures, limits: TimeDomainLimits, kind: LoopKind): string[] {
  const failures: string[] = [];
  const { referenceStep, steeringMisalignment, lateralForce, laneChange, curveEntry } = figures;
  if (!(referenceStep.overshoot_pct <= limits.maximumOvershoot_pct)) {
    failures.push(
      `reference-step overshoot ${shown(referenceStep.overshoot_pct)} %, needs ≤ ${shown(limits.maximumOvershoot_pct)} % (even with set-point weight b = 0)`,
    );
  }
  for (const [name, figure] of [
    ['steering misalignment', steeringMisalignment],
    ['lateral force step', lateralForce],
  ] as const) {
    if (figure === null) continue;
    if (figure.recoveryTime_s === null || figure.recoveryTime_s > limits.maximumRecoveryTime_s) {
      failures.push(
        `${name} removed to 5 % ${figure.recoveryTime_s === null ? 'not within the simulated time' : `in ${shown(figure.recoveryTime_s)} s`}, needs ≤ ${shown(limits.maximumRecoveryTime_s)} s`,
      );
    }
  }
  if (laneChange !== null && !(laneChange.peakError_m <= limits.maximumLaneChangeError_m)) {
    failures.push(`lane-change error ${shown(laneChange.peakError_m)} m, needs ≤ ${shown(limits.maximumLaneChangeError_m)} m`);
  }
  const limited = figures.limitedStep;
  if (limited !== null) {
    if (limited.settlingTime_s === null) {
      failures.push(`a ${shown(limited.size)} step through the steering limits does not settle within the simulated time (a limit cycle, or too slow)`);
    } else if (kind === 'heading' && !(limited.overshoot_pct <= limits.maximumOvershoot_pct)) {
      failures.push(
        `a ${shown(limited.size)} step through the steering limits overshoots ${shown(limited.overshoot_pct)} %, needs ≤ ${shown(limits.maximumOvershoot_pct)} %`,
      );
    }
  }
  if (curveEntry !== null && !(curveEntry.errorAfterSettle_m <= limits.maximumCurveEntryError_m)) {
    failures.push(
      `curve-entry error ${shown(curveEntry.errorAfterSettle_m)} m ${SCENARIO_DEFAULTS.curveEntrySettle_s} s after entry, needs ≤ ${shown(limits.maximumCurveEntryError_m)} m`,
    );
  }
  return failures;
}
