import { decibelsToRatio } from '../core/units.js';
import type { LoopPlant } from '../loops/types.js';
import { evaluateTransferFunction } from '../lti/transfer-function.js';
import { analyseOpenLoop } from '../verify/analyse-open-loop.js';

/** The proportional gains that stabilise a loop plant: kp between lowest and highest (same sign as the plant). */
export interface ProportionalGainRange {
  /** Smallest stabilising |kp| times the plant's sign; 0 when any small gain is stable. */
  readonly lowestGain: number;
  /** Largest stabilising |kp| times the plant's sign; null when there is no upper limit. */
  readonly highestGain: number | null;
}

/** Decades scanned either side of 1/|G(jω)| at ω = 1 rad/s, and points per decade. */
const SCAN = { decades: 8, pointsPerDecade: 4 } as const;

/**
 * The range of P-only gains u = kp·e that give a stable loop with the exact delay, or null when no
 * proportional gain stabilises it (a path loop with zero preview: a double integrator with lag and
 * delay, docs/domain.md §3). Method: scan kp on a log grid around 1/|G(j·1)|, and from the first stable
 * gain read the range off its gain margins (a P loop stays stable while the gain changes by less
 * than its lower and upper gain margins, by the definition of the margins as the nearest gain
 * changes that change the encirclement count, src/verify). The sign follows the plant's
 * low-frequency sign (ISO 8855: a negative plant gain needs a negative kp).
 */
export function proportionalGainRange(loop: LoopPlant): ProportionalGainRange | null {
  const { numerator, denominator, delay_s } = loop.plant;
  const lowOrderSign = (p: readonly number[]): number => {
    for (let i = p.length - 1; i >= 0; i--) if (p[i] !== 0) return Math.sign(p[i]);
    return 0;
  };
  const sign = lowOrderSign(numerator) * lowOrderSign(denominator);
  if (sign === 0) return null;
  const reference = evaluateTransferFunction(loop.plant, 1);
  const referenceGain = 1 / Math.hypot(reference.re, reference.im);
  for (let k = -SCAN.decades * SCAN.pointsPerDecade; k <= SCAN.decades * SCAN.pointsPerDecade; k++) {
    const kp = sign * referenceGain * Math.pow(10, k / SCAN.pointsPerDecade);
    const margins = analyseOpenLoop({ numerator: numerator.map((c) => c * kp), denominator, delay_s });
    if (!margins.stable) continue;
    return {
      lowestGain: margins.lowerGainMargin_dB === null ? 0 : kp * decibelsToRatio(margins.lowerGainMargin_dB),
      highestGain: margins.upperGainMargin_dB === null ? null : kp * decibelsToRatio(margins.upperGainMargin_dB),
    };
  }
  return null;
}
