import { SpeedbandError } from '../core/errors.js';
import { TUNING_DEFAULTS } from './defaults.js';
import { reduceByHalfRule } from './half-rule.js';
import { ruleNotApplicable } from './not-applicable.js';
import { parameterRequired, requirePositive } from './parameter-required.js';
import type { DesignModel, RuleContext, RuleParameters, RuleResult, TuningRule } from './types.js';

const CITATION =
  "Pole placement on k''(T0·s + 1)/s² with a parallel PID: closed-loop characteristic polynomial proportional to (s² + 2ζωn s + ωn²)(s + p) (textbook pole placement, e.g. Åström & Murray, Feedback Systems, 2008, §10)";

/**
 * Damping-target placement on the design model k''/s² (delay and lags neglected in the design):
 *   Kd = (2ζωn + p)/k'',  Kp = (ωn² + 2ζωn·p)/k'',  Ki = ωn²·p/k'',  p = ωn/ratio,
 * so the delay-free closed loop has poles at −ζωn ± ωn√(ζ² − 1) and −p. With a preview lead
 * k''(T0 s + 1)/s² (T0 = d/vx) the same poles are placed exactly: with a2 = 2ζωn + p, a1 = ωn² + 2ζωn p,
 * a0 = ωn² p, q = a2 − T0 a1 + T0² a0 and c = 1/(1 − q T0): Kd = c·q/k'', Kp = c(a1 − T0 a0)/k'',
 * Ki = c·a0/k'' (T0 = 0 gives the formulas above). When the preview zero is slower than the target
 * the loop's high-frequency gain k''·kd·T0 = c − 1 grows without bound (and changes sign once
 * 1 − qT0 ≤ 0); at or above TUNING_DEFAULTS.maximumPreviewHighFrequencyGain the neglected lag and delay
 * would decide stability, so `tuning.targetNotReachable` says how far to lower ωn. The default ωn is
 * min(0.1/θ_eff, the ωn with c − 1 = defaultPreviewHighFrequencyGain). ωn (rad/s) is given, or
 * follows from a settling distance D (m) at speed vx: ts ≈ 4/(ζωn) = D/vx → ωn = 4·vx/(ζ·D), or
 * defaults (see below). θ_eff (s) is the model's delay plus its lags by the half rule; a
 * warning when ωn·θ_eff exceeds TUNING_DEFAULTS.maximumBandwidthDelayProduct (the design then asks
 * for more bandwidth than the actuator lag and delay allow). Double-integrating plants only.
 */
/** The desired polynomial (s² + 2ζωn s + ωn²)(s + p) and the lead factors of the placement. */
interface Placement {
  readonly a2: number;
  readonly a1: number;
  readonly a0: number;
  /** q = a2 − T0·a1 + T0²·a0. */
  readonly q: number;
  /** 1 − q·T0 = Π(1 − T0·ri) over the desired poles −ri; c = 1/(1 − qT0). */
  readonly leadFactor: number;
}

function placement(zeta: number, omega: number, ratio: number, lead: number): Placement {
  const p = omega / ratio;
  const a2 = 2 * zeta * omega + p;
  const a1 = omega * omega + 2 * zeta * omega * p;
  const a0 = omega * omega * p;
  const q = a2 - lead * a1 + lead * lead * a0;
  return { a2, a1, a0, q, leadFactor: 1 - q * lead };
}

/** High-frequency gain k''·kd·T0 = c − 1 of the delay-free design loop; Infinity when the target is not reachable. */
function highFrequencyGain(placed: Placement, lead: number): number {
  if (!(placed.leadFactor > 0) || !(placed.q > 0) || !(placed.a1 - lead * placed.a0 > 0)) return Number.POSITIVE_INFINITY;
  return Math.abs(1 / placed.leadFactor - 1);
}

/** Scan of the default ωn: from 10⁻³·upper up to upper, geometric, this many points. */
const DEFAULT_FREQUENCY_SCAN = 301;

/**
 * Largest ωn ≤ upper in the first interval from ωn → 0 where the design loop keeps |k''·kd·T0| ≤ limit
 * (a geometric scan upwards, stopping at the first failure: further intervals exist where the poles
 * are faster than the lead's zero and kd tends to 0 — degenerate, so not chosen by default).
 */
