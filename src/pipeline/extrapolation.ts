/**
 * Gains tuned beyond the tested speeds, said with numbers: how far outside the range and how large the
 * gains are against those at the nearest test speed (gains grow roughly like 1/v² towards standstill, and
 * the model there is an extrapolation — the user must see both before trusting them).
 */
import type { PidGains } from '../controller/types.js';

export interface Extrapolation {
  readonly speed_mps: number;
  /** The nearest end of the tested range, m/s. */
  readonly nearestTestSpeed_mps: number;
  /** Signed distance from it: negative below the tested range, m/s. */
  readonly distance_mps: number;
  /** Gains at the speed over gains at the nearest test speed (null where that gain is 0). */
  readonly gainRatios: { readonly kp: number | null; readonly ki: number | null; readonly kd: number | null };
  readonly gains: PidGains;
  readonly gainsAtNearestTestSpeed: PidGains;
}

/** Relative distance below which a speed counts as tested (as operating-point-from-models.ts). */
const SAME_SPEED_FRACTION = 1e-3;

/** The extrapolation at `speed_mps`, or null inside the tested range. `gainsAt` tunes at a speed (m/s). */
export function extrapolationAt(speed_mps: number, testSpeeds_mps: readonly number[], gainsAt: (speed_mps: number) => PidGains): Extrapolation | null {
  const lowest = Math.min(...testSpeeds_mps);
  const highest = Math.max(...testSpeeds_mps);
  const nearest = speed_mps < lowest * (1 - SAME_SPEED_FRACTION) ? lowest : speed_mps > highest * (1 + SAME_SPEED_FRACTION) ? highest : null;
  if (nearest === null) return null;
  const gains = gainsAt(speed_mps);
  const reference = gainsAt(nearest);
  const ratio = (name: keyof PidGains): number | null => (reference[name] === 0 ? null : gains[name] / reference[name]);
  return {
    speed_mps,
    nearestTestSpeed_mps: nearest,
    distance_mps: speed_mps - nearest,
    gainRatios: { kp: ratio('kp'), ki: ratio('ki'), kd: ratio('kd') },
    gains,
    gainsAtNearestTestSpeed: reference,
  };
}

const shown = (value: number): string => String(Number(value.toPrecision(3)));

/** "0.5 m/s is 1.5 m/s (75 %) below the lowest tested speed, 2 m/s: the model is extrapolated and the gains are kp 4.97×, ki 5.6× those at 2 m/s (kp 4.64 against 0.934, …)". */
export function extrapolationWords(extrapolation: Extrapolation): string {
  const { speed_mps, nearestTestSpeed_mps: nearest, distance_mps } = extrapolation;
  const side = distance_mps < 0 ? 'below the lowest' : 'above the highest';
  const names = (['kp', 'ki', 'kd'] as const).filter((name) => extrapolation.gainRatios[name] !== null);
  const ratios = names.map((name) => `${name} ${shown(extrapolation.gainRatios[name] as number)}×`).join(', ');
  const values = names.map((name) => `${name} ${shown(extrapolation.gains[name])} against ${shown(extrapolation.gainsAtNearestTestSpeed[name])}`).join(', ');
  return (
    `${shown(speed_mps)} m/s is ${shown(Math.abs(distance_mps))} m/s (${shown((100 * Math.abs(distance_mps)) / nearest)} %) ${side} tested speed, ${shown(nearest)} m/s: ` +
    `the model is extrapolated there, and the gains are ${ratios || 'all zero'} those at ${shown(nearest)} m/s (${values}) — log step tests at this speed before using them`
  );
}
