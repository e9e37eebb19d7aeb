import { findLoop } from '../loops/registry.js';
import type { LoopKind } from '../loops/types.js';
import type { LoopMargins } from '../verify/types.js';
import type { TunedOperatingPoint } from './operating-point.js';

/** Units of kp, ki, kd for each loop (controlled variable per rad of steer command). */
function gainUnits(kind: LoopKind): { readonly kp: string; readonly ki: string; readonly kd: string } {
  return findLoop(kind).gainUnits;
}

const number = (value: number): string => (Number.isInteger(value) ? String(value) : value.toPrecision(5));
const optional = (value: number | null, unit: string): string => (value === null ? 'none' : `${number(value)} ${unit}`);

function marginLines(margins: LoopMargins): string[] {
  return [
    `  verdict                ${margins.verdict}`,
    `  phase margin           ${optional(margins.phaseMargin_deg, '°')}${margins.phaseMarginFrequency_radps === null ? '' : ` at ${number(margins.phaseMarginFrequency_radps)} rad/s`}`,
    `  lower gain margin      ${optional(margins.lowerGainMargin_dB, 'dB')}${margins.lowerGainMarginFrequency_radps === null ? '' : ` at ${number(margins.lowerGainMarginFrequency_radps)} rad/s`}`,
    `  upper gain margin      ${optional(margins.upperGainMargin_dB, 'dB')}${margins.upperGainMarginFrequency_radps === null ? '' : ` at ${number(margins.upperGainMarginFrequency_radps)} rad/s`}`,
    `  delay margin           ${optional(margins.delayMargin_s, 's')}`,
    `  sensitivity peak Ms    ${number(margins.sensitivityPeak)} at ${number(margins.sensitivityPeakFrequency_radps)} rad/s`,
  ];
}

/**
 * A tuned operating point as text for a terminal: loop, design model, rule with citation, its form and
 * intermediate quantities, parallel gains with units, margins of the full loop, warnings.
 */
export function describeTunedOperatingPoint(point: TunedOperatingPoint, sampledMargins?: LoopMargins): string {
  const { loop, design, derivation, gains, margins } = point;
  const units = gainUnits(loop.kind);
  const lines: string[] = [];
  const preview =
    loop.kind === 'path'
      ? `, preview ${number(loop.preview_m ?? 0)} m${(loop.previewTime_s ?? 0) === 0 ? '' : ` + ${number(loop.previewTime_s ?? 0)} s × speed`} from the ${loop.referencePoint === 'front-axle' ? 'front axle' : 'CG'} (${number(loop.previewFromCg_m ?? 0)} m from the CG)`
      : '';
  lines.push(`Loop: ${loop.kind} at ${number(loop.speed_mps)} m/s${preview}`);
  lines.push(
    `Yaw-rate model (${design.yawRateSource === 'identified' ? 'as given' : "Smith's two-point FOPDT of the model's step response"}): K = ${number(design.yawRateGain_perS)} 1/s, τ = ${number(design.yawRateTimeConstant_s)} s, θ = ${number(design.yawRateDeadTime_s)} s; controller delay Ts/2 + latency = ${number(design.controllerDelay_s)} s`,
  );
  const m = derivation.designModel;
  lines.push(
    `Design model: gain ${number(m.gain)}, ${m.integrators} integrator(s), lags [${m.lags_s.map(number).join(', ')}] s, dead time ${number(m.deadTime_s)} s${
      (m.leadTimeConstant_s ?? 0) !== 0 ? `, lead ${number(m.leadTimeConstant_s ?? 0)} s` : ''
    }`,
  );
  lines.push(`Rule: ${derivation.rule} (${derivation.controllerType}) — ${derivation.citation}`);
  const form = derivation.ruleForm;
  if (form.form !== 'parallel') {
    lines.push(
      `  ${form.form} form: Kc = ${number(form.gain)}, ${form.form === 'series' ? 'τI' : 'Ti'} = ${form.integralTime_s === null ? 'none' : `${number(form.integralTime_s)} s`}, ${form.form === 'series' ? 'τD' : 'Td'} = ${number(form.derivativeTime_s)} s`,
    );
  }
  for (const [name, value] of Object.entries(derivation.intermediate)) lines.push(`  ${name} = ${number(value)}`);
  lines.push('Gains (parallel form u = kp·e + ki·∫e dt + kd·de/dt):');
  lines.push(`  kp = ${number(gains.kp)} ${units.kp}`);
  lines.push(`  ki = ${number(gains.ki)} ${units.ki}`);
  lines.push(`  kd = ${number(gains.kd)} ${units.kd}`);
  lines.push('Margins of the full loop (exact delay, filtered derivative; the sampling counted as a Ts/2 delay plus the latency):');
  lines.push(...marginLines(margins));
  if (sampledMargins !== undefined) {
    lines.push('Margins with the discrete PID the firmware runs (the exact sampled loop, as build and check judge it):');
    lines.push(...marginLines(sampledMargins));
  }
  for (const warning of point.warnings) lines.push(`Warning: ${warning}`);
  if (!margins.stable || (sampledMargins !== undefined && !sampledMargins.stable)) {
    lines.push('The tuned loop is NOT stable on the full plant: choose a slower target (larger τc, λ or settling distance) or another rule.');
  }
  return lines.join('\n');
}
