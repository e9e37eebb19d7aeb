import type { DesignModel } from './types.js';

/** A design model reduced to a given number of lags, and what the reduction moved where. */
export interface HalfRuleReduction {
  readonly model: DesignModel;
  /** Delay added to the model's dead time by the reduction, s. */
  readonly addedDeadTime_s: number;
  /** Lag time constant added to the smallest retained lag, s (0 when none is retained). */
  readonly addedToRetainedLag_s: number;
}

/**
 * Skogestad's half rule (Skogestad 2003, §3): keep the `retainedLags` longest lags; the largest
 * neglected lag is split, half added to the smallest retained lag and half to the dead time; all
 * smaller lags are added to the dead time in full. When no finite lag is retained (integrating and
 * double-integrating plants: the integrator is the retained "infinite" lag) the half that would go
 * to the retained lag vanishes. Times in s; the gain is unchanged.
 */
export function reduceByHalfRule(model: DesignModel, retainedLags: number): HalfRuleReduction {
  const lags = [...model.lags_s].sort((x, y) => y - x);
  if (lags.length <= retainedLags) {
    return { model: { ...model, lags_s: lags }, addedDeadTime_s: 0, addedToRetainedLag_s: 0 };
  }
  const kept = lags.slice(0, retainedLags);
  const neglected = lags.slice(retainedLags);
  const largest = neglected[0];
  let addedDeadTime_s = largest / 2;
  for (let i = 1; i < neglected.length; i++) addedDeadTime_s += neglected[i];
  let addedToRetainedLag_s = 0;
  if (kept.length > 0) {
    addedToRetainedLag_s = largest / 2;
    kept[kept.length - 1] += addedToRetainedLag_s;
  }
  return {
    model: { ...model, lags_s: kept, deadTime_s: model.deadTime_s + addedDeadTime_s },
    addedDeadTime_s,
    addedToRetainedLag_s,
  };
}
