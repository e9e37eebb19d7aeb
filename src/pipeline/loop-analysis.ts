/**
 * The loop analysis of the dense check at one speed: the loop plant of the chosen model at that
 * speed (src/loops), under the DISCRETE PID the firmware runs at its sample time: src/verify analyseLoop
 * analyses the exact sampled loop (zero-order-hold equivalent of the plant with its delay and the
 * computation latency). Tuning uses the continuous counterpart with a Ts/2 delay; the check decides
 * on what the firmware runs.
 */
import { samplingDelay_s } from '../controller/discrete.js';
import type { ControllerSettings, PidGains } from '../controller/types.js';
import { loopPlantFromLumped, loopPlantFromSingleTrack } from '../loops/build.js';
import type { LoopPlant, LoopSpecification } from '../loops/types.js';
import type { AnalyseLoop } from '../schedule/types.js';
import type { OperatingPointModel } from '../tuning/operating-point.js';
import { analyseLoop, type LoopDescription } from '../verify/analyse-loop.js';
import type { AnalysisOptions } from '../verify/analyse-open-loop.js';
import type { AnalysisScope, LoopMargins } from '../verify/types.js';
import type { CheckModel } from './check-model.js';
import { modelDelay_s, requireBoundedDelay } from './delay-bound.js';

/** Build the (speed_mps, gains) → LoopMargins function the dense check and refinement call. */
export function makeLoopAnalysis(model: CheckModel, loop: LoopSpecification, controller: ControllerSettings): AnalyseLoop {
  return (speed_mps: number, gains: PidGains): LoopMargins =>
    analyseOperatingPoint({ operatingPoint: model.modelAt(speed_mps), loop, controller, speed_mps, gains });
}

/** The loop plant of the check at one speed (the delay bound checked first). */
export function checkLoopPlant(model: CheckModel, loop: LoopSpecification, controller: ControllerSettings, speed_mps: number): LoopPlant {
  return operatingPointLoopPlant(model.modelAt(speed_mps), loop, controller, speed_mps);
}

function operatingPointLoopPlant(operatingPoint: OperatingPointModel, loop: LoopSpecification, controller: ControllerSettings, speed_mps: number): LoopPlant {
  requireBoundedDelay(modelDelay_s(operatingPoint), controller, speed_mps);
  return operatingPoint.kind === 'single-track'
    ? loopPlantFromSingleTrack(loop, operatingPoint.parameters, speed_mps, controller)
    : loopPlantFromLumped({ specification: loop, model: operatingPoint.yawRate, speed_mps, controller, cgToFrontAxle_m: operatingPoint.cgToFrontAxle_m });
}

/** One operating point's loop under given gains (analyseOperatingPoint). */
export interface OperatingPointAnalysis {
  /** The model at this speed (e.g. the check model's, or one with a variation applied). */
  readonly operatingPoint: OperatingPointModel;
  /** The loop the firmware closes. */
  readonly loop: LoopSpecification;
  /** The controller the firmware runs (sample time, derivative filter, discretisation, latency). */
  readonly controller: ControllerSettings;
  /** The speed, m/s. */
  readonly speed_mps: number;
  /** The PID gains analysed. */
  readonly gains: PidGains;
  /** How much of the analysis to do (AnalysisOptions); default 'full'. */
  readonly scope?: AnalysisScope;
}

/** The dense check's analysis of one operating-point model (e.g. the check model with a variation applied) at one speed. */
export function analyseOperatingPoint(input: OperatingPointAnalysis): LoopMargins {
  const { operatingPoint, loop, controller, speed_mps, gains, scope } = input;
  return analyseSampledLoop(operatingPointLoopPlant(operatingPoint, loop, controller, speed_mps), gains, controller, { scope });
}

/**
 * Margins of a loop plant (built with `controller`, src/loops) under the discrete PID the firmware runs:
 * the same analysis as the dense check (`tune` reports it beside the design loop's margins).
 */
export function analyseSampledLoop(plant: LoopPlant, gains: PidGains, controller: ControllerSettings, options: AnalysisOptions = {}): LoopMargins {
  return analyseLoop(sampledLoopDescription(plant, gains, controller), options);
}

/** The loop `analyseSampledLoop` analyses, as a LoopDescription (for its frequency response: `openLoopOf`, `loopFrequencyResponse`). */
export function sampledLoopDescription(plant: LoopPlant, gains: PidGains, controller: ControllerSettings): LoopDescription {
  // The loop plant carries the Ts/2 + latency of the tuning model as delay; analyseLoop models the sampled loop itself.
  const vehicleDelay_s = Math.max(0, plant.plant.delay_s - samplingDelay_s(controller));
  return {
    plant: { ...plant.plant, delay_s: vehicleDelay_s },
    pid: { kp: gains.kp, ki: gains.ki, kd: gains.kd, derivativeFilter: controller.derivativeFilter, form: 'parallel' },
    sampleTime_s: controller.sampleTime_s,
    discretisation: controller.discretisation,
    latency_s: controller.computationLatency_s,
  };
}
