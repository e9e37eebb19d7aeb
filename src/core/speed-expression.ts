/**
 * Expressions of speed, as plans write them ("max(15, 1.2 * speed_mps)"): parsed once with mathjs's
 * expression parser (loaded lazily, src/core/mathjs.ts), then evaluated at any speed.
 *
 * The scope is restricted by walking the parsed tree before anything is compiled: numbers, the variable
 * `speed_mps`, the constants pi and e, arithmetic, comparisons, `and`/`or`/`not`, `a ? b : c`, and the pure
 * maths functions of ALLOWED_FUNCTIONS. Everything else is refused with the reason and, where it can be
 * found, the character position: assignment, function definitions, several statements, strings, matrices,
 * objects, property access, ranges, and every other function — `import`, `evaluate`, `parse`, `createUnit`
 * included. Input longer than MAXIMUM_EXPRESSION_LENGTH is refused unparsed. Results are data; the caller
 * words the error with its field and file.
 */
import type { MathNode } from 'mathjs';
import { loadMathjs } from './mathjs.js';
import { libraryMessage, quoted } from './quote.js';

/** The one variable an expression of speed may use, m/s. */
export const SPEED_VARIABLE = 'speed_mps';
/** Longer texts are refused before parsing. */
export const MAXIMUM_EXPRESSION_LENGTH = 500;
/** Pure maths functions an expression may call (mathjs's definitions). */
export const ALLOWED_FUNCTIONS: readonly string[] = [
  'abs',
  'sqrt',
  'cbrt',
  'exp',
  'log',
  'log10',
  'log2',
  'pow',
  'hypot',
  'min',
  'max',
  'floor',
  'ceil',
  'round',
  'fix',
  'sign',
  'mod',
  'sin',
  'cos',
  'tan',
  'asin',
  'acos',
  'atan',
  'atan2',
  'sinh',
  'cosh',
  'tanh',
];
const ALLOWED_CONSTANTS: readonly string[] = ['pi', 'e'];
/** mathjs operator functions allowed (+ − × ÷ ^ mod, unary ±, comparisons, logic). */
const ALLOWED_OPERATORS: readonly string[] = [
  'add',
  'subtract',
  'multiply',
  'divide',
  'pow',
  'mod',
  'unaryMinus',
  'unaryPlus',
  'smaller',
  'larger',
  'smallerEq',
  'largerEq',
  'equal',
  'unequal',
  'and',
  'or',
  'not',
];
const ALLOWED_COMPARISONS: readonly string[] = ['smaller', 'larger', 'smallerEq', 'largerEq', 'equal', 'unequal'];

/** Evaluating at one speed: a number (possibly not finite), or what came out instead. */
export type ExpressionValue = { readonly kind: 'number'; readonly value: number } | { readonly kind: 'notANumber'; readonly found: string };

export type ExpressionCompilation =
  | { readonly kind: 'compiled'; readonly evaluate: (speed_mps: number) => ExpressionValue }
  /** `position`: 1-based character where the problem is, null when it cannot be placed. */
  | { readonly kind: 'refused'; readonly reason: string; readonly position: number | null };

interface Refusal {
  readonly reason: string;
  /** What to look for in the text to place the problem. */
  readonly token: RegExp | null;
}

const word = (name: string): RegExp => new RegExp(`(?<![A-Za-z0-9_])${name.replace(/[^A-Za-z0-9_]/g, '\\$&')}(?![A-Za-z0-9_])`);
const literal = (text: string): RegExp => new RegExp(text.replace(/[.*+?^${}()|[\]\\]/g, '\\$&'));
const ASSIGNMENT = /(?<![=<>!])=(?!=)/;

