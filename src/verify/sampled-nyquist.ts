/**
 * Nyquist criterion for a sampled loop, on the exact pulse frequency response
 * L(e^(jϑ)) = C(e^(jϑ))·G(e^(jϑ)), ϑ = ω·Ts in [0, π], with
 * G(z) = [C·(zI − Φ)⁻¹·(Γ0·z + Γ1) + D]·z^(−(ℓ+1)) evaluated by a complex solve (no
 * characteristic polynomial). Argument principle on the unit circle (Franklin, Powell &
 * Workman, Digital Control of Dynamic Systems, 3rd ed., §7.4; Åström & Wittenmark,
 * Computer-Controlled Systems, §3.3): Z = P + N, where Z counts closed-loop poles outside
 * the unit circle, P open-loop poles outside, N clockwise encirclements of −1 as z goes
 * once round the circle counter-clockwise. Poles at z = 1 (plant integrators, the PID's
 * integrator), k of them, are passed on a small outward detour: they count as inside, and
 * the detour turns 1 + L by −k·π at infinite radius. By conjugate symmetry the turn of
 * 1 + L over the whole circle is twice its turn over ϑ ∈ (0, π]. The turn is accumulated
 * on a grid refined until each step turns 1 + L by ≤ 0.25 rad and L by ≤ 0.5 rad.
 */
import type { Complex } from '../lti/types.js';
import { ANALYSIS_DEFAULTS } from './defaults.js';
import { controllerInDelays, type SampledPlant } from './sampled-plant.js';
import { analysisRoots } from './small-roots.js';
import type { PlantPoles } from './pole-counts.js';
import { compilePulseResponse, evaluatePulse, newPulsePoint, type PulseResponse } from './pulse-response.js';
import { pulseTransferFunction } from './pulse-transfer-function.js';
import { SpeedbandError } from '../core/errors.js';

export type { PlantPoleCounts, PlantPoles } from './pole-counts.js';

export interface SampledNyquistResult {
  readonly verdict: 'stable' | 'unstable' | 'marginal' | 'undetermined';
  /** Z: closed-loop poles outside the unit circle; null when not counted. */
  readonly closedLoopOutsidePoles: number | null;
  readonly reason: string | null;
  /** P: open-loop poles outside the unit circle (plant and controller). */
  readonly openLoopOutsidePoles: number;
  /** Open-loop poles at z = 1 (plant integrators and the controller's integrator). */
  readonly openLoopUnitPoles: number;
}

const SETTINGS = ANALYSIS_DEFAULTS.sampledNyquist;

/**
 * L(e^(jϑ)) = C(e^(jϑ))·[C·(e^(jϑ)I − Φ)⁻¹·(Γ0·e^(jϑ) + Γ1) + D]·e^(−jϑ(ℓ+1)) of the sampled loop, as a
 * function of ϑ = ω·Ts (rad), by a complex solve (no polynomial); C(z) = Σ bᵢz⁻ⁱ / Σ aᵢz⁻ⁱ as
 * `controllerInDelays` gives it. Dimensionless; negative-feedback convention (closed loop 1 + L = 0).
 */
