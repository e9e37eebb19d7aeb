/**
 * The set of vehicles a schedule must hold on, as a box of changes around its check model: from the plan's
 * `variations` (load, tyres, actuator, latency) and, when asked, the identification's 95 % intervals
 * (models.json). On the single-track model: mass, yaw inertia, CG position, both cornering stiffnesses,
 * actuator lag (factors) and the actuator delay (an offset: the identified interval plus the added latency).
 * On the interpolated lumped models: the FOPDT gain and time constant (factors, the widest relative 95 %
 * interval over the test speeds) and the dead time (offset, plus the added latency); the vehicle's physical
 * variations do not apply there and are listed as not applied.
 */
import { SpeedbandError } from '../core/errors.js';
import type { Interval, ModelsFile } from '../identify/models-schema.js';
import type { ChangeRange, PlanVariations } from '../schedule/plan-variations.js';
import type { OperatingPointModel } from '../tuning/operating-point.js';
import type { SingleTrackParameters } from '../vehicle/types.js';
import type { VariationDimension, VariationSet, VariedParameter } from './types.js';

/** What the set needs of a check model's summary (src/pipeline/check-model.ts CheckModelSummary): its kind and, for the single-track model, its parameters. */
export type VariedModelSummary = ({ readonly kind: 'single-track' } & SingleTrackParameters) | { readonly kind: 'interpolated-lumped' };

const shown = (value: number): string => String(Number(value.toPrecision(4))).replace('-', '−');
const percentWords = ([down, up]: ChangeRange): string => (down === -up ? `±${shown(up)} %` : `${shown(down)} % to +${shown(up)} %`);
const factors = ([down, up]: ChangeRange): [number, number] => [1 + down / 100, 1 + up / 100];

/** A factor range widened by the identification's interval [low, high] around `nominal` (nominal > 0). */
function withInterval(stated: [number, number], interval: Interval | undefined, nominal: number): { range: [number, number]; words: string } {
  if (interval === undefined || !(nominal > 0)) return { range: stated, words: '' };
  return {
    range: [(Math.min(interval[0], nominal) / nominal) * stated[0], (Math.max(interval[1], nominal) / nominal) * stated[1]],
    words: ` beyond the identification's 95 % interval ${shown(interval[0])} to ${shown(interval[1])}`,
  };
}

function scale(parameter: VariedParameter, range: [number, number], source: string): VariationDimension {
  return { parameter, change: 'scale', minimum: range[0], maximum: range[1], source };
}

function singleTrackSet(
  variations: PlanVariations,
  summary: Extract<VariedModelSummary, { kind: 'single-track' }>,
  models: ModelsFile | null,
  file?: string,
): VariationDimension[] {
  const intervals = variations.fromIdentification ? models?.singleTrack?.ci95 : undefined;
  const [forward, rearward] = variations.cgRearwardShift_m;
  if (!(summary.cgToFrontAxle_m + forward > 0 && summary.cgToRearAxle_m - rearward > 0)) {
    throw new SpeedbandError(
      'plan.invalid',
      `variations.cgRearwardShift_m from ${forward} to ${rearward} m moves the centre of gravity past an axle (CG to front axle ${summary.cgToFrontAxle_m} m, to rear axle ${summary.cgToRearAxle_m} m) — give a shift within the wheelbase`,
      { location: { file, jsonPath: '/variations/cgRearwardShift_m' } },
    );
  }
  const stiffness = (parameter: 'frontCorneringStiffness_NPerRad' | 'rearCorneringStiffness_NPerRad', stated: ChangeRange): VariationDimension => {
    const widened = withInterval(factors(stated), intervals?.[parameter], summary[parameter]);
    return scale(parameter, widened.range, `plan ${percentWords(stated)}${widened.words} N/rad`);
  };
  const lag = withInterval(factors(variations.actuatorLag_pct), intervals?.actuatorLag_s, summary.actuatorLag_s);
  const delayInterval = intervals?.actuatorDelay_s;
  const delayLow = delayInterval === undefined ? 0 : Math.max(-summary.actuatorDelay_s, Math.min(0, delayInterval[0] - summary.actuatorDelay_s));
  const delayHigh = (delayInterval === undefined ? 0 : Math.max(0, delayInterval[1] - summary.actuatorDelay_s)) + variations.addedLatency_s;
  return [
    scale('mass_kg', factors(variations.mass_pct), `plan ${percentWords(variations.mass_pct)}`),
    scale('yawInertia_kgm2', factors(variations.yawInertia_pct), `plan ${percentWords(variations.yawInertia_pct)}`),
    {
      parameter: 'cgToFrontAxle_m',
      change: 'add',
      minimum: forward,
      maximum: rearward,
      source: `plan: CG ${shown(-forward)} m forward to ${shown(rearward)} m rearward, wheelbase kept`,
    },
    stiffness('frontCorneringStiffness_NPerRad', variations.frontCorneringStiffness_pct),
    stiffness('rearCorneringStiffness_NPerRad', variations.rearCorneringStiffness_pct),
    scale('actuatorLag_s', lag.range, `plan ${percentWords(variations.actuatorLag_pct)}${lag.words} s`),
    {
      parameter: 'actuatorDelay_s',
      change: 'add',
      minimum: delayLow,
      maximum: delayHigh,
      source: `${delayInterval === undefined ? '' : `the identification's 95 % interval ${shown(delayInterval[0])} to ${shown(delayInterval[1])} s, `}plus up to ${shown(variations.addedLatency_s)} s added latency`,
    },
  ];
}

