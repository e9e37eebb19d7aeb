import type { PidGains } from '../controller/types.js';
import type { FullLoop } from './full-loop.js';

/**
 * Records passed between the tuning rules and their callers. Plain, readonly, JSON-able.
 * Sign convention: the plant gain keeps its sign (ISO 8855 axes); a negative plant gain
 * gives negative controller gains (docs/domain.md §5b).
 */

/** The plant classes tuning rules are written for (Skogestad 2003 uses the same split). */
export type PlantClass = 'self-regulating' | 'second-order' | 'integrating' | 'double-integrating';

/** Which terms the controller has. */
export type ControllerType = 'P' | 'PI' | 'PID';

/**
 * The low-order model a rule is applied to:
 *   G(s) = gain · (leadTimeConstant_s·s + 1) · e^(−deadTime_s·s) / (s^integrators · Π (lags_s[i]·s + 1))
 * Units of `gain`: self-regulating (rad/s)/rad = 1/s for a yaw-rate loop; integrating k' (rad/s)/rad
 * for a heading loop; double-integrating k'' (m/s²)/rad for a path loop. Lags sorted longest first.
 * `plantClass` follows from the integrator count and the number of lags (see `plantClassOf`).
 */
export interface DesignModel {
  readonly integrators: 0 | 1 | 2;
  readonly gain: number;
  readonly lags_s: readonly number[];
  readonly deadTime_s: number;
  /**
   * Numerator lead T0, s (absent = 0): the path loop's low-frequency zero, T0 = (G_vy(0)/G_r(0) + d)/vx
   * (d/vx for lumped models; may be negative at speed, an RHP zero). Only damping-target
   * places poles with it; the other rules neglect it and say so in a warning.
   */
  readonly leadTimeConstant_s?: number;
}

/** The controller as the rule writes it down, before conversion to the parallel gains firmware runs. */
export interface RuleForm {
  readonly form: 'parallel' | 'ideal' | 'series';
  /** Ideal/series: Kc; parallel: kp. */
  readonly gain: number;
  /** Ideal Ti or series τI, s; null when there is no integral action. Parallel: the equivalent Ti = kp/ki (0 for integral-only). */
  readonly integralTime_s: number | null;
  /** Ideal Td or series τD, s; 0 when there is no derivative action. Parallel: the equivalent Td = kd/kp. */
  readonly derivativeTime_s: number;
}

/** What every rule returns: gains, the form it was derived in, and the quantities a reviewer needs to follow it. */
export interface RuleResult {
  readonly rule: RuleName;
  readonly citation: string;
  readonly controllerType: ControllerType;
  /** Parallel gains u = kp·e + ki·∫e + kd·ė. */
  readonly gains: PidGains;
  readonly ruleForm: RuleForm;
  /** The design model the formulas were applied to (after any half-rule reduction). */
  readonly designModel: DesignModel;
  /** Intermediate quantities with units in their names (a, L_s, ultimateGain, tauC_s, ...). */
  readonly intermediate: Readonly<Record<string, number>>;
  /** Advice the user should read (a parameter outside the rule's advised range...). */
  readonly warnings: readonly string[];
}

/** The name of a published tuning rule speedband applies. */
export type RuleName = 'ziegler-nichols-step' | 'ziegler-nichols-ultimate' | 'imc-pid' | 'simc' | 'damping-target' | 'amigo' | 'migo';

/** Every rule parameter, all optional; each rule takes the value of TUNING_DEFAULTS for one not given. */
export interface RuleParameters {
  /** Ziegler–Nichols controller rows: P, PI or PID. */
  readonly controllerType?: ControllerType;
  /** IMC λ, s. Default λ = imcLambdaPerDeadTime·θ. */
  readonly closedLoopTimeConstant_s?: number;
  /** SIMC τc, s. Default τc = simcTauCPerDeadTime·θ (τc = θ). */
  readonly simcClosedLoopTimeConstant_s?: number;
  /** Damping-target ζ. */
  readonly dampingRatio?: number;
  /** Damping-target ωn, rad/s (takes precedence over the settling distance). */
  readonly naturalFrequency_radps?: number;
  /** Damping-target settling distance D, m: ωn = 4·vx/(ζ·D). */
  readonly settlingDistance_m?: number;
  /** Damping-target ratio ωn/p of natural frequency to the integral pole. */
  readonly integralPoleRatio?: number;
  /** MIGO: the bound M on both sensitivity peaks, Ms ≤ M and Mt ≤ M (default 1.4, Åström & Hägglund's usual robustness). */
  readonly sensitivityPeakTarget?: number;
  /** MIGO: optionally also keep the phase margin at least this, degrees (the fastest-passing search sets the plan's limit). */
  readonly phaseMarginTarget_deg?: number;
}

export type RuleParameterName = keyof RuleParameters;

/** Context some rules need beyond the model. */
export interface RuleContext {
  /** Forward speed, m/s (damping-target settling distance). */
  readonly speed_mps: number;
  /** The loop as the firmware runs it (MIGO optimises on it; tuneOperatingPoint always gives it). */
  readonly fullLoop?: FullLoop;
  /** Gains a numerical rule (MIGO) searches around first, e.g. its optimum for a nearby parameter value. */
  readonly startGains?: PidGains;
}

/** A tuning rule: where it applies and how it computes. */
export interface TuningRule {
  readonly name: RuleName;
  readonly title: string;
  readonly citation: string;
  readonly plantClasses: readonly PlantClass[];
  /** The parameters the rule reads (all optional); any other is refused (`tuning.parameterNotTaken`), never ignored. */
  readonly parameters: readonly RuleParameterName[];
  /**
   * Compute the gains. Throws SpeedbandError `tuning.ruleNotApplicable` when the model is outside
   * the rule's plant classes or the rule cannot produce justified numbers for it.
   */
  readonly tune: (model: DesignModel, parameters: RuleParameters, context: RuleContext) => RuleResult;
}
