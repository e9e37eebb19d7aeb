import type { LumpedModel } from '../identify/types.js';
import { lumpedYawRateTransferFunction } from '../loops/lumped-yaw-rate.js';
import { findLoop } from '../loops/registry.js';
import type { LoopKind } from '../loops/types.js';
import { dcGain, seriesConnection } from '../lti/transfer-function.js';
import { actuatorTransferFunction, singleTrackTransferFunctions } from '../vehicle/single-track.js';
import type { SingleTrackParameters } from '../vehicle/types.js';
import { fopdtByTwoPoints } from './two-point.js';
import type { DesignModel } from './types.js';

/** How the design model was obtained, for the derivation a reviewer reads. */
export interface DesignModelDerivation {
  /** The steer command → yaw rate FOPDT the design starts from: K (1/s), τ (s, the longest lag), θ (s, before the controller delay). */
  readonly yawRateGain_perS: number;
  readonly yawRateTimeConstant_s: number;
  readonly yawRateDeadTime_s: number;
  /** 'identified' (a lumped FOPDT used as is) or 'two-point' (a richer response reduced by fopdtByTwoPoints, Smith 1972). */
  readonly yawRateSource: 'identified' | 'two-point';
  /** Ts/2 + computation latency added to the dead time, s. */
  readonly controllerDelay_s: number;
  readonly model: DesignModel;
}

/** The loop and speed a design model is for, and the controller delay it adds. */
export interface DesignPoint {
  readonly kind: LoopKind;
  readonly speed_mps: number;
  /** Ts/2 + computation latency, added to the dead time, s. */
  readonly controllerDelay_s: number;
  /** Preview distance from the CG (path loop), m; 0 when not given. */
  readonly previewFromCg_m?: number;
}

/** The steer command → yaw rate FOPDT a design starts from, where it came from, and G_vy(0)/G_r(0) (m; 0 for a lumped model). */
interface YawRateDesign {
  readonly yaw: { gain: number; timeConstant_s: number; deadTime_s: number };
  readonly source: 'identified' | 'two-point';
  readonly lateralVelocityPerYawRate_m: number;
}

function assemble(point: DesignPoint, design: YawRateDesign): DesignModelDerivation {
  const { kind, speed_mps, controllerDelay_s } = point;
  const previewFromCg_m = point.previewFromCg_m ?? 0;
  const { yaw, source, lateralVelocityPerYawRate_m } = design;
  const loop = findLoop(kind);
  const context = { speed_mps, previewFromCg_m };
  const lead = loop.designLead_s(context, lateralVelocityPerYawRate_m);
  const model: DesignModel = {
    integrators: loop.integrators,
    gain: yaw.gain * loop.designGainFactor(context),
    lags_s: yaw.timeConstant_s > 0 ? [yaw.timeConstant_s] : [],
    deadTime_s: yaw.deadTime_s + controllerDelay_s,
    ...(lead !== 0 ? { leadTimeConstant_s: lead } : {}),
  };
  return {
    yawRateGain_perS: yaw.gain,
    yawRateTimeConstant_s: yaw.timeConstant_s,
    yawRateDeadTime_s: yaw.deadTime_s,
    yawRateSource: source,
    controllerDelay_s,
    model,
  };
}

/**
 * The design model of a loop from a lumped per-speed yaw-rate model. The yaw-rate response is
 * taken as FOPDT K·e^(−θs)/(τs + 1) (an identified FOPDT as is; an overdamped second-order model
 * without zero keeps both real lags τ1,2 = (ζ ± √(ζ² − 1))/ωn; any other second-order model is reduced
 * by `fopdtByTwoPoints`), the controller delay Ts/2 + latency added to θ, and the loop's integrators
 * and gain factor applied:
 *   yaw-rate  K·e^(−θs)/(τs + 1)            (self-regulating)
 *   heading   K·e^(−θs)/(s(τs + 1))         (integrating, k' = K)
 *   path      K·vx·((d/vx)s + 1)·e^(−θs)/(s²(τs + 1))   (double-integrating, k'' = K·vx, preview lead T0 = d/vx
 *                                                         with d from the CG, `previewFromCg_m`, m)
 * The rules fold the lag τ into the delay by Skogestad's half rule where their plant class needs it.
 */
export function designModelFromLumped(point: DesignPoint & { readonly model: LumpedModel }): DesignModelDerivation {
  const { model } = point;
  if (model.kind === 'fopdt') {
    return assemble(point, { yaw: model, source: 'identified', lateralVelocityPerYawRate_m: 0 });
  }
  const { dampingRatio: zeta, naturalFrequency_radps: omega, zeroTimeConstant_s: beta } = model;
  if (beta === 0 && zeta >= 1 && omega > 0) {
    // Overdamped without a zero: two real lags τ1,2 = (ζ ± √(ζ² − 1))/ωn, kept exactly (SIMC's second-order rule uses both).
    const spread = Math.sqrt(zeta * zeta - 1);
    const lags_s = [(zeta + spread) / omega, (zeta - spread) / omega];
    const derivation = assemble(point, {
      yaw: { gain: model.gain, timeConstant_s: lags_s[0], deadTime_s: model.deadTime_s },
      source: 'identified',
      lateralVelocityPerYawRate_m: 0,
    });
    return { ...derivation, model: { ...derivation.model, lags_s } };
  }
  return assemble(point, { yaw: fopdtByTwoPoints(lumpedYawRateTransferFunction(model)), source: 'two-point', lateralVelocityPerYawRate_m: 0 });
}

/**
 * The design model from the single-track model at one speed, "the same way" as from a lumped model:
 * the steer command → yaw rate response with the actuator, e^(−θa s)/(τa s + 1)·(b1 s + b0)/(s² + a1 s + a0),
 * is reduced to FOPDT by Smith's two-point method on its exact step response (`fopdtByTwoPoints`), then as `designModelFromLumped`.
 * For the path loop k'' = K·vx with K = vx/(L + Ku·vx²) the steady yaw gain, and the lead
 * T0 = (G_vy(0)/G_r(0) + d)/vx: the low-frequency zero of the exact path plant (the CG's own sideslip
 * acts like a preview of G_vy(0)/G_r(0) ≈ b at low speed). Throws `tuning.unstablePlant` above
 * an oversteering vehicle's critical speed.
 */
export function designModelFromSingleTrack(point: DesignPoint & { readonly parameters: SingleTrackParameters }): DesignModelDerivation {
  const { parameters, speed_mps } = point;
  const responses = singleTrackTransferFunctions(parameters, speed_mps);
  const yawRate = seriesConnection(actuatorTransferFunction(parameters), responses.yawRate);
  const yawGain = dcGain(responses.yawRate);
  const lateralGain = dcGain(responses.lateralVelocity);
  const lateralVelocityPerYawRate_m = yawGain === null || lateralGain === null || yawGain === 0 ? 0 : lateralGain / yawGain;
  return assemble(point, { yaw: fopdtByTwoPoints(yawRate), source: 'two-point', lateralVelocityPerYawRate_m });
}
