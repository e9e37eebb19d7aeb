/**
 * The robust check of a schedule's gains, as build, check, reverify and the baseline run it: the worst case
 * over the variation set at every grid speed (on every core), judged on the schedule's limits, with the
 * weakest parameter over the grid and at each breakpoint, the worst time-domain figures at each breakpoint (when
 * its set-point weights and feed-forward are given), and the schedule file's `variations` section.
 */
import type { OverSpeed } from '../core/by-speed.js';
import type { ControllerSettings } from '../controller/types.js';
import type { LoopSpecification } from '../loops/types.js';
import type { RobustCheckPoint, RobustCheckResult, RobustSearchSettings, VariationSet } from '../robust/types.js';
import { tightestFigure, type WeakestParameter } from '../robust/weakest-parameter.js';
import { LISTED_FAILURES } from '../schedule/schedule-file.js';
import { variationsRecord } from '../robust/schedule-record.js';
import type { ScheduleVariations } from '../schedule/schedule-variations.js';
import type { AcceptanceThresholds, GainsAtSpeed, ProgressCallback } from '../schedule/types.js';
import type { CheckModel } from './check-model.js';
import { robustCheckOnAllCores } from './parallel-robust-check.js';
import { weakestParameterAt, type RobustContext } from './robust-analysis.js';
import { worstTimeDomainAt, type BreakpointControl, type TimeDomainSettings } from './robust-time-domain.js';

export interface RobustScheduleCheckInput {
  readonly acceptance: 'robust' | 'nominal';
  readonly model: CheckModel;
  readonly loop: LoopSpecification;
  readonly controller: ControllerSettings;
  readonly set: VariationSet;
  readonly search: RobustSearchSettings;
  readonly thresholds: OverSpeed<AcceptanceThresholds>;
  readonly grid: ArrayLike<number>;
  readonly gainsAt: GainsAtSpeed;
  /** Breakpoint speeds (each must be in the grid): the record lists the worst case at each. */
  readonly breakpointSpeeds: readonly number[];
  /** The breakpoints' set-point weights and feed-forward (same order as breakpointSpeeds) and the time-domain limits: their worst time-domain figures too. */
  readonly timeDomain?: TimeDomainSettings & { readonly breakpoints: readonly BreakpointControl[] };
  /** Worker threads besides the main thread (default: every core). */
  readonly workers?: number;
  readonly onProgress?: ProgressCallback;
}

/** A schedule's robust check and the variations section schedule.json records of it. */
export interface RobustScheduleCheck {
  readonly check: RobustCheckResult;
  readonly record: ScheduleVariations;
}

/** The point of the grid nearest its limits: an unstable set first (the largest closed-loop pole), then the smallest relative slack; first speed wins ties. */
export function tightestPoint(points: readonly RobustCheckPoint[], thresholds: OverSpeed<AcceptanceThresholds>): RobustCheckPoint | null {
  // Ranked by (stable set?, then the largest pole's negative or the slack): lower is tighter.
  let best: { point: RobustCheckPoint; rank: number; key: number } | null = null;
  for (const point of points) {
    const tightest = tightestFigure(point, thresholds);
    if (tightest === null) continue;
    const rank = point.instability === null ? 1 : 0;
    const key = point.instability === null ? tightest.slack : -(point.instability.largestPoleMagnitude ?? 0);
    if (best === null || rank < best.rank || (rank === best.rank && key < best.key)) best = { point, rank, key };
  }
  return best?.point ?? null;
}

/** The robust check of `gainsAt` over the set, and the schedule file's section for it. */
export async function robustScheduleCheck(input: RobustScheduleCheckInput): Promise<RobustScheduleCheck> {
  const check = await robustCheckOnAllCores({
    model: input.model,
    loop: input.loop,
    controller: input.controller,
    thresholds: input.thresholds,
    set: input.set,
    search: input.search,
    grid: input.grid,
    gainsAt: input.gainsAt,
    ...(input.workers === undefined ? {} : { workers: input.workers }),
    ...(input.onProgress === undefined ? {} : { onProgress: input.onProgress }),
  });
  const context: RobustContext = { model: input.model, loop: input.loop, controller: input.controller, set: input.set, search: input.search };
  const weakestAt = (point: RobustCheckPoint | null | undefined): WeakestParameter | null =>
    point === null || point === undefined ? null : weakestParameterAt(point, input.thresholds, context);
  const bySpeed = new Map(check.points.map((point) => [point.speed_mps, point]));
  const timeDomain = input.timeDomain;
  const record = variationsRecord({
    acceptance: input.acceptance,
    set: input.set,
    search: input.search,
    check,
    breakpointSpeeds: input.breakpointSpeeds,
    weakestAtBreakpoints: input.breakpointSpeeds.map((speed_mps) => weakestAt(bySpeed.get(speed_mps))),
    weakest: weakestAt(tightestPoint(check.points, input.thresholds)),
    ...(timeDomain === undefined
      ? {}
      : {
          timeDomainAtBreakpoints: timeDomain.breakpoints.map((control) => {
            const point = bySpeed.get(control.speed_mps);
            return point === undefined ? null : worstTimeDomainAt(point, control, context, timeDomain);
          }),
        }),
    listed: LISTED_FAILURES,
  });
  return { check, record };
}
