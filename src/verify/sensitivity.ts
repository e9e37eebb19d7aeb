/**
 * Peaks of the sensitivity S = 1/(1 + L) and the complementary sensitivity
 * T = L/(1 + L) over frequency (Åström & Hägglund: Ms in 1.4–2.0 is the usual robust
 * range). The grid maximum is refined by golden-section search in log ω between its
 * neighbours, to `logFrequencyTolerance` in ln ω.
 */
import type { LoopGrid } from './frequency-grid.js';
import { evaluateLoopResponse, newLoopPoint, type CompiledLoopResponse } from './loop-response.js';
import { goldenSectionMaximum } from './root-search.js';

export interface Peak {
  readonly value: number;
  readonly frequency_radps: number;
}

/** max over ω of |S(jω)| and |T(jω)| (dimensionless) with their frequencies (rad/s). */
export function sensitivityPeaks(
  loop: CompiledLoopResponse,
  grid: LoopGrid,
  logFrequencyTolerance: number,
): { readonly sensitivity: Peak; readonly complementary: Peak } {
  const { frequency_radps: w, real, imaginary, magnitude } = grid;
  let bestS = -1;
  let bestT = -1;
  let indexS = 0;
  let indexT = 0;
  for (let i = 0; i < w.length; i++) {
    const re = 1 + real[i];
    const distance = Math.sqrt(re * re + imaginary[i] * imaginary[i]);
    const s = 1 / distance;
    const t = magnitude[i] / distance;
    if (s > bestS) {
      bestS = s;
      indexS = i;
    }
    if (t > bestT) {
      bestT = t;
      indexT = i;
    }
  }
  const point = newLoopPoint();
  const sAt = (logW: number): number => {
    evaluateLoopResponse(loop, Math.exp(logW), point);
    const re = 1 + point.re;
    return 1 / Math.sqrt(re * re + point.im * point.im);
  };
  const tAt = (logW: number): number => {
    evaluateLoopResponse(loop, Math.exp(logW), point);
    const re = 1 + point.re;
    return point.magnitude / Math.sqrt(re * re + point.im * point.im);
  };
  const refine = (index: number, best: number, g: (logW: number) => number): Peak => {
    if (index === 0 || index === w.length - 1 || !Number.isFinite(best)) return { value: best, frequency_radps: w[index] };
    const found = goldenSectionMaximum(g, Math.log(w[index - 1]), Math.log(w[index + 1]), logFrequencyTolerance);
    return found.value >= best ? { value: found.value, frequency_radps: Math.exp(found.argument) } : { value: best, frequency_radps: w[index] };
  };
  return { sensitivity: refine(indexS, bestS, sAt), complementary: refine(indexT, bestT, tAt) };
}