export function sampledLoopEvaluator(plant: SampledPlant, b: readonly number[], a: readonly number[]): (angle: number) => Complex {
  const n = plant.inputGainCurrent.length;
  const re = new Float64Array(n * (n + 1));
  const im = new Float64Array(n * (n + 1));
  const width = n + 1;
  const delay = plant.wholeSampleDelay + 1;
  // The plant's matrices as flat typed arrays, read at every evaluation.
  const transition = Float64Array.from(plant.transition.flat());
  const gainCurrent = Float64Array.from(plant.inputGainCurrent);
  const gainPrevious = Float64Array.from(plant.inputGainPrevious);
  const output = Float64Array.from(plant.outputVector);
  return (angle: number): Complex => {
    const zr = Math.cos(angle);
    const zi = Math.sin(angle);
    // Augmented [zI − Φ | Γ0·z + Γ1], complex Gaussian elimination with partial pivoting.
    for (let i = 0; i < n; i++) {
      for (let j = 0; j < n; j++) {
        re[i * width + j] = (i === j ? zr : 0) - transition[i * n + j];
        im[i * width + j] = i === j ? zi : 0;
      }
      re[i * width + n] = gainCurrent[i] * zr + gainPrevious[i];
      im[i * width + n] = gainCurrent[i] * zi;
    }
    for (let col = 0; col < n; col++) {
      let pivot = col;
      let best = -1;
      for (let r = col; r < n; r++) {
        const size = re[r * width + col] * re[r * width + col] + im[r * width + col] * im[r * width + col];
        if (size > best) {
          best = size;
          pivot = r;
        }
      }
      if (pivot !== col) {
        for (let j = col; j <= n; j++) {
          const tr = re[col * width + j];
          re[col * width + j] = re[pivot * width + j];
          re[pivot * width + j] = tr;
          const ti = im[col * width + j];
          im[col * width + j] = im[pivot * width + j];
          im[pivot * width + j] = ti;
        }
      }
      const pr = re[col * width + col];
      const pi = im[col * width + col];
      const pd = pr * pr + pi * pi;
      for (let r = col + 1; r < n; r++) {
        const xr = re[r * width + col];
        const xi = im[r * width + col];
        const fr = (xr * pr + xi * pi) / pd;
        const fi = (xi * pr - xr * pi) / pd;
        for (let j = col; j <= n; j++) {
          const yr = re[col * width + j];
          const yi = im[col * width + j];
          re[r * width + j] -= fr * yr - fi * yi;
          im[r * width + j] -= fr * yi + fi * yr;
        }
      }
    }
    // Back substitution into the last column, then C·x + D.
    let gr = plant.feedthrough;
    let gi = 0;
    for (let r = n - 1; r >= 0; r--) {
      let sr = re[r * width + n];
      let si = im[r * width + n];
      for (let j = r + 1; j < n; j++) {
        const xr = re[j * width + n];
        const xi = im[j * width + n];
        sr -= re[r * width + j] * xr - im[r * width + j] * xi;
        si -= re[r * width + j] * xi + im[r * width + j] * xr;
      }
      const pr = re[r * width + r];
      const pi = im[r * width + r];
      const pd = pr * pr + pi * pi;
      const xr = (sr * pr + si * pi) / pd;
      const xi = (si * pr - sr * pi) / pd;
      re[r * width + n] = xr;
      im[r * width + n] = xi;
      gr += output[r] * xr;
      gi += output[r] * xi;
    }
    // z^(−(ℓ+1)) and C(z) = Σ b_i z^(−i) / Σ a_i z^(−i).
    const dr = Math.cos(delay * angle);
    const di = -Math.sin(delay * angle);
    // Powers of z⁻¹ = cos ϑ − j·sin ϑ by repeated multiplication.
    let nr = 0,
      ni = 0,
      er = 0,
      ei = 0;
    let pr = 1,
      pi = 0;
    for (let i = 0; i < b.length; i++) {
      nr += b[i] * pr;
      ni += b[i] * pi;
      er += a[i] * pr;
      ei += a[i] * pi;
      const next = pr * zr + pi * zi;
      pi = pi * zr - pr * zi;
      pr = next;
    }
    const ed = er * er + ei * ei;
    const cr = (nr * er + ni * ei) / ed;
    const ci = (ni * er - nr * ei) / ed;
    const hr = gr * dr - gi * di;
    const hi = gr * di + gi * dr;
    return { re: cr * hr - ci * hi, im: cr * hi + ci * hr };
  };
}

/**
 * Z = P + N for the sampled loop of `plant` (from `sampledPlant`) under C(z) (coefficients in
 * powers of z, highest first), with the continuous plant's poles (`plantPoles`: origin poles map to
 * z = 1, right-half-plane poles outside the circle, other axis poles onto it — not handled:
 * 'undetermined'), with `options.extraWholeSamples` whole samples of delay added (z^(−k), exact);
 * `options.pulseNumerator` is B(z) when already built (`pulseTransferFunction(plant).numerator`).
 * 'marginal' when 1 + L passes through 0 on the path. The loop is evaluated by `evaluatePulse`
 * (pulse-response.ts: B(z) by Horner's rule, A(z) in product form over its roots).
 */
