import { samplingDelay_s } from '../controller/discrete.js';
import type { ControllerSettings } from '../controller/types.js';
import { SpeedbandError } from '../core/errors.js';
import type { LumpedModel } from '../identify/types.js';
import { seriesConnection } from '../lti/transfer-function.js';
import type { TransferFunction } from '../lti/types.js';
import { actuatorTransferFunction, singleTrackTransferFunctions } from '../vehicle/single-track.js';
import type { SingleTrackParameters } from '../vehicle/types.js';
import { lumpedYawRateTransferFunction } from './lumped-yaw-rate.js';
import { findLoop } from './registry.js';
import type { LoopContext, LoopPlant, LoopSpecification } from './types.js';

/**
 * Preview distance from the CG at a speed, m: preview_m + previewTime_s·speed_mps from the CG ('cg', the
 * default) or from the front axle ('front-axle': plus a, the CG to front axle). 0 for yaw-rate and heading
 * loops. Throws `loops.invalidPreview` for a negative or non-finite preview distance or time, or a
 * front-axle reference without the axle distance.
 */
export function previewFromCg_m(specification: LoopSpecification, cgToFrontAxle_m: number | undefined, speed_mps: number): number {
  if (specification.kind !== 'path') return 0;
  const distance = specification.preview_m ?? 0;
  const time = specification.previewTime_s ?? 0;
  if (!(Number.isFinite(distance) && distance >= 0)) {
    throw new SpeedbandError('loops.invalidPreview', `preview distance is ${distance} m; expected a finite distance ≥ 0 m ahead of the reference point`, {
      details: { preview_m: distance },
    });
  }
  if (!(Number.isFinite(time) && time >= 0)) {
    throw new SpeedbandError('loops.invalidPreview', `preview time is ${time} s; expected a finite time ≥ 0 s (the preview grows by speed × this time)`, {
      details: { previewTime_s: time },
    });
  }
  const preview = distance + time * speed_mps;
  if ((specification.referencePoint ?? 'cg') === 'cg') return preview;
  if (cgToFrontAxle_m === undefined || !(cgToFrontAxle_m > 0)) {
    throw new SpeedbandError(
      'loops.invalidPreview',
      'a front-axle reference point needs the CG-to-front-axle distance a (m) — give the vehicle, or measure the preview from the CG',
      { details: { referencePoint: 'front-axle' } },
    );
  }
  return preview + cgToFrontAxle_m;
}

function requireSpeed(speed_mps: number): void {
  if (!(Number.isFinite(speed_mps) && speed_mps > 0)) {
    throw new SpeedbandError('loops.invalidSpeed', `speed is ${speed_mps} m/s; a loop plant needs a forward speed above 0 m/s`, { details: { speed_mps } });
  }
}

function record(specification: LoopSpecification, context: LoopContext, plant: TransferFunction): LoopPlant {
  if (specification.kind !== 'path') return { kind: specification.kind, speed_mps: context.speed_mps, plant };
  return {
    kind: 'path',
    preview_m: specification.preview_m ?? 0,
    ...(specification.previewTime_s === undefined || specification.previewTime_s === 0 ? {} : { previewTime_s: specification.previewTime_s }),
    referencePoint: specification.referencePoint ?? 'cg',
    previewFromCg_m: context.previewFromCg_m,
    speed_mps: context.speed_mps,
    plant,
  };
}

/**
 * The loop plant from a lumped per-speed yaw-rate model (already including the actuator, as
 * identified from steer-command logs): loop factor × G_r, delay θ + Ts/2 + computation latency
 * (`samplingDelay_s`). A front-axle preview needs `cgToFrontAxle_m`.
 */
export function loopPlantFromLumped(
  specification: LoopSpecification,
  model: LumpedModel,
  speed_mps: number,
  controller: ControllerSettings,
  cgToFrontAxle_m?: number,
): LoopPlant {
  requireSpeed(speed_mps);
  const loop = findLoop(specification.kind);
  const context: LoopContext = { speed_mps, previewFromCg_m: previewFromCg_m(specification, cgToFrontAxle_m, speed_mps) };
  const yawRate = lumpedYawRateTransferFunction(model);
  const plant = loop.fromYawRate({ ...yawRate, delay_s: yawRate.delay_s + samplingDelay_s(controller) }, context);
  return record(specification, context, plant);
}

/**
 * The loop plant from the single-track model at any speed: actuator e^(−θa s)/(τa s + 1) in series
 * with the loop's response built from δ → r and δ → vy, plus the controller delay Ts/2 + latency.
 */
export function loopPlantFromSingleTrack(
  specification: LoopSpecification,
  parameters: SingleTrackParameters,
  speed_mps: number,
  controller: ControllerSettings,
): LoopPlant {
  requireSpeed(speed_mps);
  const loop = findLoop(specification.kind);
  const context: LoopContext = { speed_mps, previewFromCg_m: previewFromCg_m(specification, parameters.cgToFrontAxle_m, speed_mps) };
  const vehicle = loop.fromSingleTrack(singleTrackTransferFunctions(parameters, speed_mps), context);
  const actuator = actuatorTransferFunction(parameters);
  const plant = seriesConnection(actuator, { ...vehicle, delay_s: vehicle.delay_s + samplingDelay_s(controller) });
  return record(specification, context, plant);
}
