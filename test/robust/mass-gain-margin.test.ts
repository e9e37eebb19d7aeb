/**
 * Gain-margin limits of a single-track loop under mass variation against the analytic steady-state yaw gain.
 * An oversteering vehicle above its critical speed is open-loop unstable; yaw-rate feedback k stabilises it only
 * while k·|G(0)| > 1, G(0) = vx/(L + K·vx²) < 0 (Gillespie 1992, Fundamentals of Vehicle Dynamics, §6; Rajamani
 * 2012, Vehicle Dynamics and Control, §3.3), with the understeer gradient K = (m/L)(b/Cf − a/Cr) growing with the
 * mass m. So the lower gain margin, −20·log10(k·|G(0)|) (the zero-frequency crossing), is nearest 0 dB at the
 * heaviest mass, and the loop goes unstable once the mass passes the one where k·|G(0)| = 1.
 */
import { describe, expect, it } from 'vitest';
import { checkModelFromSummary } from '../../src/pipeline/check-model.js';
import { worstCaseMarginsAt } from '../../src/pipeline/robust-analysis.js';
import { understeerGradient_radPerMps2 } from '../../src/vehicle/single-track.js';
import { CONTROLLER, vanContext } from './van-loop.js';

// The parcel van with its axle loads and tyres swapped front to rear: oversteering (invented test vehicle).
const SWAPPED = {
  mass_kg: 3400,
  yawInertia_kgm2: 11000,
  cgToFrontAxle_m: 1.85,
  cgToRearAxle_m: 1.75,
  frontCorneringStiffness_NPerRad: 180000,
  rearCorneringStiffness_NPerRad: 120000,
  actuatorLag_s: 0.08,
  actuatorDelay_s: 0.05,
};
const model = checkModelFromSummary(
  { kind: 'single-track', understeerGradient_radPerMps2: understeerGradient_radPerMps2(SWAPPED), ...SWAPPED },
  'oversteering test vehicle',
);
const L = SWAPPED.cgToFrontAxle_m + SWAPPED.cgToRearAxle_m;
// Source: Gillespie 1992 §6 — K = (m/L)(b/Cf − a/Cr) in rad per m/s²; r/δ at steady state = vx/(L + K·vx²).
const gradient = (mass_kg: number): number =>
  (mass_kg / L) * (SWAPPED.cgToRearAxle_m / SWAPPED.frontCorneringStiffness_NPerRad - SWAPPED.cgToFrontAxle_m / SWAPPED.rearCorneringStiffness_NPerRad);
const steadyYawGain = (mass_kg: number, vx: number): number => vx / (L + gradient(mass_kg) * vx * vx);
const SPEED = 35; // above the critical speed √(−L/K) ≈ 25.9 m/s
const GAINS = { kp: 0.3, ki: 0, kd: 0 };
const lowerGainMargin = (mass_kg: number): number => -20 * Math.log10(GAINS.kp * Math.abs(steadyYawGain(mass_kg, SPEED)));

describe('the lower gain margin of an oversteering yaw-rate loop over a mass range', () => {
  it('is open-loop unstable at 35 m/s: the critical speed of the test vehicle is below it', () => {
    expect(gradient(SWAPPED.mass_kg)).toBeLessThan(0);
    expect(Math.sqrt(-L / gradient(SWAPPED.mass_kg))).toBeLessThan(SPEED);
  });

  it('is worst at the heaviest mass, equal to −20·log10(k·|vx/(L + K·vx²)|) there and at nominal', () => {
    const context = vanContext({ mass_pct: [-20, 100] }, {}, model);
    const found = worstCaseMarginsAt(SPEED, GAINS, { ...context, controller: CONTROLLER });
    expect(found.instability).toBeNull();
    expect(found.nominal.lowerGainMargin_dB!).toBeCloseTo(lowerGainMargin(SWAPPED.mass_kg), 6);
    expect(found.worst.lowerGainMargin_dB!.combination.mass_kg).toBe(2);
    expect(found.worst.lowerGainMargin_dB!.value).toBeCloseTo(lowerGainMargin(2 * SWAPPED.mass_kg), 6);
  });

  it('holds the loop stable up to the mass where k·|G(0)| = 1, and names the heavier mass that destabilises it', () => {
    // Source: the same formulas — k·vx/|L + K(m)·vx²| = 1 gives the limiting mass m* = −(k·vx + L)·L / (vx²·(b/Cf − a/Cr)).
    const perMass = gradient(1);
    const limit_kg = -(GAINS.kp * SPEED + L) / (SPEED * SPEED * perMass);
    expect(limit_kg / SWAPPED.mass_kg).toBeGreaterThan(2);
    expect(limit_kg / SWAPPED.mass_kg).toBeLessThan(2.3);
    const beyond = worstCaseMarginsAt(SPEED, GAINS, { ...vanContext({ mass_pct: [-20, 130] }, {}, model), controller: CONTROLLER });
    expect(beyond.instability).not.toBeNull();
    expect(beyond.instability!.combination.mass_kg! * SWAPPED.mass_kg).toBeGreaterThan(limit_kg);
  });
});