export function sampledNyquistCount(
  plant: SampledPlant,
  controller: { readonly numerator: readonly number[]; readonly denominator: readonly number[] },
  plantPoles: PlantPoles,
  options: { readonly extraWholeSamples?: number; readonly pulseNumerator?: readonly number[] } = {},
): SampledNyquistResult {
  const extraWholeSamples = options.extraWholeSamples ?? 0;
  const counted = openLoopPoleCount(controller, plantPoles);
  const { unitPoles, outside } = counted;
  const undetermined = (reason: string): SampledNyquistResult => ({
    verdict: 'undetermined',
    closedLoopOutsidePoles: null,
    reason,
    openLoopOutsidePoles: outside,
    openLoopUnitPoles: unitPoles,
  });
  if (counted.unhandled !== null) return undetermined(counted.unhandled);
  const response = compilePulseResponse({
    pulseNumerator: options.pulseNumerator ?? pulseTransferFunction(plant).numerator,
    continuousPoles: plantPoles.poles,
    sampleTime_s: plant.sampleTime_s,
    controller,
    wholeSampleDelay: plant.wholeSampleDelay,
  });
  const { turn, marginal } = turnOfReturnDifference(response, initialAngleGrid(unitPoles), extraWholeSamples, plant);
  if (marginal)
    return {
      verdict: 'marginal',
      closedLoopOutsidePoles: null,
      reason: 'the loop passes through −1 (marginal)',
      openLoopOutsidePoles: outside,
      openLoopUnitPoles: unitPoles,
    };
  const windings = (2 * turn - unitPoles * Math.PI) / (2 * Math.PI);
  const rounded = Math.round(windings);
  if (Math.abs(windings - rounded) > 0.05) return undetermined(`the encirclement count is not a whole number (${windings.toFixed(3)})`);
  const z = outside - rounded;
  if (z < 0) return undetermined(`inconsistent count Z = ${z}`);
  return { verdict: z === 0 ? 'stable' : 'unstable', closedLoopOutsidePoles: z, reason: null, openLoopOutsidePoles: outside, openLoopUnitPoles: unitPoles };
}

/**
 * Open-loop poles of plant and controller at z = 1 and outside the unit circle (the plant's from its continuous
 * poles, the controller's from the roots of its denominator); `unhandled` says why the count cannot be made (a pole
 * on the circle away from z = 1), else null.
 */
function openLoopPoleCount(
  controller: { readonly numerator: readonly number[]; readonly denominator: readonly number[] },
  plantPoles: PlantPoles,
): { unitPoles: number; outside: number; unhandled: string | null } {
  let unitPoles = plantPoles.originPoles;
  let outside = plantPoles.rightHalfPlanePoles;
  if (plantPoles.otherAxisPoles > 0) return { unitPoles, outside, unhandled: 'open-loop poles on the unit circle away from z = 1' };
  const { a } = controllerInDelays(controller);
  for (const root of analysisRoots(a)) {
    const size = Math.hypot(root.re, root.im);
    if (Math.hypot(root.re - 1, root.im) <= SETTINGS.circleTolerance) unitPoles++;
    else if (Math.abs(size - 1) <= SETTINGS.circleTolerance) return { unitPoles, outside, unhandled: 'a controller pole on the unit circle away from z = 1' };
    else if (size > 1) outside++;
  }
  return { unitPoles, outside, unhandled: null };
}

/** The initial grid of angles ϑ over (0, π]: uniform, plus log-spaced points down to the detour when there are poles at z = 1. */
function initialAngleGrid(unitPoles: number): number[] {
  const start = unitPoles > 0 ? SETTINGS.detourAngle_rad : 0;
  const grid: number[] = [start];
  if (unitPoles > 0) {
    const first = Math.PI / SETTINGS.uniformPoints;
    const decades = Math.log10(first / start);
    const count = Math.ceil(decades * SETTINGS.logPointsPerDecade);
    for (let i = 1; i < count; i++) grid.push(start * Math.pow(10, (decades * i) / count));
  }
  for (let i = 1; i <= SETTINGS.uniformPoints; i++) grid.push((Math.PI * i) / SETTINGS.uniformPoints);
  return grid;
}

/** Angle turned from p to q (principal value), rad. */
function angleBetween(pRe: number, pIm: number, qRe: number, qIm: number): number {
  return Math.atan2(pRe * qIm - pIm * qRe, pRe * qRe + pIm * qIm);
}

/**
 * The turn of 1 + L(e^(jϑ)) over the grid (rad), each step refined by bisection until it turns 1 + L by at most
 * maximumTurn_rad and L by at most maximumLoopTurn_rad; `marginal` when 1 + L passed through 0 on the way.
 * The delay register turns L by (ℓ+1)·ϑ without changing |L|: where |L| stays small that turn cannot move
 * 1 + L round the origin, so the refinement follows L without it (the body) there, and L itself only where
 * |L| ≥ rotationMagnitude. The work then does not grow with the delay.
 */
