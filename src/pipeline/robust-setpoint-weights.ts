/**
 * Set-point weights for the worst case. The proportional weight b chosen on the nominal model keeps the overshoot
 * limit there with nothing to spare (the largest b that does, breakpoint-performance.ts), so a vehicle of the set
 * with less damping overshoots it. Under robust acceptance the build lowers b until the worst overshoot over the
 * vehicles simulated keeps the limit too: each vehicle behind a worst overshoot that breaks it (the reference step;
 * on a heading loop also the step through the steering limits) chooses its own b the same way, the smallest is
 * kept, and the set is simulated again with it — at most ROUNDS times. b changes only the response to the
 * reference (Åström & Hägglund 2006, §3.4): the margins and every disturbance response stay as they are.
 */
import { atSpeed } from '../core/by-speed.js';
import type { RobustMargins, RobustTimeDomain, RobustTimeDomainFigure } from '../robust/types.js';
import type { RobustContext } from './robust-analysis.js';
import { vehiclePerformance, worstTimeDomainAt, type BreakpointControl, type TimeDomainSettings } from './robust-time-domain.js';

/** Most rounds of lowering b (each simulates the chosen vehicles once more). */
const ROUNDS = 4;

/** The figures b acts on whose limit is an overshoot. */
const OVERSHOOTS: readonly RobustTimeDomainFigure[] = ['overshoot_pct', 'limitedStepOvershoot_pct'];

export interface RobustWeights {
  /** `control` with the set-point weights kept (lowered, or as given when the worst case kept the limit with them). */
  readonly control: BreakpointControl;
  /** The worst time-domain figures with those weights (null: the set holds an unstable loop there). */
  readonly timeDomain: RobustTimeDomain | null;
}

/** See the module comment. Deterministic. */
export function robustSetpointWeights(point: RobustMargins, control: BreakpointControl, context: RobustContext, settings: TimeDomainSettings): RobustWeights {
  let current = control;
  let timeDomain = worstTimeDomainAt(point, current, context, settings);
  for (let round = 0; round < ROUNDS && timeDomain !== null; round++) {
    const overshooting = OVERSHOOTS.flatMap((name) => {
      const worst = timeDomain?.worst[name] ?? null;
      const limit = name === 'overshoot_pct' || context.loop.kind === 'heading' ? atSpeed(settings.limits, control.speed_mps).maximumOvershoot_pct : Infinity;
      return worst !== null && worst.value !== null && worst.value > limit ? [worst.combination] : [];
    });
    if (overshooting.length === 0) break;
    let proportional = current.setpointWeights.proportional;
    for (const combination of overshooting) {
      const values = context.set.dimensions.map((dimension) => combination[dimension.parameter] ?? (dimension.change === 'scale' ? 1 : 0));
      const own = vehiclePerformance({ values, control: current, context, settings, chooseWeights: true });
      if (own !== null) proportional = Math.min(proportional, own.setpointWeights.proportional);
    }
    if (proportional >= current.setpointWeights.proportional) break;
    current = { ...current, setpointWeights: { ...current.setpointWeights, proportional } };
    timeDomain = worstTimeDomainAt(point, current, context, settings);
  }
  return { control: current, timeDomain };
}
