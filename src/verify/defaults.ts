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
  /**
   * Sampled-data loop: the closed-loop eigenvalues decide up to this closed-loop order (plant + delay register
   * + controller; QR costs ~10·N³ flops: ≈ 30 ms at 240); past it the argument principle decides.
   */
  sampledEigenvalueMaximumOrder: 240,
  /** Continuous loop: when the Padé pole test and the exact-delay count disagree, the pole test is repeated at this order. */
  padeRetryOrder: 12,
  /** Bounds on the work of one analysis (any input the schemas accept). */
  bounds: {
    /** Whole samples of delay a sampled loop may carry (the delay register's length). */
    maximumWholeSampleDelay: 100_000,
    /** Crossings of the negative real axis examined over the band (each wrap of the phase is one). */
    maximumPhaseWraps: 5_000,
  },
  /** Delay margin: the crossover estimate is confirmed by the exact verdict of the loop with the delay added (delay-margin.ts). */
  delayMargin: {
    /** The estimate is confirmed at this fraction of itself (just below the limit, where the loop must still be stable). */
    confirmAtFraction: 0.999,
    /** Sampled loops: also checked at `earlyStepsPerSample` points per sample up to this many samples (or the estimate). */
    earlySamples: 2,
    earlyStepsPerSample: 8,
    /** … when a closed-loop pole with |arg z| ≥ π/2 has at least this |z| (or |L| ≥ `upperBandMagnitude` in the upper half of the band). */
    highFrequencyPoleMagnitude: 0.9,
    upperBandMagnitude: 0.5,
    /** Relative width of the bisection that shortens an estimate the exact verdict refutes. */
    bisectionRelativeTolerance: 1e-4,
    /** A sampled crossover above this angle per sample (ω·Ts, rad) is also checked just above the estimate. */
    fastCrossoverAngle_rad: 0.1,
    /** A sampled crossover at or below this angle per sample is confirmed at whole samples (no new discretisation). */
    wholeSampleCrossoverAngle_rad: 0.03,
  },
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
    /** Where |L| stays below this at both ends of a step, the delay register's turn of L needs no refinement. */
    rotationMagnitude: 0.25,
    maximumDepth: 40,
    /** Bound on the evaluations of one count (past it: `verify.analysisTooLarge`). */
    maximumEvaluations: 200_000,
    /** |1 + L| below this × max(1, |L|) on the path: the loop passes through −1. */
    marginalTolerance: 1e-9,
    /** A controller pole within this of z = 1 is an integrator; within this of |z| = 1 elsewhere: on the circle. */
    circleTolerance: 1e-9,
  },
} as const;
