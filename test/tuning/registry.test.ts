import { describe, expect, it } from 'vitest';
import { SpeedbandError } from '../../src/core/errors.js';
import { applicableRules, applyRule, findRule, TUNING_RULES } from '../../src/tuning/registry.js';
import type { DesignModel } from '../../src/tuning/types.js';

const doubleIntegrator: DesignModel = { integrators: 2, gain: 10, lags_s: [0.1], deadTime_s: 0.05 };

function caught(run: () => unknown): SpeedbandError {
  try {
    run();
  } catch (error) {
    if (error instanceof SpeedbandError) return error;
    throw error;
  }
  throw new Error('expected a SpeedbandError');
}

describe('rule registry', () => {
  it('a parameter the rule does not read is tuning.parameterNotTaken (never silently ignored), naming whose it is and what the rule takes', () => {
    const error = caught(() => applyRule('simc', doubleIntegrator, { simcClosedLoopTimeConstant_s: 0.2, dampingRatio: 0.7 }, { speed_mps: 5 }));
    expect(error.code).toBe('tuning.parameterNotTaken');
    expect(error.message).toBe(
      'simc does not use dampingRatio (a parameter of damping-target) — simc takes controllerType, simcClosedLoopTimeConstant_s; remove it',
    );
    expect(error.details.parameters).toEqual(['dampingRatio']);
    // An explicitly undefined parameter is not given.
    expect(applyRule('simc', doubleIntegrator, { dampingRatio: undefined }, { speed_mps: 5 }).rule).toBe('simc');
  });

  it('Ziegler–Nichols on a double integrator (path loop) is tuning.ruleNotApplicable naming why and the rules that apply', () => {
    for (const name of ['ziegler-nichols-step', 'ziegler-nichols-ultimate']) {
      const error = caught(() => applyRule(name, doubleIntegrator, {}, { speed_mps: 5 }));
      expect(error.code).toBe('tuning.ruleNotApplicable');
      expect(error.message).toMatch(/double-integrating/);
      expect(error.details.applicableRules).toEqual(['simc', 'damping-target']);
      expect(error.message).toMatch(/rules that apply: simc, damping-target/);
    }
  });

  it('a rule that refuses inside its class (no finite ultimate gain) also names the alternatives', () => {
    const delayFree: DesignModel = { integrators: 0, gain: 1, lags_s: [2], deadTime_s: 0 };
    const error = caught(() => applyRule('ziegler-nichols-ultimate', delayFree, {}, { speed_mps: 5 }));
    expect(error.code).toBe('tuning.ruleNotApplicable');
    expect(error.message).toMatch(/rules that apply: imc-pid, simc/);
  });

  it('each rule declares its plant classes, and applicableRules agrees with them on a FOPDT', () => {
    expect(TUNING_RULES.map((rule) => rule.name)).toEqual([
      'ziegler-nichols-step',
      'ziegler-nichols-ultimate',
      'imc-pid',
      'simc',
      'damping-target',
      'amigo',
      'migo',
    ]);
    // MIGO optimises on the full loop, which a design model alone does not give: it applies through tuneOperatingPoint.
    expect(applicableRules({ integrators: 0, gain: 1, lags_s: [3], deadTime_s: 1 }, {}, { speed_mps: 5 })).toEqual([
      'ziegler-nichols-step',
      'ziegler-nichols-ultimate',
      'imc-pid',
      'simc',
      'amigo',
    ]);
  });

  it('an unknown rule name is tuning.unknownRule with a suggestion', () => {
    const error = caught(() => findRule('simc-pid'));
    expect(error.code).toBe('tuning.unknownRule');
    expect(error.message).toMatch(/did you mean simc\?/);
  });
});
