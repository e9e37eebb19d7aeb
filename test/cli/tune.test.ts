import { describe, expect, it } from 'vitest';
import { recordingIo } from '../../src/cli/io.js';
import { runCli } from '../../src/cli/main.js';

const fopdt = ['--gain', '2.4', '--time-constant-s', '0.12', '--dead-time-s', '0.07'];

async function run(argv: string[]): Promise<{ code: number; out: string; err: string }> {
  const io = recordingIo();
  const code = await runCli(argv, io);
  return { code, out: io.out(), err: io.err() };
}

describe('speedband tune', () => {
  it('SIMC on a yaw-rate FOPDT prints Kc = τ/(K(τc+θ)) and the closed-form phase margin of e^(−θs)/(2θs); exit 0', async () => {
    const { code, out } = await run(['tune', '--rule', 'simc', '--loop', 'yaw-rate', '--speed-mps', '8', ...fopdt]);
    expect(code).toBe(0);
    // Source: Skogestad 2003 SIMC PI; θ = 0.07 s + Ts/2 = 0.005 s (default Ts 0.01 s): Kc = 0.12/(2.4·0.15) = 1/3, τI = 0.12 s.
    expect(out).toMatch(/kp = 0\.33333 rad per rad\/s/);
    expect(out).toMatch(/ki = 2\.7778 rad per rad\b/);
    // Closed form: PM = 90° − 0.5 rad = 61.352°, upper GM = 20·log10(π) = 9.943 dB.
    expect(out).toMatch(/phase margin\s+61\.352 °/);
    expect(out).toMatch(/upper gain margin\s+9\.9430 dB/);
    expect(out).toMatch(/Skogestad, S\. \(2003\)/);
  });

  it('--json gives the gains, the derivation and the margins as data', async () => {
    const { code, out } = await run(['tune', '--rule', 'imc-pid', '--speed-mps', '8', ...fopdt, '--closed-loop-time-constant-s', '0.1', '--json']);
    expect(code).toBe(0);
    const parsed = JSON.parse(out) as { gains: { kp: number; ki: number; kd: number }; derivation: { rule: string }; margins: { stable: boolean } };
    // Source: Rivera, Morari & Skogestad 1986 with θ = 0.075 s, τ = 0.12 s, λ = 0.1 s, K = 2.4: Kc = (2τ+θ)/(K(2λ+θ)).
    const kc = (2 * 0.12 + 0.075) / (2.4 * (2 * 0.1 + 0.075));
    expect(parsed.gains.kp).toBeCloseTo(kc, 12);
    expect(parsed.gains.ki).toBeCloseTo(kc / (0.12 + 0.075 / 2), 12);
    expect(parsed.gains.kd).toBeCloseTo((kc * 0.12 * 0.075) / (2 * 0.12 + 0.075), 12);
    expect(parsed.derivation.rule).toBe('imc-pid');
    expect(parsed.margins.stable).toBe(true);
  });

  it('Ziegler–Nichols for a path loop exits 2 saying why and naming the rules that apply', async () => {
    const { code, err } = await run(['tune', '--rule', 'ziegler-nichols-step', '--loop', 'path', '--speed-mps', '8', ...fopdt]);
    expect(code).toBe(2);
    expect(err).toMatch(/no finite maximum slope/);
    expect(err).toMatch(/rules that apply: simc, damping-target/);
  });

  it('a tuned loop that is unstable on the full plant exits 1 and says so', async () => {
    const { code, out } = await run(['tune', '--rule', 'simc', '--loop', 'path', '--speed-mps', '8', ...fopdt, '--closed-loop-time-constant-s', '0.01']);
    expect(code).toBe(1);
    expect(out).toMatch(/NOT stable/);
  });

  it('the single-track model from a demo vehicle file, path loop with a front-axle preview', async () => {
    const { code, out } = await run(['tune', '--rule', 'damping-target', '--loop', 'path', '--preview-m', '2', '--reference-point', 'front-axle', '--speed-mps', '10', '--settling-distance-m', '100', '--vehicle', 'vehicles/parcel-van']);
    expect(code).toBe(0);
    // Front-axle preview: d = 2 m + a (parcel van a = 1.75 m).
    expect(out).toMatch(/3\.7500 m from the CG/);
    // ωn = 4·v/(ζ·D) = 4·10/100 (DOMAIN.md §4).
    expect(out).toMatch(/naturalFrequency_radps = 0\.40000/);
  });

  it('a settling target too fast for the preview lead exits 2 with how far to lower ωn', async () => {
    const { code, err } = await run(['tune', '--rule', 'damping-target', '--loop', 'path', '--preview-m', '2', '--reference-point', 'front-axle', '--speed-mps', '10', '--settling-distance-m', '40', '--vehicle', 'vehicles/parcel-van']);
    expect(code).toBe(2);
    expect(err).toMatch(/lower ωn to at most [0-9.]+ rad\/s/);
  });

  it('bad input exits 2: no model, an incomplete FOPDT, an unknown rule', async () => {
    expect((await run(['tune', '--rule', 'simc', '--speed-mps', '8'])).err).toMatch(/no model given/);
    const incomplete = await run(['tune', '--rule', 'simc', '--speed-mps', '8', '--gain', '2']);
    expect(incomplete.code).toBe(2);
    expect(incomplete.err).toMatch(/needs all of --gain, --time-constant-s and --dead-time-s/);
    expect((await run(['tune', '--rule', 'ziegler', '--speed-mps', '8', ...fopdt])).code).toBe(2);
  });

  it('--help describes the options with units and defaults and shows examples', async () => {
    const { code, out } = await run(['tune', '--help']);
    expect(code).toBe(0);
    expect(out).toMatch(/--speed-mps/);
    expect(out).toMatch(/settling distance D, m/);
    expect(out).toMatch(/Examples:/);
  });
});
