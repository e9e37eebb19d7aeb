/**
 * PID gains in the parallel form the firmware runs:
 *   u = kp·e + ki·∫e dt + kd·ė_filtered,  filtered derivative kd·s/(1 + (Td/N)·s), Td = kd/kp.
 * Units depend on the loop: for a yaw-rate loop kp is rad per rad/s, ki rad per rad, kd rad per rad/s².
 */
export interface PidGains {
  readonly kp: number;
  readonly ki: number;
  readonly kd: number;
}

/** The three common ways of writing a PID (docs/domain.md §4). */
export type PidForm = 'parallel' | 'ideal' | 'series';

/** Discretisation the firmware uses for integral and derivative filter. */
export type Discretisation = 'tustin' | 'backward-euler';

/** What the firmware runs, beyond the gains. */
export interface ControllerSettings {
  /** Derivative filter factor N: filter time constant Tf = Td/N with Td = kd/kp (common practice N ≈ 10). */
  readonly derivativeFilter: number;
  readonly sampleTime_s: number;
  readonly discretisation: Discretisation;
  /** Computation latency from sample to actuator command, s (added to the hold delay Ts/2). */
  readonly computationLatency_s: number;
}

/**
 * Ideal ("standard", ISA) form Kc·(1 + 1/(Ti·s) + Td·s). integralTime_s is null when
 * there is no integral action (Ti = ∞). Same units for gain as PidGains.kp.
 */
export interface IdealPid {
  readonly gain: number;
  readonly integralTime_s: number | null;
  readonly derivativeTime_s: number;
}

/**
 * Series ("interacting", classical) form Kc·(1 + 1/(τI·s))·(1 + τD·s).
 * integralTime_s is null when there is no integral action (τI = ∞).
 */
export interface SeriesPid {
  readonly gain: number;
  readonly integralTime_s: number | null;
  readonly derivativeTime_s: number;
}
