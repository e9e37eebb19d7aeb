/**
 * The worst case of every figure over a set of vehicles at one speed, by a bounded, deterministic search
 * in the box's normalised coordinates: the nominal vehicle, the corners of the box (corner-search.ts), seeded
 * samples inside it, then a compass search (compass-search.ts) from the worst point found for each figure. A loop that is
 * not stable anywhere in the set is the worst case of all: the search stops after the stage that found it
 * and names the combination (of those found in that stage, the one with the largest closed-loop pole).
 */
import { breakpointMargins } from '../schedule/breakpoint-margins.js';
import type { LoopMargins } from '../verify/types.js';
import { compassSearch } from './compass-search.js';
import { ROBUST_FIGURES, badness, figureValue, type FigureDefinition } from './figures.js';
import { checkCorners } from './corner-search.js';
import { pointKey, seededSamples } from './search-points.js';
import type { Combination, InstabilityFound, RobustFigure, RobustMargins, RobustSearchSettings, VariationSet, WorstFigure } from './types.js';

export interface WorstCaseInput {
  readonly set: VariationSet;
  readonly search: RobustSearchSettings;
  /**
   * The loop analysed with the changes `values` (one per dimension of the set, in its order); `scope`
   * 'figures' while searching, 'full' for the nominal loop and the points the search keeps (src/verify
   * AnalysisOptions: the delay margin confirmed by the exact verdict only in full).
   */
  readonly analyse: (values: readonly number[], scope: 'full' | 'figures') => LoopMargins;
}

/** What the search keeps of an analysed point: the verdict, the figures and the largest pole (not the analysis' details). */
type Figures = Pick<LoopMargins, 'verdict' | RobustFigure> & { readonly largestPoleMagnitude: number | null };

interface Evaluated {
  readonly point: readonly number[];
  readonly values: readonly number[];
  readonly margins: Figures;
}

const figuresOf = (margins: LoopMargins): Figures => ({
  verdict: margins.verdict,
  phaseMargin_deg: margins.phaseMargin_deg,
  upperGainMargin_dB: margins.upperGainMargin_dB,
  lowerGainMargin_dB: margins.lowerGainMargin_dB,
  delayMargin_s: margins.delayMargin_s,
  sensitivityPeak: margins.sensitivityPeak,
  complementarySensitivityPeak: margins.complementarySensitivityPeak,
  largestPoleMagnitude: margins.analysis?.sampledDataLargestPoleMagnitude ?? null,
});

const nominalChange = (change: 'scale' | 'add'): number => (change === 'scale' ? 1 : 0);

/** The changes at a normalised point: the ends exactly at 0 and 1. */
export function valuesAt(set: VariationSet, point: readonly number[]): number[] {
  return set.dimensions.map((dimension, i) => {
    const u = point[i];
    if (u === 0) return dimension.minimum;
    if (u === 1) return dimension.maximum;
    return dimension.minimum + u * (dimension.maximum - dimension.minimum);
  });
}

/** A combination by parameter name. */
export function combinationOf(set: VariationSet, values: readonly number[]): Combination {
  return Object.fromEntries(set.dimensions.map((dimension, i) => [dimension.parameter, values[i]]));
}

const largestPole = (margins: Figures): number | null => margins.largestPoleMagnitude;

/** How bad a point is for one figure: +Infinity when its loop is not stable (nothing is worse). */
const badnessOf = (entry: Evaluated, definition: FigureDefinition): number =>
  entry.margins.verdict !== 'stable' ? Infinity : badness(figureValue(entry.margins, definition.name), definition);

