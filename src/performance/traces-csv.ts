/**
 * Scenario traces as CSV, one row per controller sample, runs one after another; units in the column names
 * (the loop's reference, measurement and error in the loop's unit: heading rad, yaw rate rad/s, path m).
 */
import type { LoopKind } from '../loops/types.js';
import type { ScenarioTraces } from './scenario-simulation.js';

const LOOP_UNIT_SUFFIX: Readonly<Record<LoopKind, string>> = { heading: 'rad', 'yaw-rate': 'radps', path: 'm' };

/** A number as the shortest text that reads back to it within 12 significant figures. */
const cell = (value: number): string => String(Number(value.toPrecision(12)));

/** Simulated runs as CSV text: one row per controller sample, units in the column names. */
export function tracesCsv(
  loop: LoopKind,
  runs: readonly { readonly scenario: string; readonly startSpeed_mps: number; readonly traces: ScenarioTraces }[],
): string {
  const unit = LOOP_UNIT_SUFFIX[loop];
  const columns: readonly [string, keyof ScenarioTraces][] = [
    ['time_s', 'time_s'],
    ['speed_mps', 'speed_mps'],
    ['distance_m', 'distance_m'],
    [`reference_${unit}`, 'reference'],
    [`measurement_${unit}`, 'measurement'],
    [`error_${unit}`, 'error'],
    [loop === 'path' ? 'feedForwardInput_perM' : 'feedForwardInput_radps', 'feedForwardInput'],
    ['command_rad', 'command_rad'],
    ['steerAngle_rad', 'steerAngle_rad'],
    ['steerRate_radps', 'steerRate_radps'],
    ['yawRate_radps', 'yawRate_radps'],
    ['lateralAcceleration_mps2', 'lateralAcceleration_mps2'],
    ['lateralOffset_m', 'lateralOffset_m'],
    ['headingError_rad', 'headingError_rad'],
  ];
  const lines = [['scenario', 'startSpeed_mps', ...columns.map(([name]) => name)].join(',')];
  for (const run of runs) {
    const prefix = `${run.scenario},${cell(run.startSpeed_mps)}`;
    const series = columns.map(([, key]) => run.traces[key] as Float64Array);
    for (let k = 0; k < run.traces.time_s.length; k++) lines.push(`${prefix},${series.map((values) => cell(values[k])).join(',')}`);
  }
  return `${lines.join('\n')}\n`;
}
