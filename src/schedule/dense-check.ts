/**
 * The dense ("frozen speed") check, docs/domain.md §5: at each grid speed, the scheduled gains
 * against the loop at that speed, judged on the stability verdict and every acceptance limit.
 * The loop analysis is a function argument, so the check runs on any model (single-track,
 * interpolated lumped models) and on constructed test loops.
 */
import { atSpeed, type OverSpeed } from '../core/by-speed.js';
import type { PidGains } from '../controller/types.js';
import type { LoopMargins } from '../verify/types.js';
import type {
  AcceptanceThresholds,
  AnalyseLoop,
  CheckFailure,
  CheckPoint,
  DenseCheckResult,
  GainsAtSpeed,
  ProgressCallback,
  WorstMargins,
  WorstValue,
} from './types.js';

/** Common-practice acceptance limits (docs/domain.md §5): GM ≥ 6 dB both ways, PM ≥ 45°, Ms ≤ 2, Mt ≤ 2 (see PLAN_DEFAULTS); delay margin set by the plan. */
export const THRESHOLD_DEFAULTS: AcceptanceThresholds = {
  maximumLowerGainMargin_dB: -6,
  minimumUpperGainMargin_dB: 6,
  minimumPhaseMargin_deg: 45,
  maximumSensitivityPeak: 2,
  maximumComplementarySensitivityPeak: 2,
  minimumDelayMargin_s: 0,
};

const format = (value: number): string => String(Number(value.toPrecision(4)));

/**
 * Every acceptance limit the margins break. A missing margin (null) means no such crossing:
 * no lower gain margin (not conditionally stable), no upper gain margin or delay margin
 * (unbounded) — none of those fail. An unstable or marginal verdict always fails, alone: the margins do
 * not apply to a loop that is not stable.
 */
export function judgeMargins(margins: LoopMargins, thresholds: AcceptanceThresholds): CheckFailure[] {
  const failures: CheckFailure[] = [];
  if (!margins.stable || margins.verdict !== 'stable') {
    // Margins are distances to instability: on a loop that is not stable they do not apply, and only this fails.
    return [
      {
        criterion: 'stability',
        value: null,
        limit: null,
        message:
          margins.verdict === 'marginal'
            ? `closed loop marginal: ${margins.analysis?.verdictNote ?? 'a closed-loop pole on the stability boundary'}`
            : 'closed loop unstable',
      },
    ];
  }
  const lower = margins.lowerGainMargin_dB;
  if (lower !== null && lower > thresholds.maximumLowerGainMargin_dB) {
    failures.push({
      criterion: 'lowerGainMargin',
      value: lower,
      limit: thresholds.maximumLowerGainMargin_dB,
      message: `lower gain margin ${format(lower)} dB, needs ≤ ${format(thresholds.maximumLowerGainMargin_dB)} dB`,
    });
  }
  const upper = margins.upperGainMargin_dB;
  if (upper !== null && upper < thresholds.minimumUpperGainMargin_dB) {
    failures.push({
      criterion: 'upperGainMargin',
      value: upper,
      limit: thresholds.minimumUpperGainMargin_dB,
      message: `upper gain margin ${format(upper)} dB, needs ≥ ${format(thresholds.minimumUpperGainMargin_dB)} dB`,
    });
  }
  const phase = margins.phaseMargin_deg;
  if (phase !== null && phase < thresholds.minimumPhaseMargin_deg) {
    failures.push({
      criterion: 'phaseMargin',
      value: phase,
      limit: thresholds.minimumPhaseMargin_deg,
      message: `phase margin ${format(phase)}°, needs ≥ ${format(thresholds.minimumPhaseMargin_deg)}°`,
    });
  }
  const delay = margins.delayMargin_s;
  if (delay !== null && delay < thresholds.minimumDelayMargin_s) {
    failures.push({
      criterion: 'delayMargin',
      value: delay,
      limit: thresholds.minimumDelayMargin_s,
      message: `delay margin ${format(delay)} s, needs ≥ ${format(thresholds.minimumDelayMargin_s)} s`,
    });
  }
  const peak = margins.sensitivityPeak;
  if (!(peak <= thresholds.maximumSensitivityPeak)) {
    failures.push({
      criterion: 'sensitivityPeak',
      value: Number.isFinite(peak) ? peak : null,
      limit: thresholds.maximumSensitivityPeak,
      message: `peak sensitivity ${format(peak)}, needs ≤ ${format(thresholds.maximumSensitivityPeak)}`,
    });
  }
  const complementary = margins.complementarySensitivityPeak;
  if (!(complementary <= thresholds.maximumComplementarySensitivityPeak)) {
    failures.push({
      criterion: 'complementarySensitivityPeak',
      value: Number.isFinite(complementary) ? complementary : null,
      limit: thresholds.maximumComplementarySensitivityPeak,
      message: `peak complementary sensitivity ${format(complementary)}, needs ≤ ${format(thresholds.maximumComplementarySensitivityPeak)}`,
    });
  }
  return failures;
}

