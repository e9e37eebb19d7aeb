/**
 * Robust acceptance end to end through the commands a user runs: build with a variation set (nominal and worst
 * case side by side, the weakest parameter), check re-verifying both, reverify, build --baseline and compare
 * with the old gains over the new vehicle's set. Small sets and searches keep it quick; the search itself is
 * tested in test/robust/.
 */
import { mkdtempSync, readFileSync, writeFileSync, existsSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { beforeAll, describe, expect, it } from 'vitest';
import { recordingIo } from '../../src/cli/io.js';
import { runCli } from '../../src/cli/main.js';
import { computeScheduleChecksum } from '../../src/schedule/checksum.js';
import { readSchedule } from '../../src/schedule/schedule-file.js';
import type { ScheduleFile } from '../../src/schedule/schedule-types.js';
import { demoModels, demoSchedule } from '../helpers/demo-builds.js';
import { expectSameBytes } from '../helpers/same-bytes.js';

const VAN = join('vehicles', 'parcel-van');
const LOADED = join('vehicles', 'parcel-van-loaded');
let dir: string;
let vanModels: string;
let loadedModels: string;

/** A plan with a small set: the given variations only (the others zero), 12 check speeds, a short search. */
function plan(name: string, variations: Record<string, unknown>): string {
  const path = join(dir, `plan-${name}.json`);
  const zero = {
    mass_pct: 0,
    yawInertia_pct: 0,
    frontCorneringStiffness_pct: 0,
    rearCorneringStiffness_pct: 0,
    actuatorLag_pct: 0,
    addedLatency_s: 0,
    fromIdentification: false,
  };
  writeFileSync(path, JSON.stringify({ check: { gridSpeeds: 12 }, variations: { ...zero, search: { samples: 6, localSearchEvaluations: 6 }, ...variations } }));
  return path;
}

async function cli(args: string[]) {
  const io = recordingIo();
  const code = await runCli(args, io);
  return { code, out: io.out(), err: io.err() };
}

beforeAll(async () => {
  dir = mkdtempSync(join(tmpdir(), 'speedband-robust-'));
  // The vans identified from their bundled logs as build identifies them (shared: test/helpers/demo-builds.ts).
  vanModels = (await demoModels('parcel-van')).path;
  loadedModels = (await demoModels('parcel-van-loaded')).path;
}, 120_000);

describe('speedband build with a variation set', () => {
  it('passes a small set: writes the variations section, shows nominal and worst case side by side and names the weakest parameter', async () => {
    const out = join(dir, 'small.json');
    const run = await cli([
      'build',
      '--vehicle',
      VAN,
      '--models',
      vanModels,
      '--plan',
      plan('small', { mass_pct: 5, rearCorneringStiffness_pct: 3 }),
      '--out',
      out,
    ]);
    expect(run.code, run.out + run.err).toBe(0);
    const schedule = readSchedule(out);
    const variations = schedule.variations!;
    expect(schedule.status).toBe('passed');
    expect(variations.acceptance).toBe('robust');
    expect(variations.passed).toBe(true);
    expect(variations.set.dimensions.map((dimension) => dimension.parameter)).toEqual(['mass_kg', 'rearCorneringStiffness_NPerRad']);
    expect(variations.breakpoints.map((row) => row.speed_mps)).toEqual(schedule.breakpoints.map((row) => row.speed_mps));
    expect(variations.gridSize).toBe(schedule.check.gridSize);
    // Worst never better than nominal, breakpoint by breakpoint.
    schedule.breakpoints.forEach((row, k) => expect(variations.breakpoints[k].worst.phaseMargin_deg!.value).toBeLessThanOrEqual(row.margins.phaseMargin_deg!));
    // The time-domain figures over the set at each breakpoint: never better than the nominal ones the breakpoint records.
    schedule.breakpoints.forEach((row, k) => {
      const timeDomain = variations.breakpoints[k].timeDomain!;
      expect(timeDomain.vehicles).toBeGreaterThanOrEqual(5);
      expect(timeDomain.worst.overshoot_pct!.value!).toBeGreaterThanOrEqual(row.timeDomain!.referenceStep.overshoot_pct);
      expect(timeDomain.worst.misalignmentRecoveryTime_s!.value!).toBeGreaterThanOrEqual(row.timeDomain!.steeringMisalignment.recoveryTime_s!);
    });
    expect(run.out).toMatch(/time domain, worst case over the set at each breakpoint/);
    expect(run.out).toMatch(/nominal → worst case over the set, at each breakpoint/);
    expect(run.out).toMatch(/weakest parameter: (mass|rear cornering stiffness) — at [\d.]+ m\/s the/);
    // Deterministic: the same inputs give the same bytes.
    const again = join(dir, 'small-again.json');
    expect((await cli(['build', '--vehicle', VAN, '--models', vanModels, '--plan', join(dir, 'plan-small.json'), '--out', again])).code).toBe(0);
    expectSameBytes(readFileSync(again), readFileSync(out));
  });

  it('fails a set whose worst case breaks a limit: nothing written (exit 1) unless --allow-failing, which writes it marked failed', async () => {
    const failing = plan('soft-tyres', { rearCorneringStiffness_pct: 15, addedLatency_s: 0.01 });
    const out = join(dir, 'soft.json');
    const refused = await cli(['build', '--vehicle', VAN, '--models', vanModels, '--plan', failing, '--out', out]);
    expect(refused.code).toBe(1);
    expect(existsSync(out)).toBe(false);
    expect(refused.out).toMatch(/passes on the nominal model but not in the worst case over the plan's variations/);
    const written = await cli(['build', '--vehicle', VAN, '--models', vanModels, '--plan', failing, '--out', out, '--allow-failing', '--json']);
    expect(written.code).toBe(1);
    const schedule = readSchedule(out);
    expect(schedule.status).toBe('failed');
    expect(schedule.check.passed).toBe(true);
    expect(schedule.variations!.passed).toBe(false);
    expect(schedule.variations!.failures[0].messages.join(' ')).toMatch(/\(worst case: .*rear cornering stiffness −/);
    expect((JSON.parse(written.out) as { variations: unknown }).variations).toEqual(schedule.variations);
  });

  it('under nominal acceptance reports the same worst case without requiring it (exit 0, status passed)', async () => {
    const out = join(dir, 'soft-nominal.json');
    const run = await cli([
      'build',
      '--vehicle',
      VAN,
      '--models',
      vanModels,
      '--plan',
      plan('soft-nominal', { acceptance: 'nominal', rearCorneringStiffness_pct: 15, addedLatency_s: 0.01 }),
      '--out',
      out,
    ]);
    expect(run.code).toBe(0);
    const schedule = readSchedule(out);
    expect(schedule.status).toBe('passed');
    expect(schedule.variations!.passed).toBe(false);
    expect(schedule.variations!.worst).toEqual(readSchedule(join(dir, 'soft.json')).variations!.worst);
  });
});

describe('speedband check and reverify of a schedule with variations', () => {
  it('check re-verifies both the nominal check and the worst case, with the same figures as the build (exit 1 when the worst case fails)', async () => {
    const passing = await cli(['check', join(dir, 'small.json'), '--vehicle', VAN, '--json']);
    expect(passing.code).toBe(0);
    const result = JSON.parse(passing.out) as { passed: boolean; overallPassed: boolean; variations: ScheduleFile['variations'] };
    expect(result.variations).toEqual(readSchedule(join(dir, 'small.json')).variations);
    const failing = await cli(['check', join(dir, 'soft.json'), '--vehicle', VAN]);
    expect(failing.code).toBe(1);
    expect(failing.out).toMatch(/dense check on the joint single-track model, \d+ speeds .*: PASSED/);
    expect(failing.out).toMatch(/FAILED \(robust acceptance\)/);
    const nominalOnly = await cli(['check', join(dir, 'soft.json'), '--vehicle', VAN, '--nominal-only']);
    expect(nominalOnly.code).toBe(0);
    expect(nominalOnly.out).toMatch(/not checked \(--nominal-only\)/);
  });

  it('a re-checksummed edit that claims the worst case passed is refused: status must agree with the check and the variations', () => {
    const edited = JSON.parse(readFileSync(join(dir, 'soft.json'), 'utf8')) as ScheduleFile & { status: string; variations: { passed: boolean } };
    edited.status = 'passed';
    const path = join(dir, 'soft-edited.json');
    writeFileSync(path, JSON.stringify({ ...edited, checksum: computeScheduleChecksum(edited) }));
    expect(() => readSchedule(path)).toThrow(/variations\.passed is false under robust acceptance/);
  });

  it('reverify regenerates the variations section from its own check', async () => {
    const out = join(dir, 'small-reverified.json');
    const run = await cli(['reverify', join(dir, 'small.json'), '--vehicle', VAN, '--out', out]);
    expect(run.code, run.out).toBe(0);
    expect(readSchedule(out).variations).toEqual(readSchedule(join(dir, 'small.json')).variations);
    const refused = await cli(['reverify', join(dir, 'soft.json'), '--vehicle', VAN, '--out', join(dir, 'soft-reverified.json')]);
    expect(refused.code).toBe(1);
    expect(refused.out).toMatch(/fails the worst case over its variations/);
  });
});

describe('a fastest-passing search on the worst case (rule.searchOn)', () => {
  it('a heading schedule searched on the nominal model fails its worst case; searched on the worst case (the default under robust acceptance) it passes, with slower settings', async () => {
    const written = (searchOn?: 'nominal') => {
      const path = join(dir, `plan-heading-${searchOn ?? 'default'}.json`);
      const variations = {
        mass_pct: 10,
        yawInertia_pct: 0,
        frontCorneringStiffness_pct: 0,
        rearCorneringStiffness_pct: 20,
        actuatorLag_pct: 0,
        addedLatency_s: 0,
        fromIdentification: false,
        search: { samples: 6, localSearchEvaluations: 6 },
      };
      writeFileSync(
        path,
        JSON.stringify({
          loop: { kind: 'heading' },
          check: { gridSpeeds: 12 },
          breakpoints: { count: 4 },
          variations,
          ...(searchOn === undefined ? {} : { rule: { searchOn } }),
        }),
      );
      return path;
    };
    const nominalOut = join(dir, 'heading-nominal.json');
    const nominal = await cli(['build', '--vehicle', VAN, '--models', vanModels, '--plan', written('nominal'), '--out', nominalOut, '--allow-failing']);
    expect(nominal.code).toBe(1);
    const onNominal = readSchedule(nominalOut);
    expect(onNominal.check.passed).toBe(true);
    expect(onNominal.variations!.passed).toBe(false);
    expect(onNominal.provenance.rule.searchOn).toBe('nominal');

    const robustOut = join(dir, 'heading-worst-case.json');
    const robust = await cli(['build', '--vehicle', VAN, '--models', vanModels, '--plan', written(), '--out', robustOut]);
    expect(robust.code, robust.out).toBe(0);
    const onWorstCase = readSchedule(robustOut);
    expect(onWorstCase.provenance.rule.searchOn).toBe('worst-case');
    expect(onWorstCase.variations!.passed).toBe(true);
    expect(robust.out).toMatch(/rule simc \(fastest passing in the worst case over the variations\)/);
    // Its set-point weights were lowered for the worst case: every worst overshoot keeps the 25 % limit (plan default).
    for (const breakpoint of onWorstCase.variations!.breakpoints) {
      expect(breakpoint.timeDomain!.worst.overshoot_pct!.value!).toBeLessThanOrEqual(25);
      expect(breakpoint.timeDomain!.worst.limitedStepOvershoot_pct!.value!).toBeLessThanOrEqual(25);
    }
    // Passing the worst case asks at least as much as passing the nominal model: the search stops at a τc no faster.
    // (Compared at the breakpoints both have: the refinement may insert others.)
    const searched = (schedule: ScheduleFile) => new Map(schedule.provenance.rule.searchAtBreakpoints!.map((entry) => [entry.speed_mps, entry.value]));
    const both = [...searched(onWorstCase)].filter(([speed_mps]) => searched(onNominal).has(speed_mps));
    expect(both.length).toBeGreaterThanOrEqual(4);
    for (const [speed_mps, value] of both) expect(value).toBeGreaterThanOrEqual(searched(onNominal).get(speed_mps)!);
    expect(both.some(([speed_mps, value]) => value > searched(onNominal).get(speed_mps)!)).toBe(true);
    // A faster candidate was refused for what the worst case breaks.
    expect(onWorstCase.provenance.rule.searchAtBreakpoints!.some((entry) => /does not: worst case: /.test(entry.reason))).toBe(true);
  });
});

describe("after a vehicle change: the old gains over the new vehicle's variations", () => {
  it("build --baseline checks the van's gains over the loaded van's set, beside its nominal baseline", async () => {
    // The van's schedule of the default plan (shared: test/helpers/demo-builds.ts), as its build wrote it.
    const vanSchedule = (await demoSchedule('parcel-van')).path;
    expect(readSchedule(vanSchedule).status).toBe('passed');
    const out = join(dir, 'loaded.json');
    const run = await cli([
      'build',
      '--vehicle',
      LOADED,
      '--models',
      loadedModels,
      '--plan',
      plan('loaded', { acceptance: 'nominal', mass_pct: 10, rearCorneringStiffness_pct: 10, addedLatency_s: 0.01 }),
      '--out',
      out,
      '--baseline',
      vanSchedule,
      '--json',
    ]);
    const result = JSON.parse(run.out) as {
      baseline: { passedOnNewModel: boolean; failures: { speed_mps: number }[]; overVariations: NonNullable<ScheduleFile['variations']> };
    };
    expect(result.baseline.overVariations.set).toEqual(readSchedule(out).variations!.set);
    // The van's gains already fail on the loaded van's nominal model at high speed; over its set they fail from lower speeds.
    expect(result.baseline.passedOnNewModel).toBe(false);
    expect(result.baseline.overVariations.passed).toBe(false);
    expect(result.baseline.overVariations.failures[0].speed_mps).toBeLessThanOrEqual(result.baseline.failures[0].speed_mps);
    expect(result.baseline.overVariations.failedSpeeds).toBeGreaterThan(result.baseline.failures.length);
    expect(run.code).toBe(1);
  });

  it("compare flags the speeds where the old gains break their limits in the worst case over the new vehicle's variations (robust acceptance)", async () => {
    const out = join(dir, 'loaded-robust.json');
    await cli([
      'build',
      '--vehicle',
      LOADED,
      '--models',
      loadedModels,
      '--plan',
      plan('loaded-robust', { mass_pct: 5, rearCorneringStiffness_pct: 5 }),
      '--out',
      out,
      '--allow-failing',
    ]);
    const vanSchedule = (await demoSchedule('parcel-van')).path;
    const run = await cli(['compare', vanSchedule, out, '--json']);
    const comparison = JSON.parse(run.out) as {
      overVariations: { available: boolean; speeds: { speed_mps: number; old: { failures: string[] } }[] };
      flags: { kind: string; speed_mps: number | null }[];
    };
    expect(comparison.overVariations.available).toBe(true);
    const flagged = comparison.flags.filter((flag) => flag.kind === 'oldGainsFailOverVariations').map((flag) => flag.speed_mps);
    expect(flagged.length).toBeGreaterThan(0);
    expect(flagged).toEqual(comparison.overVariations.speeds.filter((row) => row.old.failures.length > 0).map((row) => row.speed_mps));
    expect(run.code).toBe(1);
    const nominal = await cli(['compare', vanSchedule, out, '--json', '--nominal-only']);
    expect((JSON.parse(nominal.out) as { overVariations?: unknown }).overVariations).toBeUndefined();
  });
});
