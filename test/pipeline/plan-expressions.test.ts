import { mkdtempSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';
import { buildSchedule } from '../../src/pipeline/build-schedule.js';
import { recordingIo } from '../../src/cli/io.js';
import { runCli } from '../../src/cli/main.js';
import { readSchedule } from '../../src/schedule/schedule-file.js';
import { demoModels, demoSchedule } from '../helpers/demo-builds.js';

const VAN = 'vehicles/parcel-van';
const SETTLING = 'max(90, 14 * speed_mps)';
/** The same expression in plain JavaScript: the reference for what the build resolved. */
const settling = (speed_mps: number): number => Math.max(90, 14 * speed_mps);

let dir: string;
let modelsPath: string;

/** A path plan with damping-target's parameters; no scenarios (what is tested is how the parameters reach the rule). */
const writePlan = (name: string, parameters: Record<string, unknown>): string => {
  const path = join(dir, name);
  writeFileSync(
    path,
    JSON.stringify({
      loop: { kind: 'path', preview_m: 2, referencePoint: 'front-axle' },
      rule: { name: 'damping-target', parameters },
      check: { scenarios: false },
    }),
  );
  return path;
};

beforeAll(async () => {
  dir = mkdtempSync(join(tmpdir(), 'speedband-plan-expressions-'));
  // The van identified from its bundled logs as build identifies it (shared: test/helpers/demo-builds.ts).
  modelsPath = (await demoModels('parcel-van')).path;
});

describe('speedband build with a rule parameter given as an expression of speed', () => {
  it('records the resolved value at each breakpoint in schedule.json, and the rule used exactly that value', async () => {
    const plan = writePlan('plan.json', { dampingRatio: 1, settlingDistance_m: SETTLING });
    const out = join(dir, 'schedule.json');
    const io = recordingIo();
    const code = await runCli(['build', '--vehicle', VAN, '--models', modelsPath, '--plan', plan, '--out', out, '--allow-failing', '--json'], io);
    expect([0, 1], io.err()).toContain(code);
    const schedule = readSchedule(out); // schema-valid with the new field
    expect(schedule.provenance.rule.parameters.settlingDistance_m).toBe(SETTLING);
    const resolved = schedule.provenance.rule.parametersAtBreakpoints ?? [];
    expect(resolved.map((entry) => entry.speed_mps)).toEqual(schedule.breakpoints.map((breakpoint) => breakpoint.speed_mps));
    for (const entry of resolved) {
      expect(entry.parameters.settlingDistance_m).toBeCloseTo(settling(entry.speed_mps), 10);
      expect(entry.parameters.dampingRatio).toBe(1);
    }
    // The derivation at each breakpoint: ωn = 4·v/(ζ·D), the 2 % settling time 4/(ζ·ωn) travelled at v
    // (second-order settling time, Franklin, Powell & Emami-Naeini, Feedback Control of Dynamic Systems, §3.4).
    const report = JSON.parse(io.out()) as { derivations: { speed_mps: number; intermediate: Record<string, number> }[] };
    for (const derivation of report.derivations) {
      expect(derivation.intermediate.naturalFrequency_radps).toBeCloseTo((4 * derivation.speed_mps) / settling(derivation.speed_mps), 10);
    }
  });

  it('prints the expression and its values at the breakpoints in the report', async () => {
    const plan = writePlan('plan-report.json', { dampingRatio: 1, settlingDistance_m: SETTLING });
    const io = recordingIo();
    await runCli(['build', '--vehicle', VAN, '--models', modelsPath, '--plan', plan, '--out', join(dir, 'report.json'), '--allow-failing'], io);
    expect(io.out()).toContain(`settlingDistance_m = ${SETTLING}`);
    expect(io.out()).toMatch(/settlingDistance_m at the breakpoints: 90, /);
  });

  it('a bad expression is bad input (exit 2) naming the plan file, the field and the character, before any log is read', async () => {
    const plan = writePlan('bad.json', { settlingDistance_m: 'max(90, 14 * speed)' });
    const io = recordingIo();
    expect(await runCli(['build', '--vehicle', VAN, '--logs', join(dir, 'no-such-log.csv'), '--plan', plan, '--out', join(dir, 'bad-out.json')], io)).toBe(2);
    expect(io.err()).toContain(`${plan}, at /rule/parameters/settlingDistance_m`);
    expect(io.err()).toMatch(/unknown name "speed" .*at character 14/);
    await expect(buildSchedule({ vehicle: VAN, logPaths: [join(dir, 'no-such-log.csv')], planFile: plan })).rejects.toMatchObject({ code: 'plan.invalid' });
  });

  it('an expression that leaves the allowed values at a breakpoint names the speed; a rule refusal names the speed too', async () => {
    const negative = writePlan('negative.json', { dampingRatio: 1, settlingDistance_m: '14 * speed_mps - 40' });
    const io = recordingIo();
    expect(await runCli(['build', '--vehicle', VAN, '--models', modelsPath, '--plan', negative, '--out', join(dir, 'negative-out.json')], io)).toBe(2);
    expect(io.err()).toMatch(/settlingDistance_m "14 \* speed_mps - 40" gives -11\.99\d* at 2\.00\d* m\/s/);
    const short = writePlan('short.json', { dampingRatio: 1, settlingDistance_m: 'max(20, speed_mps)' });
    const refused = recordingIo();
    expect(await runCli(['build', '--vehicle', VAN, '--models', modelsPath, '--plan', short, '--out', join(dir, 'short-out.json')], refused)).toBe(2);
    expect(refused.err()).toMatch(/tuning at 2\.00 m\/s: .*settling distance/);
  });
});

describe('speedband build with "tuneFor": "fastest-passing"', () => {
  it('refuses a plan that also gives the searched parameter (exit 2, JSON path named), and records the search at every breakpoint', async () => {
    const conflicting = join(dir, 'conflict.json');
    writeFileSync(
      conflicting,
      JSON.stringify({ loop: { kind: 'path' }, rule: { name: 'damping-target', tuneFor: 'fastest-passing', parameters: { settlingDistance_m: 40 } } }),
    );
    const io = recordingIo();
    expect(await runCli(['build', '--vehicle', VAN, '--models', modelsPath, '--plan', conflicting, '--out', join(dir, 'never.json')], io)).toBe(2);
    expect(io.err()).toMatch(/rule\/parameters\/settlingDistance_m.*fastest-passing.*searches naturalFrequency_radps/);
    const searched = join(dir, 'search.json');
    writeFileSync(searched, JSON.stringify({ loop: { kind: 'heading' }, rule: { name: 'simc', tuneFor: 'fastest-passing' } }));
    const out = join(dir, 'searched-schedule.json');
    expect(await runCli(['build', '--vehicle', VAN, '--models', modelsPath, '--plan', searched, '--out', out], recordingIo())).toBe(0);
    const schedule = readSchedule(out);
    expect(schedule.provenance.rule.tuneFor).toBe('fastest-passing');
    const search = schedule.provenance.rule.searchAtBreakpoints ?? [];
    expect(search.map((entry) => entry.speed_mps)).toEqual(schedule.breakpoints.map((row) => row.speed_mps));
    schedule.breakpoints.forEach((_row, k) => {
      expect(search[k].parameter).toBe('simcClosedLoopTimeConstant_s');
      expect(schedule.provenance.rule.parametersAtBreakpoints?.[k].parameters.simcClosedLoopTimeConstant_s).toBe(search[k].value);
      expect(search[k].outcome).toBe('fastest passing');
    });
  });
});

describe('speedband reverify with edited set-point weights', () => {
  it('recomputes the time-domain figures: b raised to 1 where the build chose less breaks the overshoot limit, and nothing is written (exit 1)', async () => {
    // The default heading plan's schedule on these models, as `build` writes it (shared: test/helpers/demo-builds.ts).
    const { schedule } = await demoSchedule('parcel-van', { loop: { kind: 'heading' } });
    expect(schedule.status).toBe('passed');
    const k = schedule.breakpoints.findIndex((row) => row.setpointWeightProportional < 0.9);
    expect(k).toBeGreaterThanOrEqual(0);
    const edited = { ...schedule, breakpoints: schedule.breakpoints.map((row, i) => (i === k ? { ...row, setpointWeightProportional: 1 } : row)) };
    const editedPath = join(dir, 'heading-edited.json');
    writeFileSync(editedPath, JSON.stringify(edited));
    const io = recordingIo();
    expect(await runCli(['reverify', editedPath, '--vehicle', VAN, '--models', modelsPath, '--out', join(dir, 'heading-reverified.json')], io)).toBe(1);
    expect(io.out()).toMatch(/time domain at .* m\/s: .*overshoot/);
    expect(io.out()).toMatch(/Nothing written/);
  });
});
