/**
 * The delay margin of a stable loop: the smallest delay added in the loop that makes it unstable.
 *
 * Estimate from the gain crossovers: a delay d turns L(jω) clockwise by ω·d, so the crossover at ωᵢ
 * reaches −1 after its phase lag φᵢ = 180° + ∠L(jωᵢ) taken in (0°, 360°) (Åström & Murray, Feedback
 * Systems, 2008, §9.3): d̂ = min φᵢ/ωᵢ. That is exact for a continuous loop, and for whole samples of
 * delay added to a sampled loop (z^(−k) is a pure rotation of its pulse frequency response). A fraction
 * of a sample is not a pure rotation — the zero-order-hold equivalent changes shape, visibly once the
 * crossover lies above ≈ 0.1 rad per sample — and a pulse frequency response with |L| ≥ 1 at high
 * frequency can be destabilised by a single sample at no gain crossover at all.
 *
 * So the estimate is confirmed by the exact verdict of the loop with the delay added:
 * - at 0.999·d̂ (a sampled loop with a slow crossover, below 0.03 rad per sample, and d̂ past two samples: at the
 *   whole samples below it, where the added delay is exactly z^(−k) and the fraction left over acts at the
 *   crossover as the rotation it is in continuous time);
 * - for a sampled loop whose estimate is within two samples, whose gain in the upper half of the band
 *   reaches 0.5, or whose closed-loop poles at high frequency (|arg z| ≥ π/2) come within 0.1 of the unit
 *   circle: also at every eighth of a sample below two samples (the fraction of a sample moves the
 *   zero-order-hold equivalent's sampling zeros: a loop can be destabilised by 1.1 samples of delay and
 *   be stable again at 2, while its crossovers promise seconds);
 * - for a sampled loop whose crossover lies above 0.1 rad per sample: also just above, at 1.001·d̂, and
 *   when still stable there, upward by quarter samples (up to two) to the first unstable delay.
 * The first delay found unstable is refined by bisection against the last one found stable, and the
 * stable end is reported: the figure never promises more than the loop tolerates (beyond the 0.1 %
 * between a confirmed estimate and itself).
 */
import { ANALYSIS_DEFAULTS } from './defaults.js';

export interface DelayMarginInput {
  /** Gain crossovers: frequency (rad/s) and the phase lag (rad, in (0, 2π]) that puts each on −1. */
  readonly crossovers: ReadonlyArray<{ readonly frequency_radps: number; readonly lag_rad: number }>;
  /** Sample time of a sampled loop, s; null for a continuous loop. */
  readonly sampleTime_s: number | null;
  /** Sampled loop: a fraction of a sample may matter below two samples (|L| ≥ 0.5 near the Nyquist frequency, or a closed-loop pole near the circle there). */
  readonly fractionSensitive: boolean;
  /** The exact verdict of the loop with `added_s` seconds of delay added: true when stable. */
  readonly stableWithAddedDelay: (added_s: number) => boolean;
}

export interface DelayMarginResult {
  readonly delayMargin_s: number | null;
  /** The crossover that sets it, rad/s (null when the exact verdict moved the estimate). */
  readonly frequency_radps: number | null;
  readonly note: string | null;
}

const SETTINGS = ANALYSIS_DEFAULTS.delayMargin;
const format = (value: number): string => String(Number(value.toPrecision(4)));

