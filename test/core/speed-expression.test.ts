import fc from 'fast-check';
import { describe, expect, it } from 'vitest';
import { loadMathjs } from '../../src/core/mathjs.js';
import { ALLOWED_FUNCTIONS, MAXIMUM_EXPRESSION_LENGTH, compileSpeedExpression, type ExpressionValue } from '../../src/core/speed-expression.js';

/** Compile an expression that must be accepted and return its evaluator. */
async function compiled(text: string): Promise<(speed_mps: number) => ExpressionValue> {
  const result = await compileSpeedExpression(text);
  if (result.kind !== 'compiled') throw new Error(`${text}: ${result.reason}`);
  return result.evaluate;
}

const numberAt = (evaluate: (speed_mps: number) => ExpressionValue, speed_mps: number): number => {
  const value = evaluate(speed_mps);
  if (value.kind !== 'number') throw new Error(`not a number: ${value.found}`);
  return value.value;
};

describe('compileSpeedExpression(text) evaluates expressions of speed_mps (mathjs parser)', () => {
  it('"max(15, 1.2 * speed_mps)" is 15 m up to 12.5 m/s, then 1.2 m per m/s (the plan example)', async () => {
    const evaluate = await compiled('max(15, 1.2 * speed_mps)');
    expect(numberAt(evaluate, 5)).toBe(15);
    expect(numberAt(evaluate, 12.5)).toBe(15);
    expect(numberAt(evaluate, 20)).toBeCloseTo(24, 12);
  });

  it('conditionals, comparisons, constants, implicit multiplication and maths functions are mathjs operations on plain numbers', async () => {
    expect(numberAt(await compiled('speed_mps < 5 ? 0.8 : 1'), 3)).toBe(0.8);
    expect(numberAt(await compiled('speed_mps < 5 ? 0.8 : 1'), 7)).toBe(1);
    expect(numberAt(await compiled('2 pi'), 1)).toBeCloseTo(2 * Math.PI, 15);
    expect(numberAt(await compiled('sqrt(speed_mps) + log(e) + abs(-2) + 2^3'), 16)).toBeCloseTo(4 + 1 + 2 + 8, 12);
    expect(numberAt(await compiled('(speed_mps > 2 and speed_mps < 8) ? 1 : 2'), 4)).toBe(1);
    expect(numberAt(await compiled('2 < speed_mps < 8 ? 1 : 2'), 9)).toBe(2);
  });

  it('a value that is not a real number comes back as data (complex, comparison, error), never as an exception', async () => {
    expect((await compiled('sqrt(speed_mps - 5)'))(1)).toMatchObject({ kind: 'notANumber', found: expect.stringContaining('complex') });
    expect((await compiled('speed_mps > 3'))(1)).toMatchObject({ kind: 'notANumber', found: expect.stringContaining('comparison') });
    expect((await compiled('max()'))(1)).toMatchObject({ kind: 'notANumber', found: expect.stringContaining('error') });
    expect((await compiled('1 / (speed_mps - 1)'))(1)).toEqual({ kind: 'number', value: Infinity });
  });
});

describe('compileSpeedExpression refuses everything outside the restricted scope, with the character position', () => {
  // Each row: input, where the problem is (1-based character; null: cannot be placed), words of the reason.
  const rows: readonly (readonly [string, number | null, RegExp])[] = [
    ['x = 3', 3, /assignment/],
    ['speed_mps = 3', 11, /assignment/],
    ['f(v) = v', 6, /defining a function/],
    ['import("fs")', 1, /function import is not allowed/],
    ['2 * evaluate("1 + 1")', 5, /function evaluate/],
    ['parse("1")', 1, /function parse/],
    ['createUnit("furlong")', 1, /function createUnit/],
    ['simplify("x")', 1, /function simplify/],
    ['speed_mps + foo', 13, /unknown name "foo"/],
    ['"15"', 1, /only numbers/],
    ['true ? 1 : 2', 1, /only numbers/],
    ['[1, 2]', 1, /matrices/],
    ['{a: 1}', 1, /objects/],
    ['1:3', 2, /ranges/],
    ['max(1, 2); 3', 10, /only one expression/],
    ['cos.constructor', 4, /property access/],
    ['speed_mps!', 10, /operator !/],
    ['speed_mps & 1', 11, /operator &/],
    ['5 km', 3, /unknown name "km"/],
    ['max(15, 1.2 * speed_mps', 24, /Parenthesis \) expected/],
    ['1 +* 2', 4, /Value expected/],
  ];
  for (const [text, position, reason] of rows) {
    it(`${JSON.stringify(text)} → refused at ${position}: ${reason.source}`, async () => {
      const result = await compileSpeedExpression(text);
      expect(result).toMatchObject({ kind: 'refused', position, reason: expect.stringMatching(reason) });
    });
  }

  it(`refuses input longer than ${MAXIMUM_EXPRESSION_LENGTH} characters before parsing, and empty input`, async () => {
    const long = `speed_mps${' + 1'.repeat(200)}`;
    expect(await compileSpeedExpression(long)).toMatchObject({ kind: 'refused', reason: expect.stringContaining(`${long.length} characters`) });
    expect(await compileSpeedExpression('speed_mps+'.repeat(100_000))).toMatchObject({ kind: 'refused' });
    expect(await compileSpeedExpression('   ')).toMatchObject({ kind: 'refused', reason: 'the expression is empty' });
  });
});