function turnOfReturnDifference(
  response: PulseResponse,
  grid: readonly number[],
  extraWholeSamples: number,
  plant: SampledPlant,
): { turn: number; marginal: boolean } {
  let turn = 0;
  let marginal = false;
  let evaluations = grid.length;
  const marginal2 = SETTINGS.marginalTolerance * SETTINGS.marginalTolerance;
  const small2 = SETTINGS.rotationMagnitude * SETTINGS.rotationMagnitude;
  const delaySamples = response.delaySamples + extraWholeSamples;
  const point = newPulsePoint();
  // Values at the ends of the step being walked, kept on explicit stacks (no allocation per evaluation).
  const depthLimit = SETTINGS.maximumDepth + 2;
  const stackAngle = new Float64Array(depthLimit + 1);
  const stackRe = new Float64Array(depthLimit + 1);
  const stackIm = new Float64Array(depthLimit + 1);
  const stackBodyRe = new Float64Array(depthLimit + 1);
  const stackBodyIm = new Float64Array(depthLimit + 1);
  const evaluate = (angle: number): void => {
    evaluatePulse(response, angle, extraWholeSamples, point);
    // |1 + L| ≤ tolerance·max(1, |L|), compared squared.
    const l2 = point.re * point.re + point.im * point.im;
    if ((1 + point.re) * (1 + point.re) + point.im * point.im <= marginal2 * Math.max(1, l2)) marginal = true;
  };
  // Walk from (left) to (right): the left end is the point on top of the stack, the right end below it.
  evaluate(grid[0]);
  let leftAngle = grid[0];
  let leftRe = point.re;
  let leftIm = point.im;
  let leftBodyRe = point.bodyRe;
  let leftBodyIm = point.bodyIm;
  for (let i = 1; i < grid.length; i++) {
    evaluate(grid[i]);
    let top = 0;
    stackAngle[0] = grid[i];
    stackRe[0] = point.re;
    stackIm[0] = point.im;
    stackBodyRe[0] = point.bodyRe;
    stackBodyIm[0] = point.bodyIm;
    while (top >= 0) {
      const rightAngle = stackAngle[top];
      const rightRe = stackRe[top];
      const rightIm = stackIm[top];
      const step = angleBetween(1 + leftRe, leftIm, 1 + rightRe, rightIm);
      const rotation = delaySamples * (rightAngle - leftAngle);
      const bodyStep = angleBetween(leftBodyRe, leftBodyIm, stackBodyRe[top], stackBodyIm[top]);
      const large = Math.max(leftRe * leftRe + leftIm * leftIm, rightRe * rightRe + rightIm * rightIm) >= small2;
      const refine =
        Math.abs(step) > SETTINGS.maximumTurn_rad ||
        Math.abs(bodyStep) > SETTINGS.maximumLoopTurn_rad ||
        (large && (Math.abs(angleBetween(leftRe, leftIm, rightRe, rightIm)) > SETTINGS.maximumLoopTurn_rad || rotation > SETTINGS.maximumLoopTurn_rad));
      if (refine && top < depthLimit - 1 && top < SETTINGS.maximumDepth) {
        if (++evaluations > SETTINGS.maximumEvaluations) throw tooManyEvaluations(plant, evaluations);
        const middle = 0.5 * (leftAngle + rightAngle);
        evaluate(middle);
        top++;
        stackAngle[top] = middle;
        stackRe[top] = point.re;
        stackIm[top] = point.im;
        stackBodyRe[top] = point.bodyRe;
        stackBodyIm[top] = point.bodyIm;
        continue;
      }
      turn += step;
      leftAngle = rightAngle;
      leftRe = rightRe;
      leftIm = rightIm;
      leftBodyRe = stackBodyRe[top];
      leftBodyIm = stackBodyIm[top];
      top--;
    }
  }
  return { turn, marginal };
}

function tooManyEvaluations(plant: SampledPlant, evaluations: number): SpeedbandError {
  return new SpeedbandError(
    'verify.analysisTooLarge',
    `the Nyquist count of the sampled loop needed more than ${SETTINGS.maximumEvaluations} evaluations (its delay register is ${plant.wholeSampleDelay} samples long): the loop turns round −1 too often to count — check the delays (computationLatency_s, actuatorDelay_s) and the sample time`,
    { details: { wholeSampleDelay: plant.wholeSampleDelay, evaluations } },
  );
}
