/**
 * The closed-loop responses behind a schedule's time-domain figures, for the report: at a few breakpoints
 * the exact sampled closed loop is simulated again as the build simulated it (src/performance,
 * breakpointPerformance with the breakpoint's own gains, set-point weights and feed-forward, on the model the
 * schedule records) and its responses kept — the reference step, the disturbances, the path loop's lane
 * change and curve entry, the step through the steering limits — with the steering angle and the rate the
 * actuator is asked for. Thinned for drawing by keeping each stretch's smallest and largest value, so
 * peaks stay where they are.
 */
import { atSpeed as readAtSpeed } from '../core/by-speed.js';
import type { CheckModel } from '../pipeline/check-model.js';
import { scheduleLoopAndController } from '../pipeline/recheck-schedule.js';
import { askedSteeringRate } from '../performance/actuator-room.js';
import { breakpointPerformance } from '../performance/breakpoint-performance.js';
import { SCENARIO_DEFAULTS } from '../performance/defaults.js';
import { peakMagnitude } from '../performance/figures.js';
import { performanceLoopAt } from '../performance/loop-at-speed.js';
import type { TimeDomainFigures } from '../performance/types.js';
import type { ScheduleBreakpoint, ScheduleFile } from '../schedule/schedule-types.js';
import type { DenseCheckResult } from '../schedule/types.js';
import type { ClosedLoopTraces, ClosedLoopTracesAtSpeed, TraceSignal } from './types.js';

/** Stretches per drawn signal (each keeps its smallest and largest sample: at most twice this many points). */
export const TRACE_STRETCHES = 150;

/** The samples of `values` from t = 0 to `end_s`, thinned (see the file comment). */
export function thinnedSignal(values: Float64Array, sampleTime_s: number, end_s: number, scale = 1): TraceSignal {
  const count = Math.min(values.length, Math.floor(end_s / sampleTime_s + 1e-9) + 1);
  const stride = Math.max(1, Math.ceil(count / TRACE_STRETCHES));
  const indices: number[] = [];
  for (let start = 0; start < count; start += stride) {
    let low = start;
    let high = start;
    for (let k = start; k < Math.min(count, start + stride); k++) {
      if (values[k] < values[low]) low = k;
      if (values[k] > values[high]) high = k;
    }
    for (const k of low === high ? [low] : [Math.min(low, high), Math.max(low, high)]) indices.push(k);
  }
  if (indices[indices.length - 1] !== count - 1) indices.push(count - 1);
  return { time_s: indices.map((k) => k * sampleTime_s), value: indices.map((k) => values[k] * scale) };
}

/** How close the figures come to their limits: the largest figure/limit ratio (≥ 1 breaks a limit; unsettled counts as 2). */
function closeness(figures: TimeDomainFigures, schedule: ScheduleFile, speed_mps: number): number {
  const limits = readAtSpeed(schedule.check.timeDomain.limits, speed_mps);
  const recovery = (time: number | null): number => (time === null ? 2 : time / limits.maximumRecoveryTime_s);
  return Math.max(
    figures.referenceStep.overshoot_pct / limits.maximumOvershoot_pct,
    recovery(figures.steeringMisalignment.recoveryTime_s),
    figures.lateralForce === null ? 0 : recovery(figures.lateralForce.recoveryTime_s),
    figures.laneChange === null ? 0 : figures.laneChange.peakError_m / limits.maximumLaneChangeError_m,
    figures.curveEntry === null ? 0 : figures.curveEntry.errorAfterSettle_m / limits.maximumCurveEntryError_m,
  );
}

/** The breakpoints drawn: the lowest and highest, and the one closest to a time-domain limit, each with why. */
export function traceBreakpoints(schedule: ScheduleFile): { readonly breakpoint: ScheduleBreakpoint; readonly reason: string }[] {
  const withFigures = schedule.breakpoints.filter((breakpoint) => breakpoint.timeDomain !== null);
  if (withFigures.length === 0) return [];
  const chosen = new Map<ScheduleBreakpoint, string[]>();
  const add = (breakpoint: ScheduleBreakpoint, reason: string) => chosen.set(breakpoint, [...(chosen.get(breakpoint) ?? []), reason]);
  add(withFigures[0], 'lowest breakpoint');
  add(withFigures[withFigures.length - 1], 'highest breakpoint');
  const closest = withFigures.reduce((best, next) =>
    closeness(next.timeDomain!, schedule, next.speed_mps) > closeness(best.timeDomain!, schedule, best.speed_mps) ? next : best,
  );
  add(closest, 'closest to a time-domain limit');
  return [...chosen.entries()].sort(([p], [q]) => p.speed_mps - q.speed_mps).map(([breakpoint, reasons]) => ({ breakpoint, reason: reasons.join(', ') }));
}