function frequencyForPreviewGain(search: {
  /** ζ of the placed poles. */
  readonly zeta: number;
  /** ωn over the third, real pole p (p = ωn/ratio), as `placement` takes it. */
  readonly ratio: number;
  /** T0, s. */
  readonly lead: number;
  /** The largest ωn considered, rad/s. */
  readonly upper: number;
  /** The bound on |k''·kd·T0|. */
  readonly limit: number;
}): number {
  const { zeta, ratio, lead, upper, limit } = search;
  let chosen = upper * 1e-3;
  for (let i = 0; i < DEFAULT_FREQUENCY_SCAN; i++) {
    const omega = upper * Math.pow(10, -3 + (3 * i) / (DEFAULT_FREQUENCY_SCAN - 1));
    if (!(highFrequencyGain(placement(zeta, omega, ratio, lead), lead) <= limit)) break;
    chosen = omega;
  }
  return chosen;
}

export function dampingTarget(model: DesignModel, parameters: RuleParameters, context: RuleContext): RuleResult {
  if (model.integrators === 1) return dampingTargetIntegrating(model, parameters, context);
  if (model.integrators !== 2) {
    throw ruleNotApplicable(
      'damping-target',
      model,
      "the placement formulas are written for the integrator k'/s of a heading loop and the double integrator k''/s² of a path loop",
    );
  }
  const reduced = reduceByHalfRule(model, 0).model;
  const effectiveDelay_s = reduced.deadTime_s;
  const lead = model.leadTimeConstant_s ?? 0;
  const zeta = requirePositive('damping-target', 'dampingRatio (ζ)', parameters.dampingRatio ?? TUNING_DEFAULTS.dampingRatio);
  const ratio = requirePositive('damping-target', 'integralPoleRatio (ωn/p)', parameters.integralPoleRatio ?? TUNING_DEFAULTS.integralPoleRatio);
  const given = givenNaturalFrequency(parameters, context, zeta);
  let omega: number;
  const extra: Record<string, number> = given?.extra ?? {};
  if (given !== null) {
    omega = given.omega_radps;
  } else {
    if (!(effectiveDelay_s > 0)) {
      throw parameterRequired('damping-target', 'a natural frequency ωn or a settling distance D', 'the model has no delay or lag to default ωn from');
    }
    omega = frequencyForPreviewGain({
      zeta,
      ratio,
      lead,
      upper: TUNING_DEFAULTS.defaultBandwidthDelayProduct / effectiveDelay_s,
      limit: TUNING_DEFAULTS.defaultPreviewHighFrequencyGain,
    });
  }
  const placed = placement(zeta, omega, ratio, lead);
  const previewGain = highFrequencyGain(placed, lead);
  if (!(previewGain < TUNING_DEFAULTS.maximumPreviewHighFrequencyGain)) {
    const limit = frequencyForPreviewGain({ zeta, ratio, lead, upper: omega, limit: TUNING_DEFAULTS.maximumPreviewHighFrequencyGain });
    throw new SpeedbandError(
      'tuning.targetNotReachable',
      `with the path loop's lead T0 = (vy/r + d)/vx = ${lead.toPrecision(3)} s the target ωn = ${omega.toPrecision(3)} rad/s needs a loop gain |k''·kd·T0| = ${Number.isFinite(previewGain) ? previewGain.toPrecision(3) : 'of the wrong sign'} at high frequency (expected below ${TUNING_DEFAULTS.maximumPreviewHighFrequencyGain}), so the lag and delay the design neglects would decide stability — lower ωn to at most ${limit.toPrecision(3)} rad/s (a longer settling distance) or shorten the preview`,
      { details: { leadTimeConstant_s: lead, naturalFrequency_radps: omega, highFrequencyGain: previewGain, maximumNaturalFrequency_radps: limit } },
    );
  }
  const k = reduced.gain;
  const c = 1 / placed.leadFactor;
  const gains = {
    kp: (c * (placed.a1 - lead * placed.a0)) / k,
    ki: (c * placed.a0) / k,
    kd: (c * placed.q) / k,
  };
  const product = omega * effectiveDelay_s;
  const warnings = bandwidthWarnings(product, effectiveDelay_s);
  return {
    rule: 'damping-target',
    citation: CITATION,
    controllerType: 'PID',
    gains,
    ruleForm: { form: 'parallel', gain: gains.kp, integralTime_s: gains.kp / gains.ki, derivativeTime_s: gains.kd / gains.kp },
    designModel: reduced,
    intermediate: {
      dampingRatio: zeta,
      naturalFrequency_radps: omega,
      integralPole_radps: omega / ratio,
      effectiveDeadTime_s: effectiveDelay_s,
      bandwidthDelayProduct: product,
      previewLead_s: lead,
      highFrequencyLoopGain: previewGain,
      ...extra,
    },
    warnings,
  };
}

const INTEGRATING_CITATION =
  "Pole placement on k'/s with a PI controller: closed-loop characteristic polynomial s² + k'·kp·s + k'·ki = s² + 2ζωn s + ωn² (textbook pole placement, e.g. Åström & Murray, Feedback Systems, 2008, §10; Åström & Hägglund, Advanced PID Control, 2006, §6.3)";

