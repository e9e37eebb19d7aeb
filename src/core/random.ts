/**
 * Seeded pseudo-random numbers (mulberry32), so that every generated log,
 * start point and benchmark is reproducible. Not for cryptography.
 */
export interface RandomSource {
  /** Uniform in [0, 1). */
  readonly uniform: () => number;
  /** Standard normal (Box–Muller). */
  readonly normal: () => number;
}

export function makeRandom(seed: number): RandomSource {
  let state = seed >>> 0;
  const uniform = (): number => {
    state = (state + 0x6d2b79f5) >>> 0;
    let t = state;
    t = Math.imul(t ^ (t >>> 15), t | 1);
    t ^= t + Math.imul(t ^ (t >>> 7), t | 61);
    return ((t ^ (t >>> 14)) >>> 0) / 4294967296;
  };
  let spare: number | null = null;
  const normal = (): number => {
    if (spare !== null) {
      const value = spare;
      spare = null;
      return value;
    }
    let u = 0;
    while (u === 0) u = uniform();
    const v = uniform();
    const radius = Math.sqrt(-2 * Math.log(u));
    spare = radius * Math.sin(2 * Math.PI * v);
    return radius * Math.cos(2 * Math.PI * v);
  };
  return { uniform, normal };
}
