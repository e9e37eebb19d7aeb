/** Settings of the loop analysis (src/verify/), in one place. */
/** Every tolerance and grid setting of analyseOpenLoop. */
export const ANALYSIS_DEFAULTS = {
  grid: {
    pointsPerDecade: 30,
    cornerFactor: 100,
    maximumPhaseStep_rad: 0.35,
    detailMagnitude: 0.2,
    maximumPoints: 20_000,
  },
  /** A root with |Re| ≤ this × max(1 rad/s, largest root magnitude) is on the imaginary axis. */
  axisRelativeTolerance: 1e-9,
  /** Crossing frequencies are refined to this relative width. */
  frequencyRelativeTolerance: 1e-12,
  /** Sensitivity peaks are refined to this width in ln ω. */
  peakLogFrequencyTolerance: 1e-6,
  /** |L| within this of 1 at a crossing of the negative real axis: the loop passes through −1. */
  crossingMagnitudeTolerance: 1e-9,
  /** Negative-real-axis crossings with a grid estimate of |L| ≥ this are refined, plus the `refineLargestBelow` largest others. */
  refineAbove: 0.5,
  refineLargestBelow: 3,
  /** The Padé band ends at the highest frequency where |L| ≥ this (only there can a pole cross the axis). */
  padeBandMagnitude: 0.5,
  /** A closed-loop pole with |Re| ≤ this × largest pole magnitude is on the axis. */
  poleRelativeTolerance: 1e-9,
  /** |L(j∞)| ≥ 1 − this with a delay makes a neutral-type loop. */
  neutralTolerance: 1e-9,
  /** Sampled-data loop: stable needs every closed-loop eigenvalue |z| < 1 − this; within this of 1 is marginal (not stable). */
  sampledPoleRadiusTolerance: 1e-8,
  /** Nyquist count of a sampled loop on its pulse frequency response (sampled-nyquist.ts). */
  sampledNyquist: {
    /** ϑ (rad) where the arc starts when there are poles at z = 1: the detour radius. */
    detourAngle_rad: 1e-8,
    /** Initial grid: uniform points over (0, π], plus log-spaced points per decade towards the detour. */
    uniformPoints: 32,
    logPointsPerDecade: 2,
    /** Refine a step that turns 1 + L by more than this, or L by more than `maximumLoopTurn_rad`. */
    maximumTurn_rad: 0.25,
    maximumLoopTurn_rad: 0.5,
    maximumDepth: 40,
    /** |1 + L| below this × max(1, |L|) on the path: the loop passes through −1. */
    marginalTolerance: 1e-9,
    /** A controller pole within this of z = 1 is an integrator; within this of |z| = 1 elsewhere: on the circle. */
    circleTolerance: 1e-9,
  },
} as const;
