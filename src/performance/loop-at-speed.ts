/**
 * Everything the time-domain figures need at one speed, from the model the schedule is checked on:
 * the sampled loop plant the firmware's controller drives (the same plant and delays as the dense
 * check, src/pipeline/loop-analysis.ts), the loop output's responses to a road-wheel angle offset and to a
 * lateral force at the centre of gravity (continuous, no controller), the actuator's lag and delay for
 * the steering rate, and the feed-forward (src/loops/feed-forward.ts).
 */
import { samplingDelay_s } from '../controller/discrete.js';
import type { ControllerSettings } from '../controller/types.js';
import { loopPlantFromLumped, loopPlantFromSingleTrack, previewFromCg_m } from '../loops/build.js';
import { feedForwardFromLumped, feedForwardFromSingleTrack, type FeedForward } from '../loops/feed-forward.js';
import { lumpedYawRateTransferFunction } from '../loops/lumped-yaw-rate.js';
import { findLoop } from '../loops/registry.js';
import type { LoopKind, LoopSpecification } from '../loops/types.js';
import type { TransferFunction } from '../lti/types.js';
import type { OperatingPointModel } from '../tuning/operating-point.js';
import { sampledPlant, type SampledPlant } from '../verify/sampled-plant.js';
import { singleTrackStateSpace, singleTrackTransferFunctions } from '../vehicle/single-track.js';

export interface PerformanceLoop {
  readonly kind: LoopKind;
  readonly speed_mps: number;
  /** d, the preview distance from the centre of gravity, m (0 for yaw-rate and heading loops). */
  readonly previewFromCg_m: number;
  /** Command → loop output as sampled by the firmware (vehicle, actuator, latency; src/verify/sampled-plant.ts). */
  readonly plant: SampledPlant;
  /** Road-wheel angle offset (rad) → loop output, continuous, no actuator or controller delay. */
  readonly misalignment: TransferFunction;
  /** Lateral force at the centre of gravity (N) → loop output; null on a lumped model. */
  readonly lateralForce: TransferFunction | null;
  /** Vehicle mass, kg (null on a lumped model). */
  readonly mass_kg: number | null;
  /** Actuator command → road-wheel angle e^(−θs)/(τs + 1) with the computation latency in θ; null on a lumped model (no separate actuator). */
  readonly actuator: { readonly lag_s: number; readonly delay_s: number } | null;
  readonly feedForward: FeedForward;
  readonly controller: ControllerSettings;
}

/** The pieces at `speed_mps` (m/s > 0) of the loop `specification` on `model` under `controller`. */
export function performanceLoopAt(
  model: OperatingPointModel,
  specification: LoopSpecification,
  speed_mps: number,
  controller: ControllerSettings,
): PerformanceLoop {
  const loop = findLoop(specification.kind);
  const controllerDelay = samplingDelay_s(controller);
  if (model.kind === 'single-track') {
    const parameters = model.parameters;
    const plant = loopPlantFromSingleTrack(specification, parameters, speed_mps, controller);
    const d = plant.previewFromCg_m ?? 0;
    const context = { speed_mps, previewFromCg_m: d };
    const { A } = singleTrackStateSpace(parameters, speed_mps);
    const [a21, a22] = A[1];
    const m = parameters.mass_kg;
    const responses = singleTrackTransferFunctions(parameters, speed_mps);
    // A lateral force F at the centre of gravity enters m·v̇y: input vector [1/m, 0], so vy = (s − a22)/m·F/det, r = a21/m·F/det.
    const denominator = responses.yawRate.denominator;
    const force = loop.fromSingleTrack(
      {
        yawRate: { numerator: [a21 / m], denominator, delay_s: 0 },
        lateralVelocity: { numerator: [1 / m, -a22 / m], denominator, delay_s: 0 },
      },
      context,
    );
    return {
      kind: specification.kind,
      speed_mps,
      previewFromCg_m: d,
      plant: sampledPlant({ ...plant.plant, delay_s: plant.plant.delay_s - controller.sampleTime_s / 2 }, controller.sampleTime_s),
      misalignment: loop.fromSingleTrack(responses, context),
      lateralForce: force,
      mass_kg: m,
      actuator: { lag_s: parameters.actuatorLag_s, delay_s: parameters.actuatorDelay_s + controller.computationLatency_s },
      feedForward: feedForwardFromSingleTrack({ kind: specification.kind, parameters, speed_mps, controllerDelay_s: controllerDelay, previewFromCg_m: d }),
      controller,
    };
  }
  const plant = loopPlantFromLumped({ specification, model: model.yawRate, speed_mps, controller, cgToFrontAxle_m: model.cgToFrontAxle_m });
  const d = previewFromCg_m(specification, model.cgToFrontAxle_m, speed_mps);
  return {
    kind: specification.kind,
    speed_mps,
    previewFromCg_m: d,
    plant: sampledPlant({ ...plant.plant, delay_s: plant.plant.delay_s - controller.sampleTime_s / 2 }, controller.sampleTime_s),
    // The lumped model lumps actuator and vehicle: an offset at the wheels is taken through all of it.
    misalignment: loop.fromYawRate(lumpedYawRateTransferFunction(model.yawRate), { speed_mps, previewFromCg_m: d }),
    lateralForce: null,
    mass_kg: null,
    actuator: null,
    feedForward: feedForwardFromLumped({ kind: specification.kind, model: model.yawRate, speed_mps, controllerDelay_s: controllerDelay, previewFromCg_m: d }),
    controller,
  };
}
