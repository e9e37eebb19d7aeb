/**
 * The parcel van's nominal single-track model (its vehicle file: invented demo data) and SIMC gains of its
 * yaw-rate loop at a speed: real loops for the robust-check tests, built without identification.
 */
import { join } from 'node:path';
import { checkModelFromSummary, type CheckModel } from '../../src/pipeline/check-model.js';
import type { RobustContext } from '../../src/pipeline/robust-analysis.js';
import type { PidGains } from '../../src/controller/types.js';
import { resolveVariationSet } from '../../src/robust/variation-set.js';
import type { RobustSearchSettings } from '../../src/robust/types.js';
import { resolveVariations, type WrittenVariations } from '../../src/schedule/plan-variations.js';
import { tuneOperatingPoint } from '../../src/tuning/operating-point.js';
import { loadVehicle } from '../../src/vehicle/load.js';
import { singleTrackParametersFromVehicle, understeerGradient_radPerMps2 } from '../../src/vehicle/single-track.js';

export const VAN = singleTrackParametersFromVehicle(loadVehicle(join('vehicles', 'parcel-van')));
export const VAN_MODEL: CheckModel = checkModelFromSummary(
  { kind: 'single-track', understeerGradient_radPerMps2: understeerGradient_radPerMps2(VAN), ...VAN },
  'parcel van, nominal (vehicle file)',
);
export const YAW_LOOP = { kind: 'yaw-rate' as const };
export const CONTROLLER = { derivativeFilter: 10, sampleTime_s: 0.01, discretisation: 'backward-euler' as const, computationLatency_s: 0.01 };

/** SIMC (τc = θ) gains of the van's yaw-rate loop at a speed, on its nominal model. */
export function vanGains(speed_mps: number): PidGains {
  return tuneOperatingPoint({ loop: YAW_LOOP, speed_mps, model: VAN_MODEL.modelAt(speed_mps), rule: 'simc', ruleParameters: {}, controller: CONTROLLER }).gains;
}

/** A robust context on the van's nominal model: the plan's variations as written (only those given, unless `defaults`), no identification. */
export function vanContext(written: WrittenVariations, search: Partial<RobustSearchSettings> = {}, model: CheckModel = VAN_MODEL): RobustContext {
  const zero = { mass_pct: 0, yawInertia_pct: 0, frontCorneringStiffness_pct: 0, rearCorneringStiffness_pct: 0, actuatorLag_pct: 0, addedLatency_s: 0 };
  const variations = resolveVariations(
    { ...zero, fromIdentification: false, ...written, search: { samples: 16, localSearchEvaluations: 16, ...search } },
    CONTROLLER.sampleTime_s,
  );
  return { model, loop: YAW_LOOP, controller: CONTROLLER, set: resolveVariationSet(variations, model.summary, null), search: variations.search };
}