/** A generated expression, whether it stays inside the restricted scope, and (for the arithmetic part) its value by plain JavaScript. */
interface Generated {
  readonly text: string;
  readonly allowed: boolean;
  readonly value: (speed_mps: number) => number;
}

const hostileSymbols = ['x', 'speed', 'process', 'globalThis', 'undefined', 'null', 'true', '"text"', "'t'", '[1, 2]', '{a: 1}', '1:3', 'end'];
const hostileCalls = [
  'import',
  'evaluate',
  'parse',
  'compile',
  'createUnit',
  'simplify',
  'derivative',
  'resolve',
  'config',
  'typed',
  'reviver',
  'help',
  'chain',
  'matrix',
  'factorial',
  'random',
  'bitAnd',
];

const leaf: fc.Arbitrary<Generated> = fc.oneof(
  fc.integer({ min: 0, max: 1000 }).map((n) => ({ text: String(n), allowed: true, value: () => n })),
  fc.constantFrom(0.5, 1e-3, 2.5e2).map((n) => ({ text: String(n), allowed: true, value: () => n })),
  fc.constant({ text: 'speed_mps', allowed: true, value: (v: number) => v }),
  fc.constant({ text: 'pi', allowed: true, value: () => Math.PI }),
  fc.constantFrom(...hostileSymbols).map((text) => ({ text, allowed: false, value: () => NaN })),
);

const expression: fc.Arbitrary<Generated> = fc.letrec<{ node: Generated }>((tie) => ({
  node: fc.oneof(
    { depthSize: 'small', withCrossShrink: true },
    leaf,
    fc.tuple(tie('node'), fc.constantFrom('+', '-', '*', '/'), tie('node')).map(([a, op, b]) => ({
      text: `(${a.text} ${op} ${b.text})`,
      allowed: a.allowed && b.allowed,
      value: (v: number) => {
        const [x, y] = [a.value(v), b.value(v)];
        return op === '+' ? x + y : op === '-' ? x - y : op === '*' ? x * y : x / y;
      },
    })),
    fc.tuple(fc.constantFrom('max', 'min', 'abs'), tie('node'), tie('node')).map(([fn, a, b]) => ({
      text: fn === 'abs' ? `abs(${a.text})` : `${fn}(${a.text}, ${b.text})`,
      allowed: a.allowed && (fn === 'abs' || b.allowed),
      value: (v: number) => (fn === 'abs' ? Math.abs(a.value(v)) : fn === 'max' ? Math.max(a.value(v), b.value(v)) : Math.min(a.value(v), b.value(v))),
    })),
    fc.tuple(tie('node'), tie('node'), tie('node'), tie('node')).map(([a, b, c, d]) => ({
      text: `(${a.text} > ${b.text} ? ${c.text} : ${d.text})`,
      allowed: a.allowed && b.allowed && c.allowed && d.allowed,
      value: (v: number) => (a.value(v) > b.value(v) ? c.value(v) : d.value(v)),
    })),
    // Hostile shapes: assignment, function definition, forbidden functions and operators, several statements, access.
    fc
      .tuple(fc.constantFrom('x = ', 'speed_mps = ', 'f(y) = '), tie('node'))
      .map(([head, a]) => ({ text: `${head}${a.text}`, allowed: false, value: () => NaN })),
    fc.tuple(fc.constantFrom(...hostileCalls), tie('node')).map(([fn, a]) => ({ text: `${fn}(${a.text})`, allowed: false, value: () => NaN })),
    fc.tuple(tie('node'), fc.constantFrom('!', "'", ' & ', ' | ', ' to m', '; 1', '.constructor', '[1]')).map(([a, tail]) => ({
      text: tail.startsWith(' ') && tail !== ' to m' ? `(${a.text}${tail}1)` : `(${a.text})${tail}`,
      allowed: false,
      value: () => NaN,
    })),
    fc.tuple(tie('node'), fc.constantFrom(...ALLOWED_FUNCTIONS.filter((fn) => !['min', 'max', 'abs'].includes(fn)))).map(([a, fn]) => ({
      // Allowed functions with one argument; no JavaScript reference value (mathjs's own definitions).
      text: `${fn}(${a.text}${['pow', 'atan2', 'mod', 'hypot'].includes(fn) ? ', 2' : ''})`,
      allowed: a.allowed,
      value: () => NaN,
    })),
  ),
})).node;