/**
 * Damping-target placement on the integrating design model k'/s of a heading loop (delay and lags
 * neglected in the design, the full-loop check decides): a PI controller gives the closed-loop
 * characteristic polynomial s² + k'·kp·s + k'·ki, placed at s² + 2ζωn s + ωn²:
 *   kp = 2ζωn/k',  ki = ωn²/k'.
 * ωn (rad/s) given, or from a settling distance D at speed vx (ωn = 4vx/(ζD)), or by default
 * ωn = defaultBandwidthDelayProduct/θ_eff (θ_eff: the delay plus the lags by the half rule).
 * The closed loop has the zero ki/kp = ωn/(2ζ) (overshoot to a reference step even at ζ = 1; the
 * set-point weight b of the schedule removes it).
 */
function dampingTargetIntegrating(model: DesignModel, parameters: RuleParameters, context: RuleContext): RuleResult {
  const reduced = reduceByHalfRule(model, 0).model;
  const effectiveDelay_s = reduced.deadTime_s;
  const zeta = requirePositive('damping-target', 'dampingRatio (ζ)', parameters.dampingRatio ?? TUNING_DEFAULTS.dampingRatio);
  const given = givenNaturalFrequency(parameters, context, zeta);
  let omega: number;
  const extra: Record<string, number> = given?.extra ?? {};
  if (given !== null) {
    omega = given.omega_radps;
  } else {
    if (!(effectiveDelay_s > 0)) {
      throw parameterRequired('damping-target', 'a natural frequency ωn or a settling distance D', 'the model has no delay or lag to default ωn from');
    }
    omega = TUNING_DEFAULTS.defaultBandwidthDelayProduct / effectiveDelay_s;
  }
  const k = reduced.gain;
  const gains = { kp: (2 * zeta * omega) / k, ki: (omega * omega) / k, kd: 0 };
  const product = omega * effectiveDelay_s;
  const warnings = bandwidthWarnings(product, effectiveDelay_s);
  return {
    rule: 'damping-target',
    citation: INTEGRATING_CITATION,
    controllerType: 'PI',
    gains,
    ruleForm: { form: 'parallel', gain: gains.kp, integralTime_s: gains.kp / gains.ki, derivativeTime_s: 0 },
    designModel: reduced,
    intermediate: { dampingRatio: zeta, naturalFrequency_radps: omega, effectiveDeadTime_s: effectiveDelay_s, bandwidthDelayProduct: product, ...extra },
    warnings,
  };
}

export const DAMPING_TARGET: TuningRule = {
  name: 'damping-target',
  title: 'Damping-target placement',
  citation: CITATION,
  plantClasses: ['integrating', 'double-integrating'],
  parameters: ['dampingRatio', 'naturalFrequency_radps', 'settlingDistance_m', 'integralPoleRatio'],
  tune: dampingTarget,
};

/**
 * The natural frequency the plan gives: ωn itself, or from a settling distance D at the speed, ωn = 4·vx/(ζ·D)
 * (settling time ≈ 4/(ζωn), common practice); null when it gives neither (the caller's default applies).
 */
function givenNaturalFrequency(parameters: RuleParameters, context: RuleContext, zeta: number): { omega_radps: number; extra: Record<string, number> } | null {
  if (parameters.naturalFrequency_radps !== undefined) {
    return { omega_radps: requirePositive('damping-target', 'naturalFrequency_radps (ωn)', parameters.naturalFrequency_radps), extra: {} };
  }
  if (parameters.settlingDistance_m !== undefined) {
    const distance = requirePositive('damping-target', 'settlingDistance_m (D)', parameters.settlingDistance_m);
    const speed = requirePositive('damping-target', 'speed_mps (vx, for ωn = 4vx/(ζD))', context.speed_mps);
    return { omega_radps: (4 * speed) / (zeta * distance), extra: { settlingDistance_m: distance } };
  }
  return null;
}

/** The warning when ωn·θ_eff asks for more bandwidth than the actuator lag and delay allow (none within TUNING_DEFAULTS' bound). */
function bandwidthWarnings(product: number, effectiveDelay_s: number): string[] {
  if (!(product > TUNING_DEFAULTS.maximumBandwidthDelayProduct)) return [];
  return [
    `ωn·θ_eff = ${product.toPrecision(3)} exceeds ${TUNING_DEFAULTS.maximumBandwidthDelayProduct}: the target asks for more bandwidth than the actuator lag and delay (θ_eff = ${effectiveDelay_s.toPrecision(3)} s) allow — lengthen the settling distance or lower ωn`,
  ];
}
