import { describe, expect, it } from 'vitest';
import { checkModelFromSummary } from '../../src/pipeline/check-model.js';
import { isSpeedbandError } from '../../src/core/errors.js';
import type { ModelsFile } from '../../src/identify/models-schema.js';
import { operatingPointWith, resolveVariationSet } from '../../src/robust/variation-set.js';
import { resolveVariations } from '../../src/schedule/plan-variations.js';
import { VAN, VAN_MODEL } from './van-loop.js';

// The parts of a models file the set reads: the joint fit's 95 % intervals and the per-speed FOPDT intervals.
const MODELS = {
  singleTrack: {
    ci95: {
      frontCorneringStiffness_NPerRad: [VAN.frontCorneringStiffness_NPerRad * 0.99, VAN.frontCorneringStiffness_NPerRad * 1.02],
      rearCorneringStiffness_NPerRad: [VAN.rearCorneringStiffness_NPerRad * 0.98, VAN.rearCorneringStiffness_NPerRad * 1.01],
      actuatorLag_s: [VAN.actuatorLag_s * 0.95, VAN.actuatorLag_s * 1.05],
      actuatorDelay_s: [VAN.actuatorDelay_s - 0.002, VAN.actuatorDelay_s + 0.003],
      understeerGradient_radPerMps2: [0, 0],
    },
  },
  speeds: [
    {
      speed_mps: 5,
      fopdt: { gain: 2, timeConstant_s: 0.2, deadTime_s: 0.08, ci95: { gain: [1.9, 2.2], timeConstant_s: [0.19, 0.22], deadTime_s: [0.075, 0.09] } },
    },
    {
      speed_mps: 20,
      fopdt: { gain: 4, timeConstant_s: 0.1, deadTime_s: 0.07, ci95: { gain: [3.6, 4.1], timeConstant_s: [0.095, 0.12], deadTime_s: [0.068, 0.071] } },
    },
  ],
} as unknown as ModelsFile;

const byName = (set: ReturnType<typeof resolveVariationSet>) => Object.fromEntries(set.dimensions.map((dimension) => [dimension.parameter, dimension]));

