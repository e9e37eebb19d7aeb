import { describe, expect, it } from 'vitest';
import { identifyFromLogs } from '../../src/identify/identify-from-logs.js';
import { loadVehicle } from '../../src/vehicle/load.js';

// Tolerances of the identification brief (issue 3): cornering stiffnesses within 5 %, actuator delay within 10 ms.
const STIFFNESS_RELATIVE = 0.05;
const ACTUATOR_DELAY_S = 0.01;

/**
 * Every demo vehicle with four of its bundled synthetic logs, spread over its speed range. The logs come
 * from the exact simulator driven by the vehicle file's nominal stiffnesses and actuator (DEMO_FLEET,
 * src/vehicle/demo-fleet.ts), so those values are the truth the joint fit must recover.
 */
const FLEET = [
  { name: 'parcel-van', speeds: ['04.00', '10.00', '15.00', '25.00'] },
  { name: 'vineyard-sprayer', speeds: ['00.50', '01.50', '02.50', '04.00'] },
  { name: 'sidewalk-robot', speeds: ['00.50', '01.25', '02.00', '03.00'] },
] as const;

describe('identifyFromLogs recovers the simulated vehicle on every demo vehicle (bundled logs)', () => {
  for (const { name, speeds } of FLEET) {
    it(`${name}: joint single-track Cf and Cr within 5 %, actuator delay within 10 ms, lag within 10 % of the vehicle file`, () => {
      const folder = `vehicles/${name}`;
      // Source: the vehicle file's nominal values, the simulator's inputs for the bundled logs.
      const truth = loadVehicle(folder);
      const models = identifyFromLogs({ vehicle: folder, logPaths: speeds.map((speed) => `${folder}/logs/synthetic-steps-${speed}mps.csv`) });
      expect(models.speeds).toHaveLength(speeds.length);
      expect(models.refusedTests).toEqual([]);
      const fit = models.singleTrack;
      expect(models.singleTrackRefusal).toBeNull();
      expect(Math.abs(fit!.frontCorneringStiffness_NPerRad / truth.frontCorneringStiffness_NPerRad! - 1)).toBeLessThan(STIFFNESS_RELATIVE);
      expect(Math.abs(fit!.rearCorneringStiffness_NPerRad / truth.rearCorneringStiffness_NPerRad! - 1)).toBeLessThan(STIFFNESS_RELATIVE);
      expect(Math.abs(fit!.actuatorDelay_s - truth.actuatorDelay_s!)).toBeLessThan(ACTUATOR_DELAY_S);
      expect(Math.abs(fit!.actuatorLag_s / truth.actuatorLag_s! - 1)).toBeLessThan(0.1);
      // Understeer gradient K = (m/L)(b/Cf − a/Cr) with the nominal values (Gillespie 1992; docs/domain.md §3): within 10 %.
      const a = truth.cgToFrontAxle_m;
      const b = truth.cgToRearAxle_m;
      const nominal = (truth.mass_kg / (a + b)) * (b / truth.frontCorneringStiffness_NPerRad! - a / truth.rearCorneringStiffness_NPerRad!);
      expect(Math.abs(fit!.understeerGradient_radPerMps2 / nominal - 1)).toBeLessThan(0.1);
    }, 20_000);
  }
});
