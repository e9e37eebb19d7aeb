import { describe, expect, it } from 'vitest';
import { isSpeedbandError } from '../../src/core/errors.js';
import { resolvePlan } from '../../src/schedule/plan.js';
import { planFromJson } from '../../src/schedule/plan-file.js';
import { VARIATION_DEFAULTS } from '../../src/schedule/plan-variations.js';

function planError(value: unknown): { code: string; jsonPath?: string; message: string } {
  try {
    planFromJson(value);
  } catch (error) {
    if (isSpeedbandError(error)) return { code: error.code, jsonPath: error.location?.jsonPath, message: error.message };
    throw error;
  }
  throw new Error('expected a plan error');
}

describe("the plan's variations section", () => {
  it('is absent by default: the schedule is checked on the nominal model only', () => {
    expect(resolvePlan({}).variations).toBeUndefined();
  });

  it("given as {}, takes every default: ± ranges, one sample of added latency, the identification's intervals, robust acceptance", () => {
    const variations = resolvePlan({ variations: {} }, { vehicleSampleTime_s: 0.02 }).variations!;
    expect(variations.acceptance).toBe('robust');
    expect(variations.mass_pct).toEqual([-VARIATION_DEFAULTS.mass_pct, VARIATION_DEFAULTS.mass_pct]);
    expect(variations.rearCorneringStiffness_pct).toEqual([-VARIATION_DEFAULTS.rearCorneringStiffness_pct, VARIATION_DEFAULTS.rearCorneringStiffness_pct]);
    expect(variations.cgRearwardShift_m).toEqual([0, 0]);
    expect(variations.addedLatency_s).toBe(0.02);
    expect(variations.fromIdentification).toBe(true);
    expect(variations.search).toEqual(VARIATION_DEFAULTS.search);
  });

  it('takes [down, up] ranges and partial search settings as written', () => {
    const variations = planFromJson({ variations: { mass_pct: [-5, 30], cgRearwardShift_m: [-0.1, 0.2], acceptance: 'nominal', search: { samples: 10 } } })
      .variations!;
    expect(variations.mass_pct).toEqual([-5, 30]);
    expect(variations.cgRearwardShift_m).toEqual([-0.1, 0.2]);
    expect(variations.acceptance).toBe('nominal');
    expect(variations.search).toEqual({ ...VARIATION_DEFAULTS.search, samples: 10 });
  });

  it('refuses a range that does not hold the nominal value, an unknown field (with the closest name) and a bad acceptance, by JSON path', () => {
    expect(planError({ variations: { mass_pct: [5, 30] } })).toMatchObject({ code: 'plan.invalid' });
    expect(planError({ variations: { mass_pct: [5, 30] } }).message).toMatch(/\/variations\/mass_pct/);
    expect(planError({ variations: { rearCorneringStifness_pct: 10 } }).message).toMatch(/did you mean "rearCorneringStiffness_pct"/);
    expect(planError({ variations: { acceptance: 'strict' } }).message).toMatch(/\/variations\/acceptance.*robust, nominal/);
    expect(planError({ variations: { search: { samples: -1 } } }).message).toMatch(/\/variations\/search\/samples/);
  });

  it('rule.searchOn: a fastest-passing search aims at the worst case by default only under robust acceptance of a variations section; a setting that cannot apply is refused', () => {
    // Without variations, or with a rule that is not searched: the nominal model.
    expect(resolvePlan({ loop: { kind: 'heading' } }).rule.searchOn).toBe('nominal');
    expect(resolvePlan({ variations: {} }).rule.searchOn).toBe('nominal');
    // A search with variations under robust acceptance: the worst case; under nominal acceptance: the nominal model.
    expect(resolvePlan({ loop: { kind: 'heading' }, variations: {} }).rule.searchOn).toBe('worst-case');
    expect(resolvePlan({ loop: { kind: 'path' }, variations: { acceptance: 'nominal' } }).rule.searchOn).toBe('nominal');
    // As written, when it can apply.
    expect(resolvePlan({ loop: { kind: 'heading' }, variations: {}, rule: { searchOn: 'nominal' } }).rule.searchOn).toBe('nominal');
    expect(resolvePlan({ loop: { kind: 'path' }, variations: { acceptance: 'nominal' }, rule: { searchOn: 'worst-case' } }).rule.searchOn).toBe('worst-case');
    expect(planError({ loop: { kind: 'heading' }, rule: { searchOn: 'worst-case' } })).toMatchObject({ code: 'plan.invalid', jsonPath: '/rule/searchOn' });
    expect(planError({ loop: { kind: 'heading' }, rule: { searchOn: 'worst-case' } }).message).toMatch(/no variations section/);
    expect(planError({ variations: {}, rule: { searchOn: 'worst-case' } }).message).toMatch(/not searched \(tuneFor "rule-parameters"\)/);
    expect(planError({ rule: { searchOn: 'worst' } }).message).toMatch(/\/rule\/searchOn.*nominal, worst-case/);
  });
});
