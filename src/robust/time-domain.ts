/**
 * The time-domain figures of a breakpoint over the variation set (src/performance: the exact sampled closed
 * loop's reference step, disturbances, lane change and curve entry, the step through the steering limits), each
 * at its worst with the combination behind it, judged on the plan's time-domain limits. A closed-loop
 * simulation costs far more than a loop analysis, so the vehicles simulated are few and chosen: the nominal
 * vehicle; the corners of the box (every corner up to ALL_CORNERS_UP_TO_DIMENSIONS parameters; beyond, each
 * parameter alone to either end and, for each figure, the corner made of the worse end of every parameter);
 * and the combinations behind the worst margins the search found at that speed (worst-case.ts). A vehicle
 * whose loop is not stable is not simulated: its instability already fails the breakpoint.
 */
import type { LoopKind } from '../loops/types.js';
import type { TimeDomainFigures, TimeDomainLimits } from '../performance/types.js';
import { combinationWords } from './combination-words.js';
import { ALL_CORNERS_UP_TO_DIMENSIONS, allCorners, axisEnds, pointKey } from './search-points.js';
import type { Combination, RobustTimeDomain, RobustTimeDomainFigure, VariationSet, WorstTimeDomainFigure } from './types.js';
import { combinationOf, valuesAt } from './worst-case.js';

export interface TimeDomainDefinition {
  readonly name: RobustTimeDomainFigure;
  /** In words, for messages and reports. */
  readonly words: string;
  readonly unit: string;
  /** The figure on one vehicle: undefined when the loop has no such figure, null when the response did not settle within the simulated time. */
  readonly value: (figures: TimeDomainFigures) => number | null | undefined;
  /** Its limit on that loop (undefined: none; Infinity: it must only settle). */
  readonly limit: (limits: TimeDomainLimits, kind: LoopKind) => number | undefined;
}

/** Every time-domain figure, in the order the reports list them (the limits as src/performance/time-domain-limits.ts judges them). */
export const TIME_DOMAIN_FIGURES: readonly TimeDomainDefinition[] = [
  { name: 'overshoot_pct', words: 'reference-step overshoot', unit: '%', value: (f) => f.referenceStep.overshoot_pct, limit: (l) => l.maximumOvershoot_pct },
  { name: 'settlingTime_s', words: 'reference-step settling time', unit: 's', value: (f) => f.referenceStep.settlingTime_s, limit: () => undefined },
  {
    name: 'misalignmentRecoveryTime_s',
    words: 'steering-misalignment recovery time (to 5 %)',
    unit: 's',
    value: (f) => f.steeringMisalignment.recoveryTime_s,
    limit: (l) => l.maximumRecoveryTime_s,
  },
  {
    name: 'lateralForceRecoveryTime_s',
    words: 'lateral-force recovery time (to 5 %)',
    unit: 's',
    value: (f) => (f.lateralForce === null ? undefined : f.lateralForce.recoveryTime_s),
    limit: (l) => l.maximumRecoveryTime_s,
  },
  { name: 'laneChangeError_m', words: 'lane-change error', unit: 'm', value: (f) => f.laneChange?.peakError_m, limit: (l) => l.maximumLaneChangeError_m },
  {
    name: 'curveEntryError_m',
    words: 'curve-entry error after settling',
    unit: 'm',
    value: (f) => f.curveEntry?.errorAfterSettle_m,
    limit: (l) => l.maximumCurveEntryError_m,
  },
  {
    name: 'limitedStepOvershoot_pct',
    words: 'overshoot of the step through the steering limits',
    unit: '%',
    value: (f) => f.limitedStep?.overshoot_pct,
    limit: (l, kind) => (kind === 'heading' ? l.maximumOvershoot_pct : undefined),
  },
  {
    name: 'limitedStepSettlingTime_s',
    words: 'settling time of the step through the steering limits',
    unit: 's',
    value: (f) => (f.limitedStep === null ? undefined : f.limitedStep.settlingTime_s),
    limit: () => Number.POSITIVE_INFINITY,
  },
];

/** How bad a value is (larger is worse for every figure): a response that did not settle is the worst. */
const badness = (value: number | null): number => (value === null ? Number.POSITIVE_INFINITY : value);

const shown = (value: number): string => String(Number(value.toPrecision(3)));

