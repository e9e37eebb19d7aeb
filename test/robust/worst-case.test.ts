/**
 * The worst case over a set of vehicles at one speed: against a brute-force dense sampling of small boxes, the
 * properties any worst case must have (never better than nominal; a smaller box never worse), and an unstable
 * member named as the worst case of all.
 */
import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { analysisWithChanges, worstCaseMarginsAt } from '../../src/pipeline/robust-analysis.js';
import { ROBUST_FIGURES, badness } from '../../src/robust/figures.js';
import { judgeRobust } from '../../src/robust/robust-check.js';
import { THRESHOLD_DEFAULTS } from '../../src/schedule/dense-check.js';
import type { WrittenVariations } from '../../src/schedule/plan-variations.js';
import { vanContext, vanGains } from './van-loop.js';

/** The worst of each figure over a grid of `perAxis` points on each axis of the box (ends included), by full analyses. */
function bruteForce(speed_mps: number, written: WrittenVariations, perAxis: number) {
  const context = vanContext(written);
  const analyse = analysisWithChanges(speed_mps, vanGains(speed_mps), context);
  const k = context.set.dimensions.length;
  const worst = new Map<string, number>();
  for (let index = 0; index < perAxis ** k; index++) {
    const values = context.set.dimensions.map((dimension, i) => {
      const step = Math.floor(index / perAxis ** i) % perAxis;
      return dimension.minimum + ((dimension.maximum - dimension.minimum) * step) / (perAxis - 1);
    });
    const margins = analyse(values);
    expect(margins.verdict).toBe('stable');
    for (const definition of ROBUST_FIGURES) {
      const value = margins[definition.name];
      if (value === null) continue;
      const current = worst.get(definition.name);
      if (current === undefined || badness(value, definition) > badness(current, definition)) worst.set(definition.name, value);
    }
  }
  return worst;
}

describe('worstCaseMarginsAt on small boxes', () => {
  const cases: { speed_mps: number; written: WrittenVariations }[] = [
    { speed_mps: 25, written: { rearCorneringStiffness_pct: 3, addedLatency_s: 0.004 } },
    { speed_mps: 12, written: { mass_pct: 3, frontCorneringStiffness_pct: 3, actuatorLag_pct: [-3, 5] } },
    { speed_mps: 4, written: { yawInertia_pct: 4, rearCorneringStiffness_pct: [-4, 2], cgRearwardShift_m: 0.05 } },
  ];
  for (const { speed_mps, written } of cases) {
    it(`equals a brute-force dense sampling of the box within 0.1° and 0.1 dB at ${speed_mps} m/s (${Object.keys(written).join(', ')})`, () => {
      // Source: an independent brute-force search, every point of a 9-point grid on each axis analysed in full
      // (the accuracy asked of the search: 0.1° of phase margin, 0.1 dB of gain margin).
      const reference = bruteForce(speed_mps, written, 9);
      const found = worstCaseMarginsAt(speed_mps, vanGains(speed_mps), vanContext(written));
      expect(found.instability).toBeNull();
      expect(Math.abs(found.worst.phaseMargin_deg!.value - reference.get('phaseMargin_deg')!)).toBeLessThan(0.1);
      expect(Math.abs(found.worst.upperGainMargin_dB!.value - reference.get('upperGainMargin_dB')!)).toBeLessThan(0.1);
      expect(Math.abs(found.worst.sensitivityPeak!.value - reference.get('sensitivityPeak')!)).toBeLessThan(0.01);
      expect(Math.abs(found.worst.delayMargin_s!.value - reference.get('delayMargin_s')!)).toBeLessThan(1e-3);
      expect(Math.abs(found.worst.complementarySensitivityPeak!.value - reference.get('complementarySensitivityPeak')!)).toBeLessThan(0.01);
    });
  }
});