describe('compileSpeedExpression on random and hostile expressions (fast-check)', () => {
  it('gives a value or a clear refusal, exactly as the restricted scope says; values agree with plain arithmetic', async () => {
    const sentinel = '__speedbandExpressionEscaped';
    await fc.assert(
      fc.asyncProperty(expression, fc.double({ min: 0, max: 60, noNaN: true }), async (generated, speed_mps) => {
        const text = generated.text.replace('globalThis', `globalThis.${sentinel} = 1`);
        const result = await compileSpeedExpression(text);
        if (text.length > MAXIMUM_EXPRESSION_LENGTH) {
          expect(result.kind).toBe('refused');
          return;
        }
        expect(result.kind, `${text}: ${result.kind === 'refused' ? result.reason : ''}`).toBe(generated.allowed ? 'compiled' : 'refused');
        if (result.kind === 'refused') {
          expect(result.reason.length).toBeGreaterThan(5);
          if (result.position !== null) expect(result.position).toBeGreaterThanOrEqual(1);
          if (result.position !== null) expect(result.position).toBeLessThanOrEqual(text.length + 1);
          return;
        }
        const value = result.evaluate(speed_mps);
        expect(['number', 'notANumber']).toContain(value.kind);
        const reference = generated.value(speed_mps);
        if (Number.isFinite(reference) && Math.abs(reference) < 1e12 && value.kind === 'number') {
          expect(Math.abs(value.value - reference)).toBeLessThanOrEqual(1e-9 * Math.max(1, Math.abs(reference)));
        }
      }),
      { numRuns: 600, seed: 19 },
    );
    // Nothing ran outside the expression and mathjs's functions are unchanged.
    expect((globalThis as Record<string, unknown>)[sentinel]).toBeUndefined();
    const math = await loadMathjs();
    expect(math.sqrt(16)).toBe(4);
    expect(typeof math.import).toBe('function');
  }, 60_000);

  it('random text from the expression alphabet (up to 600 characters) is compiled or refused, and evaluation never throws', async () => {
    const alphabet = fc.constantFrom(
      ...'0123456789.+-*/^()<>=!?:;,[]{}"\'&|~ \n'.split(''),
      'speed_mps',
      'max',
      'min',
      'import',
      'evaluate',
      'e',
      'pi',
      'x',
      'and',
      'or',
      'not',
      'mod',
      'to',
    );
    await fc.assert(
      fc.asyncProperty(
        fc.array(alphabet, { maxLength: 200 }).map((parts) => parts.join('')),
        async (text) => {
          const result = await compileSpeedExpression(text);
          if (result.kind === 'compiled') {
            for (const speed_mps of [0, 1, 7.5, 40]) expect(['number', 'notANumber']).toContain(result.evaluate(speed_mps).kind);
          } else {
            expect(result.reason.length).toBeGreaterThan(3);
          }
        },
      ),
      { numRuns: 800, seed: 2019 },
    );
  }, 60_000);

  it('deeply nested input within the length limit neither hangs nor overflows', async () => {
    const nested = `${'('.repeat(240)}speed_mps${')'.repeat(240)}`;
    expect(numberAt(await compiled(nested), 3)).toBe(3);
    expect(numberAt(await compiled(`${'-'.repeat(498)}1`), 3)).toBe(1);
    expect(await compileSpeedExpression(`${'max(1,'.repeat(60)}1${')'.repeat(60)}`)).toMatchObject({ kind: 'compiled' });
  });
});
