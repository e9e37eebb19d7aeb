/**
 * The time-domain figures of a breakpoint over the variation set (src/robust/time-domain.ts through
 * src/pipeline/robust-time-domain.ts): on a box of zero width they are the nominal figures and break the limits the
 * nominal judge (src/performance/time-domain-limits.ts) says they break; on small boxes each worst figure is at least
 * the nominal one, is reproduced by simulating its combination alone, and matches a brute-force grid of the box.
 */
import { describe, expect, it } from 'vitest';
import { worstCaseMarginsAt, type RobustContext } from '../../src/pipeline/robust-analysis.js';
import { worstTimeDomainAt, type BreakpointControl, type TimeDomainSettings } from '../../src/pipeline/robust-time-domain.js';
import { robustSetpointWeights } from '../../src/pipeline/robust-setpoint-weights.js';
import { analyseOperatingPoint } from '../../src/pipeline/loop-analysis.js';
import { breakpointPerformance } from '../../src/performance/breakpoint-performance.js';
import { performanceLoopAt } from '../../src/performance/loop-at-speed.js';
import { judgeTimeDomain } from '../../src/performance/time-domain-limits.js';
import type { TimeDomainFigures } from '../../src/performance/types.js';
import { TIME_DOMAIN_FIGURES } from '../../src/robust/time-domain.js';
import type { Combination } from '../../src/robust/types.js';
import { operatingPointWith } from '../../src/robust/variation-set.js';
import { ACCEPTANCE_DEFAULTS } from '../../src/schedule/plan.js';
import type { WrittenVariations } from '../../src/schedule/plan-variations.js';
import { tuneOperatingPoint } from '../../src/tuning/operating-point.js';
import { CONTROLLER, VAN_MODEL, vanContext } from './van-loop.js';

const HEADING = { kind: 'heading' as const };
// The parcel van's steering limits (vehicles/parcel-van/vehicle.json: invented demo data).
const SETTINGS = {
  limits: ACCEPTANCE_DEFAULTS,
  vehicleLimits: { maxSteerAngle_rad: 0.6, maxSteerRate_radps: 0.5 },
  antiWindup: 'conditional-integration',
} satisfies TimeDomainSettings;

function headingContext(written: WrittenVariations): RobustContext {
  return { ...vanContext(written, { samples: 6, localSearchEvaluations: 6 }), loop: HEADING };
}

/** SIMC heading gains at a speed (τc = 2θ: a loop with overshoot to find), with the set-point weights and feed-forward the nominal figures choose. */
function headingControl(speed_mps: number): { control: BreakpointControl; nominal: TimeDomainFigures } {
  const model = VAN_MODEL.modelAt(speed_mps);
  const tuned = tuneOperatingPoint({ loop: HEADING, speed_mps, model, rule: 'simc', ruleParameters: {}, controller: CONTROLLER });
  const simc = tuneOperatingPoint({
    loop: HEADING,
    speed_mps,
    model,
    rule: 'simc',
    ruleParameters: { simcClosedLoopTimeConstant_s: 2 * tuned.derivation.designModel.deadTime_s },
    controller: CONTROLLER,
  });
  const gains = simc.gains;
  const loop = performanceLoopAt(model, HEADING, speed_mps, CONTROLLER);
  const margins = analyseOperatingPoint({ operatingPoint: model, loop: HEADING, controller: CONTROLLER, speed_mps, gains });
  const nominal = breakpointPerformance({ loop, gains, ...SETTINGS, slowestTimeConstant_s: margins.analysis?.sampledDataSlowestTimeConstant_s ?? null });
  return {
    control: {
      speed_mps,
      gains,
      setpointWeights: nominal.setpointWeights,
      feedForward: loop.feedForward.gain,
      feedForwardLeadTime_s: loop.feedForward.leadTime_s,
    },
    nominal: nominal.figures,
  };
}

/** The figures of one vehicle of the set, simulated directly (the schedule's feed-forward and weights kept). */
function figuresOf(context: RobustContext, control: BreakpointControl, values: readonly number[]): TimeDomainFigures {
  const vehicle = operatingPointWith(VAN_MODEL.modelAt(control.speed_mps), context.set, values);
  const loop = performanceLoopAt(vehicle, HEADING, control.speed_mps, CONTROLLER);
  const margins = analyseOperatingPoint({ operatingPoint: vehicle, loop: HEADING, controller: CONTROLLER, speed_mps: control.speed_mps, gains: control.gains });
  expect(margins.verdict).toBe('stable');
  return breakpointPerformance({
    loop: { ...loop, feedForward: { ...loop.feedForward, gain: control.feedForward, leadTime_s: control.feedForwardLeadTime_s } },
    gains: control.gains,
    ...SETTINGS,
    slowestTimeConstant_s: margins.analysis?.sampledDataSlowestTimeConstant_s ?? null,
    setpointWeights: control.setpointWeights,
  }).figures;
}

const valuesOf = (context: RobustContext, combination: Combination): number[] =>
  context.set.dimensions.map((dimension) => combination[dimension.parameter] ?? (dimension.change === 'scale' ? 1 : 0));

/** Larger is worse for every time-domain figure; a response that did not settle is the worst. */
const badness = (value: number | null | undefined): number => (value === undefined ? -Infinity : value === null ? Infinity : value);