/** Worst figures of a set at one speed; see the module comment. `speed_mps` and `gains` are the caller's to add. */
export function worstCaseOverSet(input: WorstCaseInput): Omit<RobustMargins, 'speed_mps' | 'gains'> {
  const { set, search } = input;
  const k = set.dimensions.length;
  const cache = new Map<string, Evaluated>();
  const worst = new Map<RobustFigure, { badness: number; entry: Evaluated }>();
  // Held in an object: the closures below update it.
  const found: { instability: Evaluated | null; evaluations: number } = { instability: null, evaluations: 0 };
  let nominalMargins: LoopMargins | null = null;

  const note = (entry: Evaluated): void => {
    const { margins } = entry;
    if (margins.verdict !== 'stable') {
      const pole = largestPole(margins) ?? -Infinity;
      if (found.instability === null || pole > (largestPole(found.instability.margins) ?? -Infinity)) found.instability = entry;
      return;
    }
    for (const definition of ROBUST_FIGURES) {
      const bad = badness(figureValue(margins, definition.name), definition);
      const current = worst.get(definition.name);
      if (current === undefined || bad > current.badness) worst.set(definition.name, { badness: bad, entry });
    }
  };
  const evaluate = (point: readonly number[], exact?: readonly number[]): Evaluated => {
    const key = pointKey(point);
    const known = cache.get(key);
    if (known !== undefined) return known;
    const values = exact ?? valuesAt(set, point);
    const margins = input.analyse(values, exact === undefined ? 'figures' : 'full');
    if (exact !== undefined) nominalMargins = margins;
    const entry: Evaluated = { point, values, margins: figuresOf(margins) };
    found.evaluations += 1;
    cache.set(key, entry);
    note(entry);
    return entry;
  };

  // 1. The nominal vehicle (its exact changes; its normalised position need not be the centre).
  const nominalValues = set.dimensions.map((dimension) => nominalChange(dimension.change));
  const nominalPoint = set.dimensions.map((dimension, i) => (nominalValues[i] - dimension.minimum) / (dimension.maximum - dimension.minimum));
  const nominal = evaluate(nominalPoint, nominalValues);
  // 2. Corners; 3. seeded samples; 4. compass search per figure — each stage only while the set looks stable.
  const stages: (() => void)[] = [
    () =>
      checkCorners(
        k,
        nominalPoint,
        (point, definition) => badnessOf(evaluate(point), definition),
        () => found.instability !== null,
      ),
    () => seededSamples(k, search.samples, search.seed).forEach((sample) => evaluate(sample)),
    () => {
      // One budget of new analyses for the searches of every figure at this speed, spent in ROBUST_FIGURES order.
      const last = found.evaluations + search.localSearchEvaluations;
      for (const definition of ROBUST_FIGURES) {
        if (found.instability !== null) return;
        localSearch(definition, worst.get(definition.name), evaluate, () => found.evaluations >= last);
      }
    },
  ];
  for (const stage of stages) {
    if (found.instability !== null || k === 0) break;
    stage();
  }

  const unstable = found.instability;
  // The points kept are analysed in full (the delay margin confirmed): their figures are the ones reported.
  const confirmed = new Map<string, Figures>([[pointKey(nominalPoint), nominal.margins]]);
  const fullAt = (entry: Evaluated): Figures => {
    const key = pointKey(entry.point);
    let margins = confirmed.get(key);
    if (margins === undefined) {
      margins = figuresOf(input.analyse(entry.values, 'full'));
      found.evaluations += 1;
      confirmed.set(key, margins);
    }
    return margins;
  };
  // A delay margin confirmed in full can differ from its estimate: the nominal one is kept when that is worse.
  const result = (definition: FigureDefinition): WorstFigure | null => {
    const entry = worst.get(definition.name);
    if (unstable !== null || entry === undefined || entry.badness === -Infinity) return null;
    const candidates = [entry.entry, nominal].map((candidate) => ({ candidate, value: figureValue(fullAt(candidate), definition.name) }));
    const kept = badness(candidates[0].value, definition) >= badness(candidates[1].value, definition) ? candidates[0] : candidates[1];
    return kept.value === null ? null : { value: kept.value, combination: combinationOf(set, kept.candidate.values) };
  };
  const instabilityRecord: InstabilityFound | null =
    unstable === null
      ? null
      : {
          verdict: unstable.margins.verdict === 'marginal' ? 'marginal' : 'unstable',
          combination: combinationOf(set, unstable.values),
          largestPoleMagnitude: largestPole(unstable.margins),
        };
  return {
    nominal: breakpointMargins(nominalMargins!),
    instability: instabilityRecord,
    worst: Object.fromEntries(ROBUST_FIGURES.map((definition) => [definition.name, result(definition)])) as Record<RobustFigure, WorstFigure | null>,
    evaluations: found.evaluations,
  };
}

/** Compass search for one figure from its worst point while the speed's budget lasts; an unstable point ends it (+Infinity). */
function localSearch(
  definition: FigureDefinition,
  start: { badness: number; entry: Evaluated } | undefined,
  evaluate: (point: readonly number[]) => Evaluated,
  exhausted: () => boolean,
): void {
  if (start === undefined || start.badness === -Infinity || exhausted()) return;
  const objective = (point: readonly number[]): number => badnessOf(evaluate(point), definition);
  // Only new analyses count: points another figure's search already analysed come from the cache.
  compassSearch({ start: start.entry.point, startValue: start.badness, objective, exhausted });
}
