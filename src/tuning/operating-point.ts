import { samplingDelay_s } from '../controller/discrete.js';
import { pidTransferFunction } from '../controller/pid.js';
import type { ControllerSettings, PidGains } from '../controller/types.js';
import type { LumpedModel } from '../identify/types.js';
import { loopPlantFromLumped, loopPlantFromSingleTrack } from '../loops/build.js';
import type { LoopPlant, LoopSpecification } from '../loops/types.js';
import { seriesConnection } from '../lti/transfer-function.js';
import { analyseOpenLoop } from '../verify/analyse-open-loop.js';
import type { LoopMargins } from '../verify/types.js';
import type { SingleTrackParameters } from '../vehicle/types.js';
import { designModelFromLumped, designModelFromSingleTrack, type DesignModelDerivation } from './design-model.js';
import { applyRule } from './registry.js';
import type { RuleParameters, RuleResult } from './types.js';

/** The vehicle model at the operating point: a lumped per-speed yaw-rate model, or the single-track model. */
export type OperatingPointModel =
  | { readonly kind: 'lumped'; readonly yawRate: LumpedModel /** needed for a front-axle preview, m */; readonly cgToFrontAxle_m?: number }
  | { readonly kind: 'single-track'; readonly parameters: SingleTrackParameters };

/** Input of tuneOperatingPoint: loop, speed, model (lumped or single-track), rule with its parameters, controller settings. */
export interface OperatingPointRequest {
  readonly loop: LoopSpecification;
  readonly speed_mps: number;
  readonly model: OperatingPointModel;
  /** A rule name (RULE_NAMES). */
  readonly rule: string;
  readonly ruleParameters: RuleParameters;
  readonly controller: ControllerSettings;
  /** Gains a numerical rule (MIGO) searches around first. */
  readonly startGains?: PidGains;
}

/** The gains at one speed with the rule's derivation, the design model, the loop plant and the margins of the full loop. */
export interface TunedOperatingPoint {
  /** Parallel gains for the firmware (units per loop: see LoopDefinition.outputUnit). */
  readonly gains: PidGains;
  /** The rule's result: form, intermediate quantities, citation, warnings, the (reduced) design model. */
  readonly derivation: RuleResult;
  /** How the design model was obtained from the vehicle model. */
  readonly design: DesignModelDerivation;
  /** The full loop plant the margins were computed on. */
  readonly loop: LoopPlant;
  /** Margins of L = C(s)·G_loop(s), C the PID with its derivative filter N, G_loop with the exact delay. */
  readonly margins: LoopMargins;
  /** The rule's warnings plus the operating point's own (e.g. a crossover too close to the sampling rate). */
  readonly warnings: readonly string[];
}

/**
 * Crossover limit as a fraction of the sampling frequency 2π/Ts: sampling at least ten times the
 * crossover keeps the Ts/2 hold-delay model honest (common practice).
 */
export const CROSSOVER_PER_SAMPLING_FREQUENCY = 0.1;

/**
 * Tune one operating point: build the loop plant the firmware sees (src/loops), derive the rule's
 * design model from the same vehicle model (`designModelFromLumped` / `designModelFromSingleTrack`),
 * apply the rule (`applyRule`: a rule that does not apply throws `tuning.ruleNotApplicable` naming
 * those that do), and analyse the resulting loop on the full plant (`analyseOpenLoop`), with the
 * continuous PID kp + ki/s + kd·s/(1 + Tf·s), Tf = (kd/kp)/N, and the sampled controller counted as
 * a delay Ts/2 plus the computation latency. Pure; no I/O.
 */
export function tuneOperatingPoint(request: OperatingPointRequest): TunedOperatingPoint {
  const { loop: specification, speed_mps, model, controller } = request;
  const controllerDelay_s = samplingDelay_s(controller);
  const loop =
    model.kind === 'lumped'
      ? loopPlantFromLumped({ specification, model: model.yawRate, speed_mps, controller, cgToFrontAxle_m: model.cgToFrontAxle_m })
      : loopPlantFromSingleTrack(specification, model.parameters, speed_mps, controller);
  const design =
    model.kind === 'lumped'
      ? designModelFromLumped({ kind: specification.kind, model: model.yawRate, speed_mps, controllerDelay_s, previewFromCg_m: loop.previewFromCg_m ?? 0 })
      : designModelFromSingleTrack({
          kind: specification.kind,
          parameters: model.parameters,
          speed_mps,
          controllerDelay_s,
          previewFromCg_m: loop.previewFromCg_m ?? 0,
        });
  // The loop as the firmware runs it: the plant's own delay and the latency, without the Ts/2 the design model adds for the hold.
  const fullLoop = { plant: { ...loop.plant, delay_s: loop.plant.delay_s - controller.sampleTime_s / 2 }, controller };
  const derivation = applyRule(request.rule, design.model, request.ruleParameters, {
    speed_mps,
    fullLoop,
    ...(request.startGains === undefined ? {} : { startGains: request.startGains }),
  });
  const margins = loopMargins(loop, derivation.gains, controller.derivativeFilter);
  const warnings = [...derivation.warnings];
  const samplingFrequency_radps = (2 * Math.PI) / controller.sampleTime_s;
  const crossover = margins.phaseMarginFrequency_radps;
  if (crossover !== null && crossover > CROSSOVER_PER_SAMPLING_FREQUENCY * samplingFrequency_radps) {
    warnings.push(
      `the loop crosses over at ${crossover.toPrecision(3)} rad/s, above a tenth of the sampling frequency 2π/Ts = ${samplingFrequency_radps.toPrecision(3)} rad/s (common practice: sample at least ten times faster): the Ts/2 delay model is optimistic there — check with the discrete controller or choose a slower target`,
    );
  }
  return { gains: derivation.gains, derivation, design, loop, margins, warnings };
}

/** Margins of the loop plant under parallel gains with derivative filter N (see tuneOperatingPoint). */
export function loopMargins(loop: LoopPlant, gains: PidGains, derivativeFilter: number): LoopMargins {
  const open = seriesConnection(pidTransferFunction(gains, derivativeFilter), loop.plant);
  return analyseOpenLoop({ numerator: open.numerator, denominator: open.denominator, delay_s: open.delay_s });
}
