/**
 * A combination of parameter changes in words, for messages and reports: "mass −10 %, rear cornering
 * stiffness −21 %, actuator delay +0.011 s"; only the parameters off their nominal value.
 */
import type { Combination, VariedParameter } from './types.js';

const NAMES: Readonly<Record<VariedParameter, string>> = {
  mass_kg: 'mass',
  yawInertia_kgm2: 'yaw inertia',
  cgToFrontAxle_m: 'CG',
  frontCorneringStiffness_NPerRad: 'front cornering stiffness',
  rearCorneringStiffness_NPerRad: 'rear cornering stiffness',
  actuatorLag_s: 'actuator lag',
  actuatorDelay_s: 'actuator delay',
  gain: 'yaw gain',
  timeConstant_s: 'time constant',
  deadTime_s: 'dead time',
};

/** Parameters changed by an offset (their unit); the others by a factor. */
const OFFSET_UNITS: Readonly<Partial<Record<VariedParameter, string>>> = { cgToFrontAxle_m: 'm', actuatorDelay_s: 's', deadTime_s: 's' };

const signed = (value: number, digits: number): string => `${value >= 0 ? '+' : '−'}${Math.abs(value).toFixed(digits)}`;

/** One parameter's change in words, or null when it is at its nominal value (to the digits shown). */
export function changeWords(parameter: VariedParameter, change: number): string | null {
  const unit = OFFSET_UNITS[parameter];
  if (unit === undefined) {
    const percent = (change - 1) * 100;
    return Math.abs(percent) < 0.05 ? null : `${NAMES[parameter]} ${signed(percent, 1)} %`;
  }
  if (Math.abs(change) < 5e-4) return null;
  if (parameter === 'cgToFrontAxle_m') return `CG ${Math.abs(change).toFixed(3)} m ${change > 0 ? 'rearward' : 'forward'}`;
  return `${NAMES[parameter]} ${signed(change, 3)} ${unit}`;
}

/** The whole combination in words ("the nominal vehicle" when nothing is changed). */
export function combinationWords(combination: Combination): string {
  const parts = (Object.entries(combination) as [VariedParameter, number][]).flatMap(([parameter, change]) => changeWords(parameter, change) ?? []);
  return parts.length === 0 ? 'the nominal vehicle' : parts.join(', ');
}

/** The parameter's name in words. */
export const parameterWords = (parameter: VariedParameter): string => NAMES[parameter];
