/** Shared pieces of the scenario-simulator tests: an invented van (synthetic demo numbers) and a constant controller. */
import type { FirmwareGains, FirmwareSettings } from '../../src/controller/firmware-step.js';
import type { LoopSpecification } from '../../src/loops/types.js';
import type { ScenarioController, ScenarioSetup, ScenarioVehicle } from '../../src/performance/scenario-simulation.js';
import { STRAIGHT_PATH } from '../../src/performance/scenarios.js';
import { constantSpeed } from '../../src/performance/speed-profile.js';
import type { SingleTrackParameters } from '../../src/vehicle/types.js';
import { PARCEL_VAN } from '../helpers/parcel-van.js';

export // The van with an actuator delay that is not a whole number of samples.
const VAN: SingleTrackParameters = { ...PARCEL_VAN, actuatorDelay_s: 0.043 };

/** The van's single-track numbers under the short names the python cross-checks use. */
export const VAN_FOR_PYTHON = {
  m: VAN.mass_kg,
  Iz: VAN.yawInertia_kgm2,
  a: VAN.cgToFrontAxle_m,
  b: VAN.cgToRearAxle_m,
  Cf: VAN.frontCorneringStiffness_NPerRad,
  Cr: VAN.rearCorneringStiffness_NPerRad,
  tau: VAN.actuatorLag_s,
} as const;

export function vanVehicle(limits: { maxSteerAngle_rad?: number; maxSteerRate_radps?: number } = {}): ScenarioVehicle {
  return { parameters: VAN, maxSteerAngle_rad: limits.maxSteerAngle_rad ?? Infinity, maxSteerRate_radps: limits.maxSteerRate_radps ?? Infinity };
}

export const LINEAR_SETTINGS: FirmwareSettings = {
  derivativeFilter: 10,
  sampleTime_s: 0.01,
  discretisation: 'backward-euler',
  computationLatency_s: 0.01,
  antiWindup: 'conditional-integration',
  commandLimit_rad: Infinity,
  integratorClamp_rad: Infinity,
};

/** Gains held at every speed. */
export function constantController(
  loop: LoopSpecification,
  gains: Partial<FirmwareGains>,
  settings: FirmwareSettings = LINEAR_SETTINGS,
  feedForwardLeadTime_s = 0,
): ScenarioController {
  const full: FirmwareGains = { kp: 0, ki: 0, kd: 0, setpointWeightProportional: 1, setpointWeightDerivative: 0, feedForward: 0, ...gains };
  return { loop, settings, at: () => ({ gains: full, feedForwardLeadTime_s }) };
}

/** Straight driving at one speed with nothing happening (spread and override). */
export function quietSetup(speed_mps: number, duration_s: number): ScenarioSetup {
  return {
    duration_s,
    speed: constantSpeed(speed_mps),
    path: STRAIGHT_PATH,
    pathStart_m: 0,
    referenceStep: null,
    lateralForce: null,
    misalignment: null,
    initialLateralOffset_m: 0,
    initialHeadingError_rad: 0,
    restAfter_s: duration_s,
  };
}