/** The widest relative interval of one FOPDT parameter over the test speeds, as factors [low, high] (each containing 1). */
function widestFactors(models: ModelsFile, pick: (fopdt: ModelsFile['speeds'][number]['fopdt']) => { value: number; interval: Interval }): [number, number] {
  let low = 1;
  let high = 1;
  for (const speed of models.speeds) {
    const { value, interval } = pick(speed.fopdt);
    if (value === 0) continue;
    const ratios = [interval[0] / value, interval[1] / value];
    low = Math.min(low, ...ratios);
    high = Math.max(high, ...ratios);
  }
  return [low, high];
}

function lumpedSet(variations: PlanVariations, models: ModelsFile | null): VariationDimension[] {
  const identified = variations.fromIdentification && models !== null && models.speeds.length > 0 ? models : null;
  const dimensions: VariationDimension[] = [];
  let deadTime: [number, number] = [0, 0];
  if (identified !== null) {
    const words = 'the widest relative 95 % interval of the per-speed FOPDT fits';
    dimensions.push(
      scale(
        'gain',
        widestFactors(identified, (f) => ({ value: f.gain, interval: f.ci95.gain })),
        words,
      ),
    );
    dimensions.push(
      scale(
        'timeConstant_s',
        widestFactors(identified, (f) => ({ value: f.timeConstant_s, interval: f.ci95.timeConstant_s })),
        words,
      ),
    );
    for (const speed of identified.speeds) {
      deadTime = [
        Math.min(deadTime[0], speed.fopdt.ci95.deadTime_s[0] - speed.fopdt.deadTime_s),
        Math.max(deadTime[1], speed.fopdt.ci95.deadTime_s[1] - speed.fopdt.deadTime_s),
      ];
    }
  }
  dimensions.push({
    parameter: 'deadTime_s',
    change: 'add',
    minimum: deadTime[0],
    maximum: deadTime[1] + variations.addedLatency_s,
    source: `${identified === null ? '' : 'the widest 95 % interval of the per-speed dead times, '}plus up to ${shown(variations.addedLatency_s)} s added latency`,
  });
  return dimensions;
}

const PHYSICAL_FIELDS = [
  'mass_pct',
  'yawInertia_pct',
  'cgRearwardShift_m',
  'frontCorneringStiffness_pct',
  'rearCorneringStiffness_pct',
  'actuatorLag_pct',
] as const;

/**
 * The variation set of a plan on a check model (its summary, as recorded in a schedule). `models`: the
 * identification, for its 95 % intervals (null: the plan's variations only). Dimensions of zero width are
 * left out. Throws `plan.invalid` for a CG shift past an axle.
 */
export function resolveVariationSet(variations: PlanVariations, summary: VariedModelSummary, models: ModelsFile | null, file?: string): VariationSet {
  const keep = (dimensions: VariationDimension[]): VariationDimension[] => dimensions.filter((dimension) => dimension.maximum > dimension.minimum);
  if (summary.kind === 'single-track') {
    return { model: 'single-track', dimensions: keep(singleTrackSet(variations, summary, models, file)), notApplied: [] };
  }
  const notApplied = PHYSICAL_FIELDS.filter((field) => variations[field][0] !== 0 || variations[field][1] !== 0).map((field) => ({
    field,
    reason: 'the check runs on interpolated lumped models (per-speed FOPDT), which have no such parameter; build on the joint single-track fit to vary it',
  }));
  return { model: 'interpolated-lumped', dimensions: keep(lumpedSet(variations, models)), notApplied };
}

/** The operating-point model with the set's changes `values` (one per dimension, in order) applied. */
export function operatingPointWith(base: OperatingPointModel, set: VariationSet, values: readonly number[]): OperatingPointModel {
  if (base.kind === 'single-track') {
    const p = { ...base.parameters };
    set.dimensions.forEach((dimension, i) => {
      const v = values[i];
      switch (dimension.parameter) {
        case 'cgToFrontAxle_m':
          p.cgToFrontAxle_m = base.parameters.cgToFrontAxle_m + v;
          p.cgToRearAxle_m = base.parameters.cgToRearAxle_m - v;
          break;
        case 'actuatorDelay_s':
          p.actuatorDelay_s = Math.max(0, base.parameters.actuatorDelay_s + v);
          break;
        case 'mass_kg':
        case 'yawInertia_kgm2':
        case 'frontCorneringStiffness_NPerRad':
        case 'rearCorneringStiffness_NPerRad':
        case 'actuatorLag_s':
          p[dimension.parameter] = base.parameters[dimension.parameter] * v;
          break;
        default:
          throw new Error(`internal: ${dimension.parameter} is not a single-track parameter`);
      }
    });
    return { kind: 'single-track', parameters: p };
  }
  if (base.yawRate.kind !== 'fopdt') throw new Error('internal: the lumped check model is a FOPDT model');
  const f = { ...base.yawRate };
  set.dimensions.forEach((dimension, i) => {
    const v = values[i];
    if (dimension.parameter === 'gain') f.gain = base.yawRate.gain * v;
    else if (dimension.parameter === 'timeConstant_s') f.timeConstant_s = (base.yawRate as typeof f).timeConstant_s * v;
    else if (dimension.parameter === 'deadTime_s') f.deadTime_s = Math.max(0, base.yawRate.deadTime_s + v);
    else throw new Error(`internal: ${dimension.parameter} is not a parameter of the lumped model`);
  });
  return { ...base, yawRate: f };
}