describe('properties of the worst case (fast-check, real van loops)', () => {
  const box = fc.record({
    speed_mps: fc.double({ min: 3, max: 25, noNaN: true }),
    mass: fc.double({ min: 0, max: 20, noNaN: true }),
    rear: fc.double({ min: 0, max: 20, noNaN: true }),
    lag: fc.double({ min: 0, max: 25, noNaN: true }),
    latency: fc.double({ min: 0, max: 0.02, noNaN: true }),
    shrink: fc.double({ min: 0.05, max: 0.95, noNaN: true }),
  });
  const written = (b: { mass: number; rear: number; lag: number; latency: number }, factor = 1): WrittenVariations => ({
    mass_pct: b.mass * factor,
    rearCorneringStiffness_pct: b.rear * factor,
    actuatorLag_pct: b.lag * factor,
    addedLatency_s: b.latency * factor,
  });

  it('the worst case is never better than the nominal figure, and shrinking the box never makes it worse', () => {
    // Source: definitions — the nominal vehicle is a member of the set, and a box inside another is a subset of it
    // (the worst over a subset cannot be worse); common practice.
    fc.assert(
      fc.property(box, (b) => {
        const gains = vanGains(b.speed_mps);
        const full = worstCaseMarginsAt(b.speed_mps, gains, vanContext(written(b), { samples: 8, localSearchEvaluations: 8 }));
        const small = worstCaseMarginsAt(b.speed_mps, gains, vanContext(written(b, b.shrink), { samples: 8, localSearchEvaluations: 8 }));
        for (const result of [full, small]) {
          if (result.instability !== null) continue;
          for (const definition of ROBUST_FIGURES) {
            const nominal = result.nominal[definition.name];
            const worst = result.worst[definition.name]?.value ?? null;
            expect(badness(worst, definition), definition.name).toBeGreaterThanOrEqual(badness(nominal, definition));
          }
        }
        if (full.instability !== null) return;
        expect(small.instability).toBeNull();
        // To rounding: a box a few 1e−12 wide moves the figures by the analysis' own rounding (1e−14 relative).
        const rounding = (value: number): number => (Number.isFinite(value) ? 1e-9 * Math.abs(value) : 0);
        for (const definition of ROBUST_FIGURES) {
          const bound = badness(full.worst[definition.name]?.value ?? null, definition);
          expect(badness(small.worst[definition.name]?.value ?? null, definition), definition.name).toBeLessThanOrEqual(bound + rounding(bound));
        }
      }),
      { numRuns: 30, seed: 16 },
    );
  });
});

describe('a set holding an unstable loop', () => {
  it('is the worst case of all: the combination is named, every worst figure is null, and the check fails on stability alone', () => {
    // Source: a delay of 0.4 s more than the van's 0.06 s destabilises its 25 m/s SIMC loop, whose delay margin is
    // about 0.19 s (the nominal analysis below says so; margins are distances to instability, Åström & Murray 2008 §9.3).
    const gains = vanGains(25);
    const found = worstCaseMarginsAt(25, gains, vanContext({ addedLatency_s: 0.4, mass_pct: 5 }));
    expect(found.nominal.delayMargin_s!).toBeLessThan(0.4);
    expect(found.instability).not.toBeNull();
    expect(found.instability!.combination.actuatorDelay_s).toBeGreaterThan(found.nominal.delayMargin_s!);
    for (const definition of ROBUST_FIGURES) expect(found.worst[definition.name]).toBeNull();
    const failures = judgeRobust(found, THRESHOLD_DEFAULTS);
    expect(failures.map((failure) => failure.criterion)).toEqual(['stability']);
    expect(failures[0].message).toMatch(/^closed loop unstable with .*actuator delay \+0\.\d{3} s/);
  });

  it("Mt is judged like the other limits: a worst Mt above the plan's limit fails, naming its combination", () => {
    const found = worstCaseMarginsAt(25, vanGains(25), vanContext({ rearCorneringStiffness_pct: 20, addedLatency_s: 0.01 }));
    expect(found.instability).toBeNull();
    const mt = found.worst.complementarySensitivityPeak!;
    expect(mt.value).toBeGreaterThan(found.nominal.complementarySensitivityPeak!);
    // A limit between the nominal and the worst Mt: only the worst case breaks it.
    const limit = (mt.value + found.nominal.complementarySensitivityPeak!) / 2;
    const failures = judgeRobust(found, { ...THRESHOLD_DEFAULTS, maximumComplementarySensitivityPeak: limit });
    const failure = failures.find((entry) => entry.criterion === 'complementarySensitivityPeak')!;
    expect(failure.value).toBe(mt.value);
    expect(failure.message).toMatch(/^peak complementary sensitivity .* \(worst case: .*rear cornering stiffness −20\.0 %/);
  });

  it('a box of zero width is the nominal vehicle: one analysis, the nominal figures', () => {
    const found = worstCaseMarginsAt(10, vanGains(10), vanContext({}));
    expect(found.evaluations).toBe(1);
    expect(found.worst.phaseMargin_deg!.value).toBe(found.nominal.phaseMargin_deg);
    expect(found.worst.phaseMargin_deg!.combination).toEqual({});
  });
});
