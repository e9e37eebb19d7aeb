/**
 * After a vehicle change, the old gains' time-domain figures on the new vehicle: at each breakpoint of the new
 * schedule, the old schedule's own lookups (gains, set-point weights, feed-forward), loop and controller on the
 * model the new schedule records, simulated as the build simulates a breakpoint (src/performance) with the new
 * vehicle's steering limits — what the old gains would do on the changed vehicle, beside what the new ones do.
 */
import { atSpeed as readAtSpeed } from '../core/by-speed.js';
import type { CheckModel } from '../pipeline/check-model.js';
import { scheduleLoopAndController } from '../pipeline/recheck-schedule.js';
import { breakpointPerformance } from '../performance/breakpoint-performance.js';
import { performanceLoopAt } from '../performance/loop-at-speed.js';
import type { TimeDomainFigures } from '../performance/types.js';
import { scheduleExtrasLookup, scheduleLookup } from '../schedule/schedule-lookup.js';
import type { ScheduleFile } from '../schedule/schedule-types.js';
import type { DenseCheckResult } from '../schedule/types.js';

/**
 * The old gains' figures at each breakpoint of `next` (null where the old gains' loop is not stable there, per `oldCheck`,
 * the old gains' dense check on the new model, whose grid holds the new breakpoints).
 */
export function oldTimeDomainOnNewVehicle(old: ScheduleFile, next: ScheduleFile, model: CheckModel, oldCheck: DenseCheckResult): (TimeDomainFigures | null)[] {
  const { loop: specification, controller } = scheduleLoopAndController(old);
  const gainsAt = scheduleLookup(old);
  const extrasAt = scheduleExtrasLookup(old);
  return next.breakpoints.map(({ speed_mps }) => {
    const point = oldCheck.points.find((candidate) => candidate.speed_mps === speed_mps);
    if (point === undefined || !point.margins.stable) return null;
    const extras = extrasAt(speed_mps);
    const atSpeed = performanceLoopAt(model.modelAt(speed_mps), specification, speed_mps, controller);
    return breakpointPerformance({
      loop: { ...atSpeed, feedForward: { ...atSpeed.feedForward, gain: extras.feedForward, leadTime_s: extras.feedForwardLeadTime_s } },
      gains: gainsAt(speed_mps),
      limits: readAtSpeed(next.check.timeDomain.limits, speed_mps),
      vehicleLimits: next.check.timeDomain.steeringLimits,
      slowestTimeConstant_s: point.margins.analysis?.sampledDataSlowestTimeConstant_s ?? null,
      setpointWeights: { proportional: extras.setpointWeightProportional, derivative: extras.setpointWeightDerivative },
      antiWindup: old.controller.antiWindup,
    }).figures;
  });
}