describe('time-domain figures over the set at a breakpoint', () => {
  it('a box of zero width is the nominal vehicle: its figures, and the limits the nominal judge says it breaks', () => {
    const { control, nominal } = headingControl(15);
    const context = headingContext({});
    const point = worstCaseMarginsAt(15, control.gains, context);
    // Tight limits, so that some figures fail: the same count as the nominal judge finds.
    const tightLimits = { ...SETTINGS.limits, maximumOvershoot_pct: 1, maximumRecoveryTime_s: 1 };
    const tight: TimeDomainSettings = { ...SETTINGS, limits: tightLimits };
    const found = worstTimeDomainAt(point, control, context, tight)!;
    expect(found.vehicles).toBe(1);
    for (const definition of TIME_DOMAIN_FIGURES) {
      expect(found.worst[definition.name]?.value ?? undefined, definition.name).toEqual(definition.value(nominal));
    }
    const judged = judgeTimeDomain(nominal, tightLimits, 'heading');
    expect(judged.length).toBeGreaterThan(0);
    expect(found.failures).toHaveLength(judged.length);
    expect(found.failures.every((message) => message.endsWith('(worst case: the nominal vehicle)'))).toBe(true);
  });

  const boxes: { speed_mps: number; written: WrittenVariations }[] = [
    { speed_mps: 15, written: { mass_pct: 10, rearCorneringStiffness_pct: 20 } },
    { speed_mps: 6, written: { actuatorLag_pct: 20, addedLatency_s: 0.01 } },
  ];
  for (const { speed_mps, written } of boxes) {
    it(`at ${speed_mps} m/s over ${Object.keys(written).join(', ')}: never better than nominal, each worst reproduced by its combination, equal to a brute-force grid`, () => {
      const { control, nominal } = headingControl(speed_mps);
      const context = headingContext(written);
      const point = worstCaseMarginsAt(speed_mps, control.gains, context);
      expect(point.instability).toBeNull();
      const found = worstTimeDomainAt(point, control, context, SETTINGS)!;
      // Two parameters: the nominal vehicle and the 4 corners at least.
      expect(found.vehicles).toBeGreaterThanOrEqual(5);
      for (const definition of TIME_DOMAIN_FIGURES) {
        const worst = found.worst[definition.name];
        // Source: definition — the nominal vehicle is a member of the set.
        expect(badness(worst?.value), definition.name).toBeGreaterThanOrEqual(badness(definition.value(nominal)));
        if (worst === null) continue;
        expect(definition.value(figuresOf(context, control, valuesOf(context, worst.combination))), definition.name).toEqual(worst.value);
      }
      // The box does move them (else the checks below would prove nothing).
      expect(TIME_DOMAIN_FIGURES.some((definition) => badness(found.worst[definition.name]?.value) > badness(definition.value(nominal)) + 0.01)).toBe(true);
      // Source: an independent brute-force search, every point of a 5 × 5 grid of the box simulated. The corners hold
      // the worst of these monotone figures to within 0.5 % overshoot and 0.1 s.
      const [first, second] = context.set.dimensions;
      const grid = [0, 0.25, 0.5, 0.75, 1];
      const brute = new Map<string, number>();
      for (const u of grid) {
        for (const w of grid) {
          const figures = figuresOf(context, control, [
            first.minimum + u * (first.maximum - first.minimum),
            second.minimum + w * (second.maximum - second.minimum),
          ]);
          for (const definition of TIME_DOMAIN_FIGURES) {
            const value = badness(definition.value(figures));
            if (value > (brute.get(definition.name) ?? -Infinity)) brute.set(definition.name, value);
          }
        }
      }
      for (const name of ['overshoot_pct', 'limitedStepOvershoot_pct'] as const)
        expect(Math.abs(found.worst[name]!.value! - brute.get(name)!), name).toBeLessThan(0.5);
      for (const name of ['misalignmentRecoveryTime_s', 'lateralForceRecoveryTime_s', 'settlingTime_s'] as const)
        expect(Math.abs(found.worst[name]!.value! - brute.get(name)!), name).toBeLessThan(0.1);
    });
  }

  it('robust set-point weights: b lowered until the worst overshoot over the set keeps the limit; the margins and disturbance responses unchanged', () => {
    const { control } = headingControl(15);
    const context = headingContext({ mass_pct: 10, rearCorneringStiffness_pct: 20, actuatorLag_pct: 20 });
    const point = worstCaseMarginsAt(15, control.gains, context);
    // An overshoot limit just above the nominal overshoot at b = 1: the nominal keeps it, the worst case does not.
    const atOne = { ...control, setpointWeights: { proportional: 1, derivative: 0 } };
    const before = worstTimeDomainAt(point, atOne, context, SETTINGS)!;
    const nominalAtOne = figuresOf(
      context,
      atOne,
      context.set.dimensions.map(() => 1),
    ).referenceStep.overshoot_pct;
    const limit = nominalAtOne + 0.5;
    const settings: TimeDomainSettings = { ...SETTINGS, limits: { ...SETTINGS.limits, maximumOvershoot_pct: limit } };
    expect(before.worst.overshoot_pct!.value!).toBeGreaterThan(limit);
    const kept = robustSetpointWeights(point, atOne, context, settings);
    expect(kept.control.setpointWeights.proportional).toBeLessThan(1);
    expect(kept.timeDomain!.worst.overshoot_pct!.value!).toBeLessThanOrEqual(limit);
    expect(kept.timeDomain!.failures.filter((message) => message.startsWith('reference-step overshoot'))).toEqual([]);
    // Source: Åström & Hägglund 2006, §3.4 — set-point weights change only the response to the reference.
    expect(kept.timeDomain!.worst.misalignmentRecoveryTime_s).toEqual(before.worst.misalignmentRecoveryTime_s);
    expect(kept.timeDomain!.worst.lateralForceRecoveryTime_s).toEqual(before.worst.lateralForceRecoveryTime_s);
    // Weights that already keep the limit over the set are kept as they are.
    const again = robustSetpointWeights(point, kept.control, context, settings);
    expect(again.control.setpointWeights).toEqual(kept.control.setpointWeights);
  });
});
