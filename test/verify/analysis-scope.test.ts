/**
 * Analysis scope 'figures' (used by the worst-case search, which analyses the points it keeps in full): the same
 * verdict, gain and phase margins and peaks as a full analysis; the delay margin is the crossover estimate.
 */
import { describe, expect, it } from 'vitest';
import { analyseOperatingPoint } from '../../src/pipeline/loop-analysis.js';
import { CONTROLLER, VAN_MODEL, vanGains } from '../robust/van-loop.js';

describe("analyseLoop with scope 'figures'", () => {
  const cases = [3, 8, 15, 25].flatMap((speed_mps) => [
    { speed_mps, loop: { kind: 'yaw-rate' as const }, gains: vanGains(speed_mps) },
    {
      speed_mps,
      loop: { kind: 'path' as const, preview_m: 2, referencePoint: 'front-axle' as const },
      gains: { kp: 0.06 / speed_mps, ki: 0.002 / speed_mps, kd: 0.25 / speed_mps },
    },
  ]);
  for (const { speed_mps, loop, gains } of cases) {
    it(`gives the full analysis' verdict, margins and peaks on the van's ${loop.kind} loop at ${speed_mps} m/s, and the delay margin's crossover estimate`, () => {
      const full = analyseOperatingPoint({ operatingPoint: VAN_MODEL.modelAt(speed_mps), loop, controller: CONTROLLER, speed_mps, gains });
      const figures = analyseOperatingPoint({ operatingPoint: VAN_MODEL.modelAt(speed_mps), loop, controller: CONTROLLER, speed_mps, gains, scope: 'figures' });
      for (const name of [
        'verdict',
        'phaseMargin_deg',
        'lowerGainMargin_dB',
        'upperGainMargin_dB',
        'sensitivityPeak',
        'complementarySensitivityPeak',
      ] as const) {
        expect(figures[name], name).toBe(full[name]);
      }
      expect(figures.analysis?.encirclementVerdict).toBe('undetermined');
      if (full.verdict !== 'stable') return;
      // Source: the delay margin's estimate, min over the gain crossovers of the phase lag to −1 over the frequency
      // (Åström & Murray 2008, §9.3), from the crossovers the full analysis lists.
      const estimate = Math.min(
        ...full.analysis!.gainCrossovers.map(
          (c) => ((c.phaseMargin_deg > 0 ? c.phaseMargin_deg : c.phaseMargin_deg + 360) * Math.PI) / 180 / c.frequency_radps,
        ),
      );
      expect(figures.delayMargin_s).toBeCloseTo(estimate, 12);
      expect(figures.analysis?.delayMarginNote).toMatch(/not confirmed/);
    });
  }
});