describe('resolveVariationSet on the joint single-track model', () => {
  it("widens the plan's percentages by the identification's 95 % intervals and adds the latency to the delay", () => {
    // Source: the plan reference's definition — factors (low/nominal)(1 − p) to (high/nominal)(1 + p); delay offset from
    // the interval's low end to its high end plus the added latency.
    const variations = resolveVariations({ mass_pct: [-5, 15], rearCorneringStiffness_pct: 10, addedLatency_s: 0.02 }, 0.01);
    const set = byName(resolveVariationSet(variations, VAN_MODEL.summary, MODELS));
    expect([set.mass_kg.minimum, set.mass_kg.maximum]).toEqual([0.95, 1.15]);
    expect(set.rearCorneringStiffness_NPerRad.minimum).toBeCloseTo(0.98 * 0.9, 12);
    expect(set.rearCorneringStiffness_NPerRad.maximum).toBeCloseTo(1.01 * 1.1, 12);
    expect(set.frontCorneringStiffness_NPerRad.minimum).toBeCloseTo(0.99 * 0.8, 12); // the default ±20 %
    expect(set.actuatorDelay_s.minimum).toBeCloseTo(-0.002, 12);
    expect(set.actuatorDelay_s.maximum).toBeCloseTo(0.003 + 0.02, 12);
    expect(set.cgToFrontAxle_m).toBeUndefined(); // zero width: left out
    expect(set.rearCorneringStiffness_NPerRad.source).toMatch(/plan ±10 % beyond the identification's 95 % interval/);
  });

  it("without the identification: the plan's ranges only, the delay from 0 to the added latency", () => {
    const set = byName(resolveVariationSet(resolveVariations({ fromIdentification: false }, 0.01), VAN_MODEL.summary, MODELS));
    expect([set.frontCorneringStiffness_NPerRad.minimum, set.frontCorneringStiffness_NPerRad.maximum]).toEqual([0.8, 1.2]);
    expect([set.actuatorDelay_s.minimum, set.actuatorDelay_s.maximum]).toEqual([0, 0.01]);
  });

  it('refuses a CG shift that moves the centre of gravity past an axle, naming the field', () => {
    const error = (() => {
      try {
        resolveVariationSet(resolveVariations({ cgRearwardShift_m: [-0.1, 2] }, 0.01), VAN_MODEL.summary, null, 'plan.json');
      } catch (caught) {
        return caught;
      }
      return null;
    })();
    expect(isSpeedbandError(error) && error.code).toBe('plan.invalid');
    expect(isSpeedbandError(error) && error.location?.jsonPath).toBe('/variations/cgRearwardShift_m');
  });

  it('applies a combination: factors multiply, the CG moves rearward with the wheelbase kept, the delay adds', () => {
    const set = resolveVariationSet(resolveVariations({ cgRearwardShift_m: 0.2, fromIdentification: false }, 0.01), VAN_MODEL.summary, null);
    const values = set.dimensions.map((dimension) => dimension.maximum);
    const changed = operatingPointWith(VAN_MODEL.modelAt(10), set, values);
    if (changed.kind !== 'single-track') throw new Error('expected the single-track model');
    const p = changed.parameters;
    expect(p.mass_kg).toBeCloseTo(VAN.mass_kg * 1.1, 9);
    expect(p.cgToFrontAxle_m).toBeCloseTo(VAN.cgToFrontAxle_m + 0.2, 12);
    expect(p.cgToFrontAxle_m + p.cgToRearAxle_m).toBeCloseTo(VAN.cgToFrontAxle_m + VAN.cgToRearAxle_m, 12);
    expect(p.actuatorDelay_s).toBeCloseTo(VAN.actuatorDelay_s + 0.01, 12);
    expect(p.rearCorneringStiffness_NPerRad).toBeCloseTo(VAN.rearCorneringStiffness_NPerRad * 1.2, 6);
  });
});

describe('resolveVariationSet on the interpolated lumped models', () => {
  const lumped = checkModelFromSummary(
    {
      kind: 'interpolated-lumped',
      cgToFrontAxle_m: VAN.cgToFrontAxle_m,
      speeds: MODELS.speeds.map((speed) => ({ speed_mps: speed.speed_mps, ...speed.fopdt })),
    },
    'lumped test models',
  );

  it("varies the FOPDT gain, time constant and dead time by the widest relative interval over the test speeds, and lists the vehicle's own variations as not applied", () => {
    // Source: the intervals above — gain 1.9/2 … 2.2/2 and 3.6/4 … 4.1/4 give 0.9 … 1.1; time constant 0.95 … 1.2;
    // dead time −0.005 … +0.01 s, plus the added latency.
    const set = resolveVariationSet(resolveVariations({ addedLatency_s: 0.01 }, 0.01), lumped.summary, MODELS);
    const dimensions = byName(set);
    expect(dimensions.gain.minimum).toBeCloseTo(0.9, 12);
    expect(dimensions.gain.maximum).toBeCloseTo(1.1, 12);
    expect(dimensions.timeConstant_s.minimum).toBeCloseTo(0.95, 12);
    expect(dimensions.timeConstant_s.maximum).toBeCloseTo(1.2, 12);
    expect(dimensions.deadTime_s.minimum).toBeCloseTo(-0.005, 12);
    expect(dimensions.deadTime_s.maximum).toBeCloseTo(0.02, 12);
    expect(set.notApplied.map((entry) => entry.field)).toEqual([
      'mass_pct',
      'yawInertia_pct',
      'frontCorneringStiffness_pct',
      'rearCorneringStiffness_pct',
      'actuatorLag_pct',
    ]);
    const changed = operatingPointWith(lumped.modelAt(5), set, [1.1, 0.95, 0.02]);
    expect(changed.kind === 'lumped' && changed.yawRate).toEqual({ kind: 'fopdt', gain: 2.2, timeConstant_s: 0.2 * 0.95, deadTime_s: 0.1 });
  });
});