/** The confirmed delay margin of a stable loop; see the module comment. */
export function confirmedDelayMargin(input: DelayMarginInput): DelayMarginResult {
  let estimate = Infinity;
  let frequency: number | null = null;
  for (const c of input.crossovers) {
    const needed = c.lag_rad / c.frequency_radps;
    if (needed < estimate) {
      estimate = needed;
      frequency = c.frequency_radps;
    }
  }
  const ts = input.sampleTime_s;
  const stable = input.stableWithAddedDelay;
  const bisect = (low: number, high: number): number => {
    while (high - low > SETTINGS.bisectionRelativeTolerance * high) {
      const middle = 0.5 * (low + high);
      if (stable(middle)) low = middle;
      else high = middle;
    }
    return low;
  };
  const from = Number.isFinite(estimate) ? `the crossover estimate ${format(estimate)} s` : 'no gain crossover';

  // Below the estimate: eighths of a sample first (where a sample or two may matter), then just below it.
  const trials: number[] = [];
  const fastCrossover = ts !== null && frequency !== null && frequency * ts > SETTINGS.fastCrossoverAngle_rad;
  const early = ts !== null && (estimate < SETTINGS.earlySamples * ts || input.fractionSensitive);
  if (ts !== null && early) {
    const last = Math.min(estimate, SETTINGS.earlySamples * ts);
    for (let k = 1; (k * ts) / SETTINGS.earlyStepsPerSample < last; k++) trials.push((k * ts) / SETTINGS.earlyStepsPerSample);
  }
  if (Number.isFinite(estimate)) {
    // A sampled loop whose crossover is slow (below 0.03 rad per sample) and whose estimate is past the early samples is
    // confirmed at the whole samples below it: z^(−k) is an exact rotation of its pulse response, and the fraction of a
    // sample left over acts at the crossover as the rotation it is in continuous time (the hold's aliasing there is of
    // order (ωTs/π)² < 1e−4); where a fraction matters at high frequency the early trials above have looked.
    const near = estimate * SETTINGS.confirmAtFraction;
    const whole = ts === null ? 0 : Math.floor(near / ts);
    const slow = ts !== null && frequency !== null && frequency * ts <= SETTINGS.wholeSampleCrossoverAngle_rad;
    trials.push(slow && whole >= SETTINGS.earlySamples ? whole * (ts as number) : near);
  }
  let lastStable = 0;
  for (const trial of trials) {
    if (stable(trial)) {
      lastStable = trial;
      continue;
    }
    const found = bisect(lastStable, trial);
    return {
      delayMargin_s: found,
      frequency_radps: null,
      note: `the exact verdict finds the loop unstable with ${format(trial)} s added: shortened from ${from} by bisection to ${format(found)} s`,
    };
  }
  if (!Number.isFinite(estimate)) return { delayMargin_s: null, frequency_radps: null, note: null };
  const quarter = early
    ? ` and at every ${SETTINGS.earlyStepsPerSample === 8 ? 'eighth of a' : `1/${SETTINGS.earlyStepsPerSample}`} sample below ${format(Math.min(estimate, SETTINGS.earlySamples * (ts as number)))} s`
    : '';
  const confirmed = `confirmed by the exact verdict: stable with ${format(lastStable)} s added${quarter}`;

  // Above the estimate, where sampling bends the boundary (a crossover above ≈ 0.1 rad per sample).
  if (ts !== null && fastCrossover) {
    const above = estimate * (2 - SETTINGS.confirmAtFraction);
    if (stable(above)) {
      let low = above;
      for (let k = 1; k <= 4 * SETTINGS.earlySamples; k++) {
        const trial = above + (k * ts) / 4;
        if (stable(trial)) {
          low = trial;
          continue;
        }
        const found = bisect(low, trial);
        return {
          delayMargin_s: found,
          frequency_radps: null,
          note: `the exact verdict finds the loop still stable with ${format(above)} s added (sampling bends the boundary above ${from}): found by bisection at ${format(found)} s`,
        };
      }
      return {
        delayMargin_s: estimate,
        frequency_radps: frequency,
        note: `${confirmed}; still stable up to ${format(low)} s added — the estimate is kept as a lower figure`,
      };
    }
    return { delayMargin_s: estimate, frequency_radps: frequency, note: `${confirmed}, and unstable with ${format(above)} s added` };
  }
  return { delayMargin_s: estimate, frequency_radps: frequency, note: confirmed };
}
