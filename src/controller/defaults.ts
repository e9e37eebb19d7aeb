import type { ControllerSettings } from './types.js';

/**
 * Default controller settings, in one place. N = 10 is common practice (DOMAIN.md §4);
 * 100 Hz is a common steering-controller rate (common practice); backward Euler keeps
 * the derivative-filter pole in [0, 1) for any N (no ringing, DOMAIN.md §5b).
 */
export const CONTROLLER_DEFAULTS: ControllerSettings = {
  derivativeFilter: 10,
  sampleTime_s: 0.01,
  discretisation: 'backward-euler',
  computationLatency_s: 0,
};
