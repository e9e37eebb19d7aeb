import { describe, expect, it } from 'vitest';
import { PLAN_SCHEMA } from '../../src/schedule/plan-schema.js';
import { planFromJson } from '../../src/schedule/plan-file.js';
import { SPEED_VARYING_PARAMETERS, makeRuleParameterLookup, valueAtSpeed } from '../../src/schedule/rule-parameters.js';

describe('makeRuleParameterLookup(parameters) gives the rule parameters at any speed', () => {
  it('numbers stay, tables interpolate, expressions evaluate, the controller type passes through as text', async () => {
    // The lookup serves any rule; a plan gives only the parameters its rule takes (checked in test/schedule/plan.test.ts).
    const at = await makeRuleParameterLookup({
      controllerType: 'PID',
      dampingRatio: 0.9,
      integralPoleRatio: { speeds_mps: [2, 10], values: [4, 6] },
      settlingDistance_m: 'max(15, 1.2 * speed_mps)',
    });
    expect(at(5)).toEqual({ controllerType: 'PID', dampingRatio: 0.9, integralPoleRatio: 4.75, settlingDistance_m: 15 });
    expect(at(20).settlingDistance_m).toBeCloseTo(24, 12);
    expect(at(20).integralPoleRatio).toBe(6);
  });

  it('a plan without expressions gives the same values as valueAtSpeed', async () => {
    const table = { speeds_mps: [1, 4, 9], values: [10, 20, 60] };
    const at = await makeRuleParameterLookup({ settlingDistance_m: table });
    for (const speed of [0.5, 1, 2.5, 4, 6.5, 9, 12]) expect(at(speed).settlingDistance_m).toBe(valueAtSpeed(table, speed));
  });

  it('an expression outside the restricted scope → plan.invalid at its JSON path, naming the field, the reason and the character', async () => {
    await expect(makeRuleParameterLookup({ settlingDistance_m: 'max(15, 1.2 * speed)' }, 'plan.json')).rejects.toMatchObject({
      code: 'plan.invalid',
      location: { file: 'plan.json', jsonPath: '/rule/parameters/settlingDistance_m' },
      message: expect.stringMatching(/^settlingDistance_m "max\(15, 1\.2 \* speed\)": unknown name "speed" .* \(at character 15 of the expression\)/),
    });
    await expect(makeRuleParameterLookup({ dampingRatio: 'evaluate("1")' })).rejects.toMatchObject({
      message: expect.stringContaining('function evaluate is not allowed'),
    });
  });

  it('an expression quoted in an error is cut and its control characters escaped, like all input text in messages', async () => {
    const hostile = `max(15, speed_mps) \u001b[2J${' '.repeat(400)}+ x`;
    const error: unknown = await makeRuleParameterLookup({ settlingDistance_m: hostile }, 'plan.json').then(
      () => undefined,
      (refused: unknown) => refused,
    );
    expect(error).toMatchObject({ code: 'plan.invalid' });
    const message = (error as Error).message;
    expect(message).not.toContain('\u001b'); // the raw escape character
    expect(message).toContain('\\e[2J'); // written as the two characters \e
    expect(message).toContain(`(${hostile.length} characters in all)`);
    expect(message.split('\n')[0].length).toBeLessThan(500); // the last line points to the plan reference
  });

  it('an expression that is not a positive number at a speed → plan.invalid naming the speed and the value', async () => {
    const at = await makeRuleParameterLookup({ settlingDistance_m: '10 * speed_mps - 50' }, 'plan.json');
    expect(at(6).settlingDistance_m).toBe(10);
    expect(() => at(4)).toThrow(
      expect.objectContaining({
        code: 'plan.invalid',
        message: expect.stringContaining('gives -10 at 4 m/s'),
        details: expect.objectContaining({ speed_mps: 4 }),
      }),
    );
    const complex = await makeRuleParameterLookup({ dampingRatio: 'sqrt(speed_mps - 5)' });
    expect(() => complex(1)).toThrow(/gives the complex number/);
  });
});

describe('the plan schema and SPEED_VARYING_PARAMETERS agree', () => {
  it('exactly the listed rule parameters accept a number, a table or an expression', () => {
    const properties = PLAN_SCHEMA.properties.rule.properties.parameters.properties as Record<string, { oneOf?: readonly { type?: string }[] }>;
    const varying = Object.keys(properties).filter((name) => properties[name].oneOf?.some((branch) => branch.type === 'string'));
    expect(varying.sort()).toEqual([...SPEED_VARYING_PARAMETERS].sort());
  });

  it('planFromJson accepts an expression string and refuses an empty one at its JSON path', () => {
    expect(
      planFromJson({ rule: { parameters: { simcClosedLoopTimeConstant_s: '0.1 + 0.01 * speed_mps' } } }).rule.parameters.simcClosedLoopTimeConstant_s,
    ).toBe('0.1 + 0.01 * speed_mps');
    expect(() => planFromJson({ rule: { parameters: { simcClosedLoopTimeConstant_s: '' } } })).toThrow(
      expect.objectContaining({
        code: 'plan.invalid',
        location: expect.objectContaining({ jsonPath: expect.stringContaining('/rule/parameters/simcClosedLoopTimeConstant_s') }),
      }),
    );
  });
});