/** The responses at the chosen breakpoints (see the file comment); null when no breakpoint has time-domain figures. */
export function closedLoopTraces(schedule: ScheduleFile, model: CheckModel, check: DenseCheckResult | null): ClosedLoopTraces | null {
  const chosen = traceBreakpoints(schedule);
  if (chosen.length === 0) return null;
  const { loop: specification, controller } = scheduleLoopAndController(schedule);
  const { limits, steeringLimits } = schedule.check.timeDomain;
  const ts = controller.sampleTime_s;
  const d = SCENARIO_DEFAULTS;
  const speeds = chosen.map(({ breakpoint: row, reason }): ClosedLoopTracesAtSpeed => {
    const atSpeed = performanceLoopAt(model.modelAt(row.speed_mps), specification, row.speed_mps, controller);
    const loop = { ...atSpeed, feedForward: { ...atSpeed.feedForward, gain: row.feedForward, leadTime_s: row.feedForwardLeadTime_s } };
    const point = check?.points.find((candidate) => candidate.speed_mps === row.speed_mps);
    const run = breakpointPerformance({
      loop,
      gains: { kp: row.kp, ki: row.ki, kd: row.kd },
      limits: readAtSpeed(limits, row.speed_mps),
      vehicleLimits: steeringLimits,
      slowestTimeConstant_s: point?.margins.analysis?.sampledDataSlowestTimeConstant_s ?? null,
      setpointWeights: { proportional: row.setpointWeightProportional, derivative: row.setpointWeightDerivative },
      antiWindup: schedule.controller.antiWindup,
      keepTraces: true,
    });
    const traces = run.traces!;
    const figures = run.figures;
    const settled = Math.max(figures.referenceStep.settlingTime_s ?? 0, figures.limitedStep?.settlingTime_s ?? 0);
    const stepEnd = Math.max(2, 3 * settled);
    const recovered = Math.max(figures.steeringMisalignment.recoveryTime_s ?? 0, figures.lateralForce?.recoveryTime_s ?? 0);
    const disturbanceEnd = Math.max(2, 2 * recovered);
    const limited = traces.limitedStep;
    const size = figures.limitedStep?.size ?? 1;
    const rateOf = (angle: Float64Array): Float64Array => angle.map((value, k) => (k === 0 ? 0 : (value - angle[k - 1]) / ts));
    const laneEnd = figures.laneChange === null ? 0 : traces.leadIn_s + figures.laneChange.length_m / row.speed_mps + 4;
    return {
      speed_mps: row.speed_mps,
      reason,
      figures,
      referenceStep: thinnedSignal(traces.referenceStep.output, ts, stepEnd),
      limitedStep:
        limited === null
          ? null
          : {
              size,
              output: thinnedSignal(limited.output, ts, stepEnd, 1 / size),
              angle: thinnedSignal(limited.steerAngle, ts, stepEnd),
              rate: thinnedSignal(rateOf(limited.steerAngle), ts, stepEnd),
            },
      steeringMisalignment: thinnedSignal(traces.steeringMisalignment.error, ts, disturbanceEnd, 1 / (peakMagnitude(traces.steeringMisalignment.error) || 1)),
      lateralForce:
        traces.lateralForce === null ? null : thinnedSignal(traces.lateralForce.error, ts, disturbanceEnd, 1 / (peakMagnitude(traces.lateralForce.error) || 1)),
      laneChange:
        traces.laneChange === null
          ? null
          : {
              error: thinnedSignal(traces.laneChange.error, ts, laneEnd),
              angle: thinnedSignal(traces.laneChange.command, ts, laneEnd),
              rate: thinnedSignal(askedSteeringRate(traces.laneChange.command, loop), ts, laneEnd),
            },
      curveEntry: traces.curveEntry === null ? null : thinnedSignal(traces.curveEntry.error, ts, traces.leadIn_s + d.curveEntrySettle_s + 5),
    };
  });
  return {
    errorUnit: schedule.units.error,
    leadIn_s: d.leadIn_s,
    curveEntrySettle_s: d.curveEntrySettle_s,
    settlingBand: d.settlingBand,
    recoveryBand: d.recoveryBand,
    speeds,
  };
}
