/**
 * The worst case of every figure over a set of vehicles at one speed, by a bounded, deterministic search
 * in the box's normalised coordinates: the nominal vehicle, the corners of the box, seeded samples inside
 * it, then a compass search (compass-search.ts) from the worst point found for each figure. A loop that is
 * not stable anywhere in the set is the worst case of all: the search stops after the stage that found it
 * and names the combination (of those found in that stage, the one with the largest closed-loop pole).
 */
import { breakpointMargins } from '../schedule/schedule-file.js';
import type { LoopMargins } from '../verify/types.js';
import { compassSearch } from './compass-search.js';
import { ROBUST_FIGURES, badness, figureValue, type FigureDefinition } from './figures.js';
import { ALL_CORNERS_UP_TO_DIMENSIONS, allCorners, axisEnds, pointKey, seededSamples } from './search-points.js';
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
function valuesAt(set: VariationSet, point: readonly number[]): number[] {
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
    () => checkCorners(k, nominalPoint, evaluate, () => found.instability !== null),
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
      : { verdict: unstable.margins.verdict === 'marginal' ? 'marginal' : 'unstable', combination: combinationOf(set, unstable.values), largestPoleMagnitude: largestPole(unstable.margins) };
  return {
    nominal: breakpointMargins(nominalMargins!),
    instability: instabilityRecord,
    worst: Object.fromEntries(ROBUST_FIGURES.map((definition) => [definition.name, result(definition)])) as Record<RobustFigure, WorstFigure | null>,
    evaluations: found.evaluations,
  };
}

/**
 * The corners checked. Up to ALL_CORNERS_UP_TO_DIMENSIONS dimensions: every corner. Beyond, where 2^k
 * corners would cost more than the samples: a one-at-a-time screening (each dimension to either end, the
 * others nominal) tells for each figure which end of each dimension is worse; from the corner made of those
 * ends, a coordinate search over the corners (flip one dimension to its other end, move to the worst
 * neighbour, until none is worse) catches interactions that reverse a dimension's effect at the corner.
 */
function checkCorners(k: number, nominalPoint: readonly number[], evaluate: (point: readonly number[]) => Evaluated, unstable: () => boolean): void {
  if (k <= ALL_CORNERS_UP_TO_DIMENSIONS) {
    for (const corner of allCorners(k)) evaluate(corner);
    return;
  }
  const ends = axisEnds(nominalPoint).map((point) => evaluate(point));
  for (const definition of ROBUST_FIGURES) {
    const bad = (entry: Evaluated): number => (entry.margins.verdict !== 'stable' ? Infinity : badness(figureValue(entry.margins, definition.name), definition));
    let corner: number[] = Array.from({ length: k }, (_, i) => (bad(ends[2 * i]) > bad(ends[2 * i + 1]) ? 0 : 1));
    let current = bad(evaluate(corner));
    for (let round = 0; round < k && !unstable() && current !== -Infinity; round++) {
      let best: { corner: number[]; value: number } | null = null;
      for (let i = 0; i < k; i++) {
        const neighbour = [...corner];
        neighbour[i] = 1 - neighbour[i];
        const value = bad(evaluate(neighbour));
        if (value > current && (best === null || value > best.value)) best = { corner: neighbour, value };
      }
      if (best === null) break;
      corner = best.corner;
      current = best.value;
    }
    if (unstable()) return;
  }
}

/** Compass search for one figure from its worst point while the speed's budget lasts; an unstable point ends it (+Infinity). */
function localSearch(
  definition: FigureDefinition,
  start: { badness: number; entry: Evaluated } | undefined,
  evaluate: (point: readonly number[]) => Evaluated,
  exhausted: () => boolean,
): void {
  if (start === undefined || start.badness === -Infinity || exhausted()) return;
  const objective = (point: readonly number[]): number => {
    const entry = evaluate(point);
    return entry.margins.verdict !== 'stable' ? Infinity : badness(figureValue(entry.margins, definition.name), definition);
  };
  // Only new analyses count: points another figure's search already analysed come from the cache.
  compassSearch({ start: start.entry.point, startValue: start.badness, objective, exhausted });
}

/** How the search runs at each speed for a set of `dimensions` varied parameters, in words (recorded in the schedule). */
export function searchMethodWords(dimensions: number): string {
  const corners =
    dimensions <= ALL_CORNERS_UP_TO_DIMENSIONS
      ? `every corner of the box (${2 ** dimensions})`
      : `the corners picked by a one-at-a-time screening of each parameter, then a coordinate search over the corners from the worst one of each figure`;
  return (
    `at each check speed: the nominal vehicle, ${corners}, the seeded samples inside the box, then a compass search (Kolda, Lewis & Torczon 2003) ` +
    'from the worst point of each figure within the analysis budget; each worst point kept is analysed in full (delay margin confirmed by the exact verdict)'
  );
}