/** The first part of the tree outside the restricted scope, or null when all of it is allowed. */
function refusal(node: MathNode): Refusal | null {
  const n = node as MathNode & Record<string, unknown>;
  switch (node.type) {
    case 'ConstantNode':
      return typeof n.value === 'number'
        ? null
        : { reason: `only numbers may be written, not ${typeof n.value === 'string' ? 'text' : String(n.value)}`, token: /["']|true|false|null|undefined/ };
    case 'SymbolNode': {
      const name = String(n.name);
      if (name === SPEED_VARIABLE || ALLOWED_CONSTANTS.includes(name)) return null;
      return { reason: `unknown name ${quoted(name)} — the only variable is ${SPEED_VARIABLE} (constants pi and e)`, token: word(name) };
    }
    case 'FunctionNode': {
      const fn = n.fn as MathNode & { name?: string };
      if (fn.type !== 'SymbolNode' || !ALLOWED_FUNCTIONS.includes(String(fn.name))) {
        const name = fn.type === 'SymbolNode' ? String(fn.name) : 'a computed function';
        return {
          reason: `function ${name} is not allowed — use the maths functions ${ALLOWED_FUNCTIONS.join(', ')}`,
          token: fn.type === 'SymbolNode' ? word(name) : null,
        };
      }
      break;
    }
    case 'OperatorNode':
      if (!ALLOWED_OPERATORS.includes(String(n.fn)))
        return { reason: `operator ${String(n.op)} is not allowed — use + - * / ^ mod, comparisons, and, or, not`, token: literal(String(n.op)) };
      break;
    case 'RelationalNode':
      if (!(n.conditionals as string[]).every((fn) => ALLOWED_COMPARISONS.includes(fn)))
        return { reason: 'only the comparisons < > <= >= == != are allowed', token: null };
      break;
    case 'ParenthesisNode':
    case 'ConditionalNode':
      break;
    case 'AssignmentNode':
      return { reason: 'assignment (=) is not allowed', token: ASSIGNMENT };
    case 'FunctionAssignmentNode':
      return { reason: 'defining a function is not allowed', token: ASSIGNMENT };
    case 'BlockNode':
      return { reason: 'only one expression is allowed (no ; or line breaks between expressions)', token: /[;\n]/ };
    case 'AccessorNode':
    case 'IndexNode':
      return { reason: 'indexing and property access are not allowed', token: /[[.](?!\d)/ };
    case 'ArrayNode':
      return { reason: 'matrices and lists are not allowed — the value must be one number', token: /\[/ };
    case 'ObjectNode':
      return { reason: 'objects are not allowed — the value must be one number', token: /\{/ };
    case 'RangeNode':
      return { reason: 'ranges are not allowed — the value must be one number', token: /:/ };
    default:
      return { reason: `${node.type} is not allowed`, token: null };
  }
  let found: Refusal | null = null;
  node.forEach((child: MathNode, path: string) => {
    if (found === null && !(node.type === 'FunctionNode' && path === 'fn')) found = refusal(child);
  });
  return found;
}

const placed = (text: string, token: RegExp | null): number | null => {
  const at = token === null ? -1 : text.search(token);
  return at < 0 ? null : at + 1;
};

/** Words for a value that is not a plain number. */
function describeValue(value: unknown): string {
  if (typeof value === 'boolean') return `${value} (a comparison, not a number — use a ? b : c to choose a number)`;
  const type = (value as { type?: string } | null)?.type;
  if (type === 'Complex') return `the complex number ${String(value)}`;
  return typeof value === 'object' && value !== null ? `a ${type ?? 'value'} (${String(value)})` : String(value);
}

/** Parse and check an expression of speed; compiled, it evaluates at any speed (m/s) without parsing again. */
export async function compileSpeedExpression(text: string): Promise<ExpressionCompilation> {
  if (text.length > MAXIMUM_EXPRESSION_LENGTH) {
    return {
      kind: 'refused',
      reason: `the expression is ${text.length} characters long; at most ${MAXIMUM_EXPRESSION_LENGTH} are read`,
      position: MAXIMUM_EXPRESSION_LENGTH + 1,
    };
  }
  if (text.trim() === '') return { kind: 'refused', reason: 'the expression is empty', position: null };
  const math = await loadMathjs();
  let tree: MathNode;
  try {
    tree = math.parse(text);
  } catch (error) {
    const message = error instanceof Error ? error.message.replace(/\s*\(char \d+\)\s*$/, '') : String(error);
    const char = (error as { char?: unknown }).char;
    return { kind: 'refused', reason: libraryMessage(message), position: typeof char === 'number' ? char : null };
  }
  const refused = refusal(tree);
  if (refused !== null) return { kind: 'refused', reason: refused.reason, position: placed(text, refused.token) };
  const code = tree.compile();
  return {
    kind: 'compiled',
    evaluate: (speed_mps: number): ExpressionValue => {
      let value: unknown;
      try {
        value = code.evaluate({ [SPEED_VARIABLE]: speed_mps });
      } catch (error) {
        return { kind: 'notANumber', found: `an error: ${error instanceof Error ? error.message : String(error)}` };
      }
      return typeof value === 'number' ? { kind: 'number', value } : { kind: 'notANumber', found: describeValue(value) };
    },
  };
}
