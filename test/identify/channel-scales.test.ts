import { mkdtempSync, readdirSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { channelObservations, type ChannelObservations } from '../../src/identify/channel-observations.js';
import { judgeChannelScales } from '../../src/identify/channel-scales.js';
import { resolveColumnUnits } from '../../src/log/column-map.js';
import type { ColumnMap } from '../../src/log/column-map.js';
import { readSteerLog } from '../../src/log/read.js';
import { findStepTests } from '../../src/log/segment.js';
import type { LogChannelSource, StepTest } from '../../src/log/types.js';
import { loadVehicle } from '../../src/vehicle/load.js';
import { convertLogs } from './converted-logs.js';

// Source: SI and the international yard (1959): 1 km/h = 1/3.6 m/s, 1 mph = 0.44704 m/s; 1 rad = 180/π degrees.
const KPH_FACTOR = 3.6;
const MPH_FACTOR = 1 / 0.44704;
const DEGREES_PER_RADIAN = 180 / Math.PI;

function stepsOf(
  vehicleFolder: string,
  logs: readonly string[],
  columns?: ColumnMap,
): { steps: StepTest[]; channels: readonly LogChannelSource[]; wheelbase_m: number; steeringRatio: number } {
  const vehicle = loadVehicle(vehicleFolder);
  const steps: StepTest[] = [];
  let channels: readonly LogChannelSource[] = [];
  for (const file of logs) {
    const log = readSteerLog(file, { steeringRatio: vehicle.steeringRatio, ...(columns === undefined ? {} : { columns }) });
    channels = log.channels ?? [];
    steps.push(...findStepTests(log, { maxSteerAngle_rad: vehicle.maxSteerAngle_rad }).steps);
  }
  return { steps, channels, wheelbase_m: vehicle.cgToFrontAxle_m + vehicle.cgToRearAxle_m, steeringRatio: vehicle.steeringRatio };
}

const logsOf = (folder: string): string[] =>
  readdirSync(join(folder, 'logs'))
    .filter((name) => name.endsWith('.csv'))
    .sort()
    .map((name) => join(folder, 'logs', name));

describe('channelObservations(steps, L): ratios the kinematics fix at 1', () => {
  it.each(['parcel-van', 'parcel-van-loaded', 'vineyard-sprayer', 'sidewalk-robot'])('on the %s demo logs each is within 3 % of 1', (name) => {
    // Source: the single-track steady state (Gillespie 1992, ch. 6; Rajamani 2012, §3.3): r/δ = v/(L + K·v²), so
    // v·δ/(L·r) = 1 + (K/L)·v² meets 1 at standstill; steady turning a_y = v·r; the actuator's steady gain is 1.
    const { steps, wheelbase_m } = stepsOf(`vehicles/${name}`, logsOf(`vehicles/${name}`));
    const observed = channelObservations(steps, wheelbase_m);
    for (const value of [observed.kinematicCommand, observed.kinematicMeasured, observed.steadyTurning, observed.actuatorGain]) {
      expect(value).not.toBeNull();
      expect(Math.abs((value as number) - 1)).toBeLessThan(0.03);
    }
    expect(observed.speedCount).toBeGreaterThanOrEqual(6);
  });

  it('speed in km/h read as m/s multiplies the kinematic intercepts and v·r/a_y by 3.6 and leaves the actuator gain at 1', () => {
    const folder = mkdtempSync(join(tmpdir(), 'speedband-kph-'));
    const { steps, wheelbase_m } = stepsOf('vehicles/parcel-van', convertLogs('vehicles/parcel-van/logs', folder, { scale: { speed_mps: KPH_FACTOR } }));
    const observed = channelObservations(steps, wheelbase_m);
    expect(observed.kinematicCommand as number).toBeCloseTo(KPH_FACTOR, 1);
    expect(observed.steadyTurning as number).toBeCloseTo(KPH_FACTOR, 1);
    expect(observed.actuatorGain as number).toBeCloseTo(1, 2);
  });
});

describe('judgeChannelScales(observations, sources, steering ratio): the channel a factor points to, and its unit', () => {
  const none: ChannelObservations = { kinematicCommand: null, kinematicMeasured: null, steadyTurning: null, actuatorGain: null, speedCount: 10 };
  const judge = (observed: Partial<ChannelObservations>, sources: readonly LogChannelSource[] = []) =>
    judgeChannelScales({ ...none, ...observed }, sources, 18);
  const source = (channel: string, unit: string, toSi: number): LogChannelSource => ({ channel, header: channel, columnNumber: 1, unit, toSi });

  it('consistent within the tolerance: nothing found', () => {
    expect(judge({ kinematicCommand: 1.2, kinematicMeasured: 1.2, steadyTurning: 0.9, actuatorGain: 1.01 })).toEqual({ kind: 'consistent' });
  });

  it('all four ratios: mph speed, steering-wheel degrees read as degrees, a yaw rate in deg/s read as rad/s, a lateral acceleration in g read as m/s²', () => {
    expect(judge({ kinematicCommand: MPH_FACTOR, kinematicMeasured: MPH_FACTOR, steadyTurning: MPH_FACTOR, actuatorGain: 1 })).toMatchObject({
      kind: 'scaled',
      findings: [{ channel: 'speed_mps', likelyUnit: 'mph' }],
    });
    expect(
      judge({ kinematicCommand: 18, kinematicMeasured: 1, steadyTurning: 1, actuatorGain: 1 / 18 }, [source('steer_cmd_rad', 'deg', Math.PI / 180)]),
    ).toMatchObject({
      kind: 'scaled',
      findings: [{ channel: 'steer_cmd_rad', likelyUnit: 'steering-wheel-deg' }],
    });
    expect(
      judge({ kinematicCommand: 1 / DEGREES_PER_RADIAN, kinematicMeasured: 1 / DEGREES_PER_RADIAN, steadyTurning: DEGREES_PER_RADIAN, actuatorGain: 1 }),
    ).toMatchObject({
      kind: 'scaled',
      findings: [{ channel: 'yaw_rate_radps', likelyUnit: 'deg/s' }],
    });
    // Source: standard gravity g = 9.80665 m/s² (CGPM 1901); a lateral acceleration recorded in g reads 1/9.80665 of the true m/s².
    expect(judge({ kinematicCommand: 1, kinematicMeasured: 1, steadyTurning: 9.80665, actuatorGain: 1 })).toMatchObject({
      kind: 'scaled',
      findings: [{ channel: 'lat_accel_mps2', likelyUnit: 'g' }],
    });
  });

  it('the yaw gain alone cannot tell speed from steering: the factor that matches a unit of its channel comes first, the others are listed', () => {
    const kph = judge({ kinematicCommand: KPH_FACTOR });
    expect(kph).toMatchObject({ kind: 'scaled', findings: [{ channel: 'speed_mps', likelyUnit: 'km/h' }, { likelyUnit: null }, { likelyUnit: null }] });
    const degrees = judge({ kinematicCommand: DEGREES_PER_RADIAN });
    expect(degrees.kind === 'scaled' && degrees.findings[0]).toMatchObject({ channel: 'steer_cmd_rad', likelyUnit: 'deg' });
  });

  it('a unit declared wrongly is corrected from the declared one: km/h data declared mph is 1.609× too high, and km/h is the fix', async () => {
    const declared = (await resolveColumnUnits({ speed_mps: { unit: 'mph' } })).speed_mps?.conversion?.toSi as number;
    const factor = declared * KPH_FACTOR;
    expect(
      judge({ kinematicCommand: factor, kinematicMeasured: factor, steadyTurning: factor, actuatorGain: 1 }, [source('speed_mps', 'mph', declared)]),
    ).toMatchObject({
      kind: 'scaled',
      findings: [{ channel: 'speed_mps', likelyUnit: 'km/h' }],
    });
  });

  it('ratios no single channel explains are inconsistent', () => {
    expect(judge({ kinematicCommand: 3.6, kinematicMeasured: 1, steadyTurning: 3.6, actuatorGain: 1 })).toEqual({ kind: 'inconsistent' });
  });
});