/** The worst figure's failure in words, or null when it keeps its limit. */
function failureWords(definition: TimeDomainDefinition, worst: WorstTimeDomainFigure, limits: TimeDomainLimits, kind: LoopKind): string | null {
  const limit = definition.limit(limits, kind);
  if (limit === undefined) return null;
  const where = `(worst case: ${combinationWords(worst.combination)})`;
  if (worst.value === null) return `${definition.words}: not settled within the simulated time ${where}`;
  if (worst.value <= limit) return null;
  return `${definition.words} ${shown(worst.value)} ${definition.unit}, needs ≤ ${shown(limit)} ${definition.unit} ${where}`;
}

export interface WorstTimeDomainInput {
  readonly set: VariationSet;
  /** The combinations behind the worst margins at this speed (simulated besides the nominal vehicle and the corners). */
  readonly combinations: readonly Combination[];
  /** The figures of the vehicle with the changes `values` (one per dimension, in order); null when its loop is not stable. */
  readonly figuresAt: (values: readonly number[]) => TimeDomainFigures | null;
  readonly limits: TimeDomainLimits;
  readonly kind: LoopKind;
}

/** The worst time-domain figures over the chosen vehicles of the set (see the module comment). Deterministic; the first vehicle wins ties. */
export function worstTimeDomainOverSet(input: WorstTimeDomainInput): RobustTimeDomain {
  const { set } = input;
  const k = set.dimensions.length;
  const worst = new Map<RobustTimeDomainFigure, { badness: number; figure: WorstTimeDomainFigure }>();
  const seen = new Map<string, TimeDomainFigures | null>();
  const simulate = (values: readonly number[]): TimeDomainFigures | null => {
    const key = pointKey(values);
    if (seen.has(key)) return seen.get(key) ?? null;
    const figures = input.figuresAt(values);
    seen.set(key, figures);
    if (figures === null) return null;
    for (const definition of TIME_DOMAIN_FIGURES) {
      const value = definition.value(figures);
      if (value === undefined) continue;
      const current = worst.get(definition.name);
      if (current === undefined || badness(value) > current.badness)
        worst.set(definition.name, { badness: badness(value), figure: { value, combination: combinationOf(set, values) } });
    }
    return figures;
  };
  const atPoint = (point: readonly number[]): TimeDomainFigures | null => simulate(valuesAt(set, point));

  simulate(set.dimensions.map((dimension) => (dimension.change === 'scale' ? 1 : 0)));
  if (k <= ALL_CORNERS_UP_TO_DIMENSIONS) {
    for (const corner of allCorners(k)) atPoint(corner);
  } else {
    // Screening: each parameter alone to either end; then, per figure, the corner of the worse ends.
    const centre = set.dimensions.map((dimension) => {
      const nominal = dimension.change === 'scale' ? 1 : 0;
      return (nominal - dimension.minimum) / (dimension.maximum - dimension.minimum);
    });
    const ends = axisEnds(centre).map((point) => atPoint(point));
    for (const definition of TIME_DOMAIN_FIGURES) {
      const bad = (figures: TimeDomainFigures | null): number => {
        const value = figures === null ? undefined : definition.value(figures);
        return value === undefined ? Number.NEGATIVE_INFINITY : badness(value);
      };
      if (!worst.has(definition.name)) continue;
      atPoint(Array.from({ length: k }, (_, i) => (bad(ends[2 * i]) > bad(ends[2 * i + 1]) ? 0 : 1)));
    }
  }
  for (const combination of input.combinations)
    simulate(set.dimensions.map((dimension) => combination[dimension.parameter] ?? (dimension.change === 'scale' ? 1 : 0)));

  const record = Object.fromEntries(TIME_DOMAIN_FIGURES.map((definition) => [definition.name, worst.get(definition.name)?.figure ?? null])) as Record<
    RobustTimeDomainFigure,
    WorstTimeDomainFigure | null
  >;
  const failures = TIME_DOMAIN_FIGURES.flatMap((definition) => {
    const figure = record[definition.name];
    return figure === null ? [] : (failureWords(definition, figure, input.limits, input.kind) ?? []);
  });
  const vehicles = [...seen.values()].filter((figures) => figures !== null).length;
  return { worst: record, failures, vehicles };
}
