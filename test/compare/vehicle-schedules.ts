/**
 * Schedules built from a vehicle's single-track model with the library's own tuning and loop
 * analysis, for comparing the demo parcel van before and after its change (synthetic vehicles).
 * A test fixture standing in for the build: heading loop, SIMC at τc = θ (Skogestad 2003), dense check, no
 * refinement; provenance.model as the build writes it for a joint single-track fit.
 */
import type { ControllerSettings } from '../../src/controller/types.js';
import { sha256Hex } from '../../src/core/files.js';
import { loopPlantFromSingleTrack } from '../../src/loops/build.js';
import { resolvePlan } from '../../src/schedule/plan.js';
import { assembleSchedule } from '../../src/schedule/schedule-file.js';
import { scheduleGains } from '../../src/schedule/schedule-gains.js';
import type { ScheduleFile } from '../../src/schedule/schedule-types.js';
import { loopMargins, tuneOperatingPoint } from '../../src/tuning/operating-point.js';
import { understeerGradient_radPerMps2 } from '../../src/vehicle/single-track.js';
import type { SingleTrackParameters } from '../../src/vehicle/types.js';
import { fixtureExtras } from '../schedule/sample-schedule.js';

export const VEHICLE_SCHEDULE_SPEEDS = [4, 8, 12.5, 18, 25] as const;

export function vehicleSchedule(name: string, parameters: SingleTrackParameters): ScheduleFile {
  const plan = resolvePlan({
    loop: { kind: 'heading' },
    rule: { name: 'simc', parameters: {} },
    speeds: { minimum_mps: 4, maximum_mps: 25, lowSpeedFloor_mps: 4 },
    breakpoints: { speeds_mps: [...VEHICLE_SCHEDULE_SPEEDS] },
    check: { gridSpeeds: 12, maxInsertedBreakpoints: 0 },
  });
  const controller: ControllerSettings = {
    derivativeFilter: plan.controller.derivativeFilter,
    sampleTime_s: plan.controller.sampleTime_s,
    discretisation: plan.controller.discretisation,
    computationLatency_s: plan.controller.computationLatency_s,
  };
  const loop = { kind: 'heading' as const };
  const result = scheduleGains({
    plan,
    tuneAt: (speed_mps) =>
      tuneOperatingPoint({ loop, speed_mps, model: { kind: 'single-track', parameters }, rule: 'simc', ruleParameters: {}, controller }).gains,
    analyse: (speed_mps, gains) => loopMargins(loopPlantFromSingleTrack(loop, parameters, speed_mps, controller), gains, controller.derivativeFilter),
  });
  return assembleSchedule({
    vehicle: { name, file: 'vehicle.json', sha256: sha256Hex(name) },
    plan,
    table: result.table,
    insertedByRefinement: result.insertedByRefinement,
    check: result.check,
    insertions: result.insertions,
    integratorClamp_rad: 0.6,
    maxSteerRate_radps: 0.5,
    breakpointExtras: fixtureExtras(result.table.speeds_mps),
    inputs: [],
    modelSummary: {
      kind: 'single-track',
      frontCorneringStiffness_NPerRad: parameters.frontCorneringStiffness_NPerRad,
      rearCorneringStiffness_NPerRad: parameters.rearCorneringStiffness_NPerRad,
      actuatorLag_s: parameters.actuatorLag_s,
      actuatorDelay_s: parameters.actuatorDelay_s,
      understeerGradient_radPerMps2: understeerGradient_radPerMps2(parameters),
      mass_kg: parameters.mass_kg,
      yawInertia_kgm2: parameters.yawInertia_kgm2,
      cgToFrontAxle_m: parameters.cgToFrontAxle_m,
      cgToRearAxle_m: parameters.cgToRearAxle_m,
    },
    modelDescription: 'single-track model from the vehicle file (synthetic demo vehicle)',
    ruleCitation: 'Skogestad 2003, SIMC',
  });
}
