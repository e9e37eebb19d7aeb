import type { LoopDefinition } from './types.js';

/** Yaw-rate loop: δcmd → r (rad/s), self-regulating. G_loop = G_r. */
export const YAW_RATE_LOOP: LoopDefinition = {
  kind: 'yaw-rate',
  description: 'steer command → yaw rate (self-regulating)',
  outputUnit: 'rad/s',
  gainUnits: { kp: 'rad per rad/s', ki: 'rad per rad', kd: 'rad per rad/s²' },
  fromYawRate: (yawRate) => yawRate,
  fromSingleTrack: (responses) => responses.yawRate,
  integrators: 0,
  designGainFactor: () => 1,
  designLead_s: () => 0,
};
