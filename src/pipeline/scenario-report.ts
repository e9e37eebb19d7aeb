/** Scenario runs as a terminal table (simulate, build and check). */
import { overSpeedText } from '../core/by-speed.js';
import { fixedOrDash, precisionOrDash, textTable } from '../core/text-table.js';
import type { LoopKind } from '../loops/types.js';
import type { ScheduleScenarioCheck, SpeedChangeCertificate } from '../schedule/schedule-types.js';
import type { ScenarioRunAt } from './simulate-schedule.js';

const UNIT: Readonly<Record<LoopKind, string>> = { heading: 'rad', 'yaw-rate': 'rad/s', path: 'm' };

export function scenarioTable(loop: LoopKind, runs: readonly ScenarioRunAt[]): string[] {
  const unit = UNIT[loop];
  const heading = [
    'scenario',
    'speed m/s',
    `peak error ${unit}`,
    `final error ${unit}`,
    'overshoot %',
    'settling s',
    'settling m',
    'steer rad',
    'steer rate rad/s',
    'at angle limit s',
    'at rate limit s',
    'lateral acc m/s²',
    'sustained oscillation',
  ];
  const rows = runs.map((run) => {
    const m = run.metrics;
    return [
      run.scenario.name,
      run.speed_mps.toFixed(2),
      precisionOrDash(m.peakError, 3),
      precisionOrDash(Math.abs(m.finalError) < 1e-12 ? 0 : m.finalError, 2),
      fixedOrDash(m.overshoot_pct, 1),
      fixedOrDash(m.settlingTime_s, 2),
      fixedOrDash(m.settlingDistance_m, 1),
      m.peakSteerAngle_rad.toFixed(3),
      m.peakSteerRate_radps.toFixed(3),
      m.timeAtAngleLimit_s.toFixed(2),
      m.timeAtRateLimit_s.toFixed(2),
      m.peakLateralAcceleration_mps2.toFixed(2),
      m.limitCycle === null ? 'none' : `±${m.limitCycle.amplitude.toPrecision(3)} ${unit}, period ${m.limitCycle.period_s.toFixed(2)} s`,
    ];
  });
  return textTable(
    [heading, ...rows],
    heading.map((_, i) => i > 0 && i < heading.length - 1),
  ).map((line) => `  ${line}`);
}

/** The scenario check's verdict and the limits it broke (first 12); `speedChanges`: the rates of the range scenarios (the schedule's plan). */
export function formatScenarioCheck(
  check: ScheduleScenarioCheck,
  loop: LoopKind,
  speedChanges: { readonly acceleration_mps2: number; readonly deceleration_mps2: number },
): string {
  const l = check.limits;
  const rates = `speed ramp ${speedChanges.acceleration_mps2} m/s², braking ${speedChanges.deceleration_mps2} m/s²`;
  const lines = [
    `  scenarios (${check.scenarios.length}) at ${check.speeds_mps.map((speed) => speed.toFixed(2)).join(', ')} m/s and through the range (${rates}), on the ${check.model}: ` +
      (check.passed ? 'PASSED' : `FAILED, ${check.failures.length} limit(s) broken`),
    `  limits: no sustained oscillation; small step overshoot ≤ ${overSpeedText(l.maximumOvershoot_pct)} %, both steps settle; offset, misalignment and force removed within ${overSpeedText(l.maximumRecoveryTime_s)} s; ` +
      `path lane change ≤ ${overSpeedText(l.maximumLaneChangeError_m)} m; error while the speed changes ≤ ${overSpeedText(l.maximumSpeedChangeError)} ${UNIT[loop]}`,
  ];
  for (const failure of check.failures.slice(0, 12)) lines.push(`    ${failure.message}`);
  if (check.failures.length > 12) lines.push(`    … and ${check.failures.length - 12} more (schedule.json check.scenarios.failures)`);
  return `${lines.join('\n')}\n`;
}

export function formatSpeedChange(certificate: SpeedChangeCertificate): string {
  return `  speed-change certificate: ${certificate.statement}\n`;
}