type Worse = (candidate: number, current: number) => boolean;

function track(current: WorstValue | null, value: number | null, speed_mps: number, worse: Worse): WorstValue | null {
  if (value === null || Number.isNaN(value)) return current;
  if (current === null || worse(value, current.value)) return { value, speed_mps };
  return current;
}

/** One failing speed, as every JSON output of speedband writes it (and the schedule file's check.failures). */
export interface FailingSpeed {
  readonly speed_mps: number;
  readonly messages: readonly string[];
}

/** The failing speeds of a check, in speed order as checked, at most `limit` of them. */
export function failingSpeeds(points: readonly { readonly speed_mps: number; readonly failures: readonly CheckFailure[] }[], limit = Infinity): FailingSpeed[] {
  return points
    .filter((point) => point.failures.length > 0)
    .slice(0, limit)
    .map((point) => ({ speed_mps: point.speed_mps, messages: point.failures.map((failure) => failure.message) }));
}

/** Worst figures over checked points: largest lower gain margin, smallest upper gain margin, phase and delay margins, largest Ms and Mt. First speed wins ties. */
export function worstMargins(points: readonly { readonly speed_mps: number; readonly margins: LoopMargins }[]): WorstMargins {
  let lower: WorstValue | null = null;
  let upper: WorstValue | null = null;
  let phase: WorstValue | null = null;
  let delay: WorstValue | null = null;
  let peak: WorstValue | null = null;
  let complementary: WorstValue | null = null;
  const larger: Worse = (a, b) => a > b;
  const smaller: Worse = (a, b) => a < b;
  for (const { speed_mps, margins } of points) {
    lower = track(lower, margins.lowerGainMargin_dB, speed_mps, larger);
    upper = track(upper, margins.upperGainMargin_dB, speed_mps, smaller);
    phase = track(phase, margins.phaseMargin_deg, speed_mps, smaller);
    delay = track(delay, margins.delayMargin_s, speed_mps, smaller);
    peak = track(peak, margins.sensitivityPeak, speed_mps, larger);
    complementary = track(complementary, margins.complementarySensitivityPeak, speed_mps, larger);
  }
  return {
    lowerGainMargin_dB: lower,
    upperGainMargin_dB: upper,
    phaseMargin_deg: phase,
    delayMargin_s: delay,
    sensitivityPeak: peak,
    complementarySensitivityPeak: complementary,
  };
}

export interface DenseCheckInput {
  /** Check speeds, m/s (from checkGrid). */
  readonly grid: ArrayLike<number>;
  readonly gainsAt: GainsAtSpeed;
  readonly analyse: AnalyseLoop;
  /** The limits, numbers or tables over speed (src/schedule/acceptance-limits.ts), read at each speed. */
  readonly thresholds: OverSpeed<AcceptanceThresholds>;
  readonly onProgress?: ProgressCallback;
}

/**
 * Run the dense check: for each grid speed v, gains g = gainsAt(v), margins = analyse(v, g),
 * failures = judgeMargins(margins, thresholds). Passed when no speed fails. Points keep grid order.
 * Progress is reported about every 5 % of the grid.
 */
export function denseCheck(input: DenseCheckInput): DenseCheckResult {
  const { grid, gainsAt, analyse, thresholds, onProgress } = input;
  const points: CheckPoint[] = [];
  const total = grid.length;
  const every = Math.max(1, Math.floor(total / 20));
  let failedCount = 0;
  for (let i = 0; i < total; i += 1) {
    const speed_mps = grid[i];
    const gains: PidGains = gainsAt(speed_mps);
    const margins = analyse(speed_mps, gains);
    const failures = judgeMargins(margins, atSpeed(thresholds, speed_mps));
    if (failures.length > 0) failedCount += 1;
    points.push({ speed_mps, gains, margins, failures });
    if (onProgress !== undefined && ((i + 1) % every === 0 || i + 1 === total)) onProgress({ stage: 'check', done: i + 1, total });
  }
  return { passed: failedCount === 0, points, failedCount, worst: worstMargins(points) };
}
