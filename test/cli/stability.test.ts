import { describe, expect, it } from 'vitest';
import { runCli } from '../../src/cli/main.js';
import { recordingIo } from '../../src/cli/io.js';
import type { LoopMargins } from '../../src/verify/types.js';

async function run(argv: string[]): Promise<{ code: number; out: string; err: string }> {
  const io = recordingIo();
  const code = await runCli(argv, io);
  return { code, out: io.out(), err: io.err() };
}

describe('speedband stability', () => {
  it('prints both gain margins of SIMC PID on a double integrator with delay and exits 0 (stable)', async () => {
    // Source: Skogestad 2003, SIMC double integrator at τc = θ = 1: Kc = 1/16, τI = τD = 8 (series);
    // docs/domain.md §4: upper GM ≈ 2.76 (8.82 dB), lower GM ≈ 0.165 (−15.65 dB), PM ≈ 33° (from memory).
    const result = await run([
      'stability',
      '--numerator',
      '1',
      '--denominator',
      '1 0 0',
      '--delay-s',
      '1',
      '--kp',
      '0.0625',
      '--ki',
      '8',
      '--kd',
      '8',
      '--form',
      'series',
      '--derivative-filter',
      'none',
      '--continuous',
      '--json',
    ]);
    expect(result.code).toBe(0);
    const margins = JSON.parse(result.out) as LoopMargins;
    expect(margins.verdict).toBe('stable');
    expect(margins.upperGainMargin_dB as number).toBeCloseTo(20 * Math.log10(2.76), 1);
    expect(margins.lowerGainMargin_dB as number).toBeCloseTo(20 * Math.log10(0.165), 1);
    expect(margins.phaseMargin_deg as number).toBeCloseTo(33, 0);
  });

  it('reads a FOPDT plant and prints margins with units; an over-tuned loop exits 1', async () => {
    // Source: SIMC PI at τc = θ on FOPDT gives L = e^(−θs)/(2θs) with GM = π = 9.94 dB (derived, Skogestad 2003).
    const tuned = await run([
      'stability',
      '--gain',
      '2',
      '--time-constant-s',
      '0.5',
      '--dead-time-s',
      '0.1',
      '--kp',
      '1.25',
      '--ki',
      '0.5',
      '--form',
      'ideal',
      '--continuous',
    ]);
    expect(tuned.code).toBe(0);
    expect(tuned.out).toMatch(/upper gain margin:\s+9\.94 dB at 15\.71 rad\/s/);
    expect(tuned.out).toMatch(/phase margin:\s+61\.35 °/);
    expect(tuned.out).toMatch(/delay margin:\s+[\d.]+ s/);
    // Three times the ultimate gain: unstable, exit code 1.
    const overTuned = await run(['stability', '--gain', '2', '--time-constant-s', '0.5', '--dead-time-s', '0.1', '--kp', '12', '--ki', '5', '--continuous']);
    expect(overTuned.code).toBe(1);
    expect(overTuned.out).toMatch(/verdict: unstable/);
    expect(overTuned.out).toMatch(/the loop is not stable: phase, gain and delay margins do not apply/);
    expect(overTuned.out).not.toMatch(/delay margin:/);
  });

  it('analyses the discrete PID with --sample-time-s: the hold costs phase', async () => {
    const base = ['stability', '--gain', '2', '--time-constant-s', '0.5', '--dead-time-s', '0.1', '--kp', '1.25', '--ki', '2.5', '--json'];
    const continuous = JSON.parse((await run([...base, '--continuous'])).out) as LoopMargins;
    const sampled = JSON.parse((await run([...base, '--sample-time-s', '0.02', '--latency-s', '0.005'])).out) as LoopMargins;
    // Source: common practice — a zero-order hold adds about Ts/2 of delay (docs/domain.md §5); with the
    // latency that is 15 ms more delay, about ω_c·0.015 rad less phase margin.
    const expectedLoss_deg = (continuous.phaseMarginFrequency_radps as number) * 0.015 * (180 / Math.PI);
    const loss = (continuous.phaseMargin_deg as number) - (sampled.phaseMargin_deg as number);
    expect(loss).toBeGreaterThan(0.7 * expectedLoss_deg);
    expect(loss).toBeLessThan(1.3 * expectedLoss_deg);
  });

  it('a negative plant gain with negative controller gains prints the same margins (the = form passes a leading minus)', async () => {
    // Source: common practice (docs/domain.md §5b): L = C·G is unchanged when both signs flip.
    const positive = await run(['stability', '--numerator', '2 1', '--denominator', '0.5 1 1', '--delay-s', '0.1', '--kp', '0.4', '--ki', '0.8']);
    const negative = await run(['stability', '--numerator=-2 -1', '--denominator', '0.5 1 1', '--delay-s', '0.1', '--kp', '-0.4', '--ki', '-0.8']);
    expect(negative.code).toBe(positive.code);
    expect(negative.out).toBe(positive.out);
    expect(positive.out).toMatch(/phase margin:\s+[\d.]+ °/);
  });

  it('bad input exits 2 with a message that names the option and what was expected', async () => {
    const letters = await run(['stability', '--numerator', '1 x', '--denominator', '1 0', '--kp', '1']);
    expect(letters.code).toBe(2);
    expect(letters.err).toMatch(/--numerator is "1 x" \(entry 2, "x", is not a number\)/);
    const missing = await run(['stability', '--kp', '1']);
    expect(missing.code).toBe(2);
    expect(missing.err).toMatch(/no plant given/);
    const improper = await run([
      'stability',
      '--numerator',
      '1',
      '--denominator',
      '1',
      '--kp',
      '1',
      '--kd',
      '1',
      '--derivative-filter',
      'none',
      '--continuous',
    ]);
    expect(improper.code).toBe(2);
    expect(improper.err).toMatch(/more zeros \(1\) than poles \(0\).*derivative filter/);
    const series = await run(['stability', '--gain', '1', '--time-constant-s', '1', '--dead-time-s', '0.1', '--kp', '1', '--ki', '0', '--form', 'ideal']);
    expect(series.code).toBe(2);
    expect(series.err).toMatch(/integral time and is 0 s — expected a time > 0 s/);
  });

  it('--help teaches the options with units, the exit codes and examples', async () => {
    const help = await run(['stability', '--help']);
    expect(help.code).toBe(0);
    expect(help.out).toMatch(/--delay-s\s+Plant delay θ/);
    expect(help.out).toMatch(/Exit codes:\n {2}0 {2}the loop is stable\n {2}1 {2}it is not stable/);
    expect(help.out).toMatch(/Examples:/);
  });

  it('says margins do not apply when the sampled loop is not stable, and names the sampled-data poles', async () => {
    // Source: audit of the Ts/2 hold approximation — this Tustin loop at 50 ms has exact sampled-data poles up to |z| = 1.0022
    // (cross-checked by simulation in test/verify/sampled-verdict.test.ts).
    const result = await run([
      'stability',
      '--gain',
      '3.61',
      '--time-constant-s',
      '0.12',
      '--dead-time-s',
      '0.141',
      '--kp',
      '0.3065',
      '--ki',
      '1.2602',
      '--kd',
      '0.0186',
      '--sample-time-s',
      '0.05',
      '--latency-s',
      '0',
      '--discretisation',
      'tustin',
    ]);
    expect(result.code).toBe(1);
    expect(result.out).toMatch(/verdict: unstable — decided by the sampled-data closed-loop poles, largest \|z\| 1\.0022/);
    expect(result.out).toMatch(/the Nyquist count agrees \(unstable\)/);
    expect(result.out).toMatch(/the loop is not stable: phase, gain and delay margins do not apply/);
    expect(result.out).not.toMatch(/reducing the gain by this destabilises/);
    // The signed figure at each gain crossover is still shown.
    expect(result.out).toMatch(/gain crossover at [\d.]+ rad\/s: 180° \+ ∠L = [\d.-]+°/);
  });
});
