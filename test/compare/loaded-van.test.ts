import { mkdtempSync, readdirSync, readFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { compareSchedules } from '../../src/compare/compare-schedules.js';
import { identifyFromLogs } from '../../src/identify/identify-from-logs.js';
import { DEMO_FLEET, regenerateDemoVehicle } from '../../src/vehicle/demo-fleet.js';
import { loadVehicle } from '../../src/vehicle/load.js';
import type { Vehicle } from '../../src/vehicle/types.js';
import { fixtureSchedule } from './fixture-schedules.js';

const VEHICLES = 'vehicles';
const van = loadVehicle(join(VEHICLES, 'parcel-van'));
const loaded = loadVehicle(join(VEHICLES, 'parcel-van-loaded'));

/** Single-track figures computed here from the textbook formulas (Gillespie 1992 §6, eq. 6-15; Rajamani 2012 §3). */
interface Figures {
  readonly understeerGradient_radPerMps2: number;
  readonly characteristicSpeed_mps: number;
  readonly yawGainAt25_perS: number;
}
function figures(p: {
  mass_kg: number;
  cgToFrontAxle_m: number;
  cgToRearAxle_m: number;
  frontCorneringStiffness_NPerRad: number;
  rearCorneringStiffness_NPerRad: number;
}): Figures {
  const a = p.cgToFrontAxle_m;
  const b = p.cgToRearAxle_m;
  const L = a + b;
  // Source: Gillespie 1992 §6 — K = (m/L)(b/Cf − a/Cr); r/δ = vx/(L + K·vx²); characteristic speed √(L/K).
  const K = (p.mass_kg / L) * (b / p.frontCorneringStiffness_NPerRad - a / p.rearCorneringStiffness_NPerRad);
  return { understeerGradient_radPerMps2: K, characteristicSpeed_mps: Math.sqrt(L / K), yawGainAt25_perS: 25 / (L + K * 25 * 25) };
}
const fromFile = (vehicle: Vehicle) =>
  figures({
    mass_kg: vehicle.mass_kg,
    cgToFrontAxle_m: vehicle.cgToFrontAxle_m,
    cgToRearAxle_m: vehicle.cgToRearAxle_m,
    frontCorneringStiffness_NPerRad: vehicle.frontCorneringStiffness_NPerRad!,
    rearCorneringStiffness_NPerRad: vehicle.rearCorneringStiffness_NPerRad!,
  });

describe('the changed demo vehicle vehicles/parcel-van-loaded', () => {
  it('is in the demo fleet with the parcel van speeds and its own seed, and its committed logs regenerate byte-identically', () => {
    const demo = DEMO_FLEET.find((entry) => entry.folder === 'parcel-van-loaded')!;
    const parent = DEMO_FLEET.find((entry) => entry.folder === 'parcel-van')!;
    expect(demo.speeds_mps).toEqual(parent.speeds_mps);
    expect(demo.seed).not.toBe(parent.seed);
    const out = mkdtempSync(join(tmpdir(), 'speedband-loaded-'));
    regenerateDemoVehicle(demo, { vehiclesRoot: VEHICLES, outRoot: out, force: false });
    const committed = join(VEHICLES, demo.folder, 'logs');
    const names = readdirSync(committed).sort();
    expect(readdirSync(join(out, demo.folder, 'logs')).sort()).toEqual(names);
    for (const name of names) expect(readFileSync(join(out, demo.folder, 'logs', name)).equals(readFileSync(join(committed, name))), name).toBe(true);
  });

  it('differs from the parcel van only in mass, yaw inertia, CG position and rear cornering stiffness; the README says so and that it is invented', () => {
    const changed = (Object.keys(van) as (keyof Vehicle)[]).filter((key) => van[key] !== loaded[key]).sort();
    expect(changed).toEqual(['cgToFrontAxle_m', 'cgToRearAxle_m', 'description', 'mass_kg', 'name', 'rearCorneringStiffness_NPerRad', 'yawInertia_kgm2']);
    expect(loaded.cgToFrontAxle_m + loaded.cgToRearAxle_m).toBeCloseTo(van.cgToFrontAxle_m + van.cgToRearAxle_m, 12); // same wheelbase
    const readme = readFileSync(join(VEHICLES, 'parcel-van-loaded', 'README.md'), 'utf8');
    expect(readme).toMatch(/Synthetic, for demos and tests only/);
    expect(readme).toMatch(/\+900 kg/);
    expect(readme).toMatch(/different rear tyres/);
  });

  it('the load is placed consistently: CG by the moment balance, yaw inertia by the parallel-axis theorem (within 0.5 %)', () => {
    const payload_kg = loaded.mass_kg - van.mass_kg;
    const payloadFromFront_m = 2.6; // as the README states
    // Source: centre of mass of two bodies; parallel-axis (Steiner) theorem, common practice.
    const cg_m = (van.mass_kg * van.cgToFrontAxle_m + payload_kg * payloadFromFront_m) / loaded.mass_kg;
    expect(loaded.cgToFrontAxle_m).toBeCloseTo(cg_m, 2);
    const inertia =
      van.yawInertia_kgm2 +
      van.mass_kg * (loaded.cgToFrontAxle_m - van.cgToFrontAxle_m) ** 2 +
      (payload_kg * 2.4 ** 2) / 12 +
      payload_kg * (payloadFromFront_m - loaded.cgToFrontAxle_m) ** 2;
    expect(Math.abs(loaded.yawInertia_kgm2 / inertia - 1)).toBeLessThan(0.005);
    expect(loaded.cgToFrontAxle_m).toBeGreaterThan(van.cgToFrontAxle_m); // moved rearward
  });

  it('single-track formulas from the two files: less understeer, a higher characteristic speed, more yaw gain at 25 m/s', () => {
    const before = fromFile(van);
    const after = fromFile(loaded);
    expect(after.understeerGradient_radPerMps2).toBeGreaterThan(0); // still understeering
    expect(after.understeerGradient_radPerMps2).toBeLessThan(before.understeerGradient_radPerMps2);
    expect(after.characteristicSpeed_mps).toBeGreaterThan(before.characteristicSpeed_mps);
    expect(after.yawGainAt25_perS).toBeGreaterThan(before.yawGainAt25_perS);
  });

  it('identification from the logs of both vehicles (3 speeds each) moves the single-track parameters the same way as the files', () => {
    const identify = (folder: string) =>
      identifyFromLogs({
        vehicle: join(VEHICLES, folder),
        logPaths: ['06.00', '15.00', '25.00'].map((speed) => join(VEHICLES, folder, 'logs', `synthetic-steps-${speed}mps.csv`)),
      }).singleTrack!;
    const fitBefore = identify('parcel-van');
    const fitAfter = identify('parcel-van-loaded');
    const asParameters = (vehicle: Vehicle, fit: typeof fitBefore) => ({
      ...vehicle,
      frontCorneringStiffness_NPerRad: fit.frontCorneringStiffness_NPerRad,
      rearCorneringStiffness_NPerRad: fit.rearCorneringStiffness_NPerRad,
    });
    const before = figures(asParameters(van, fitBefore));
    const after = figures(asParameters(loaded, fitAfter));
    const fileBefore = fromFile(van);
    const fileAfter = fromFile(loaded);
    const direction = (x: number, y: number) => Math.sign(y - x);
    expect(direction(before.understeerGradient_radPerMps2, after.understeerGradient_radPerMps2)).toBe(
      direction(fileBefore.understeerGradient_radPerMps2, fileAfter.understeerGradient_radPerMps2),
    );
    expect(direction(before.characteristicSpeed_mps, after.characteristicSpeed_mps)).toBe(
      direction(fileBefore.characteristicSpeed_mps, fileAfter.characteristicSpeed_mps),
    );
    expect(direction(before.yawGainAt25_perS, after.yawGainAt25_perS)).toBe(direction(fileBefore.yawGainAt25_perS, fileAfter.yawGainAt25_perS));
    // The fit's own understeer gradient agrees with the formula on its stiffnesses.
    expect(fitAfter.understeerGradient_radPerMps2).toBeCloseTo(after.understeerGradient_radPerMps2, 8);
    // Rear stiffness fell (95 % intervals apart); front stiffness, actuator lag and delay did not change in the files and their intervals overlap.
    expect(fitAfter.ci95.rearCorneringStiffness_NPerRad[1]).toBeLessThan(fitBefore.ci95.rearCorneringStiffness_NPerRad[0]);
    for (const name of ['frontCorneringStiffness_NPerRad', 'actuatorLag_s', 'actuatorDelay_s'] as const) {
      expect(fitAfter.ci95[name][0], name).toBeLessThan(fitBefore.ci95[name][1]);
      expect(fitBefore.ci95[name][0], name).toBeLessThan(fitAfter.ci95[name][1]);
    }

    // The model drift compareSchedules reports from schedules carrying these fits (provenance.model as the build writes it).
    const summary = (fit: typeof fitBefore) => ({
      kind: 'single-track',
      frontCorneringStiffness_NPerRad: fit.frontCorneringStiffness_NPerRad,
      rearCorneringStiffness_NPerRad: fit.rearCorneringStiffness_NPerRad,
      actuatorLag_s: fit.actuatorLag_s,
      actuatorDelay_s: fit.actuatorDelay_s,
      understeerGradient_radPerMps2: fit.understeerGradient_radPerMps2,
    });
    const drift = compareSchedules(fixtureSchedule({ modelSummary: summary(fitBefore) }), fixtureSchedule({ modelSummary: summary(fitAfter) })).modelDrift;
    expect(drift.available).toBe(true);
    if (!drift.available) return;
    const change = (name: string) => drift.parameters.find((parameter) => parameter.name === name)!;
    // Source: the two vehicle files — rear stiffness 180 → 160 kN/rad is −11.1 %; the fit's drift lies within half a point of it.
    expect(change('rearCorneringStiffness_NPerRad').change_pct!).toBeCloseTo(-100 / 9, 0);
    expect(Math.sign(change('understeerGradient_radPerMps2').change)).toBe(-1);
  });
});
