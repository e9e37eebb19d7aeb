export type {
  PlantClass,
  ControllerType,
  DesignModel,
  RuleForm,
  RuleResult,
  RuleName,
  RuleParameters,
  RuleContext,
  TuningRule,
} from './types.js';
export { TUNING_DEFAULTS } from './defaults.js';
export { plantClassOf, describePlantClass } from './plant-class.js';
export { reduceByHalfRule, type HalfRuleReduction } from './half-rule.js';
export { ultimatePoint, type UltimatePoint } from './ultimate-gain.js';
export { zieglerNicholsStep, reactionCurve, ZIEGLER_NICHOLS_STEP, type ReactionCurve } from './ziegler-nichols-step.js';
export { zieglerNicholsUltimate, ZIEGLER_NICHOLS_ULTIMATE } from './ziegler-nichols-ultimate.js';
export { imcPid, IMC_PID } from './imc-pid.js';
export { simc, SIMC } from './simc.js';
export { dampingTarget, DAMPING_TARGET } from './damping-target.js';
export { TUNING_RULES, RULE_NAMES, findRule, applicableRules, applyRule } from './registry.js';
export { fopdtByTwoPoints, type TwoPointFopdt } from './two-point.js';
export { designModelFromLumped, designModelFromSingleTrack, type DesignModelDerivation } from './design-model.js';
export { tuneOperatingPoint, loopMargins, type OperatingPointModel, type OperatingPointRequest, type TunedOperatingPoint } from './operating-point.js';
export { proportionalGainRange, type ProportionalGainRange } from './proportional-range.js';
export { describeTunedOperatingPoint } from './describe.js';
export { amigo, AMIGO } from './amigo.js';
export { migo, MIGO } from './migo.js';
export { fullLoopResponse, gridLoopCheck, type FullLoop, type FullLoopResponse, type SensitivityBounds } from './full-loop.js';
