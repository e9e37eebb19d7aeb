/**
 * The parameter lists of the exported functions of a TypeScript module, read from its text: `export function name(…)`
 * and `export const name = (…) =>` (also `async`, generic and `function` forms), each declaration at the start of a
 * line as Biome formats it. Enough of the language is understood to split a parameter list at its own commas:
 * strings, template literals, comments and brackets, and the angle brackets of a generic type (an arrow `=>` inside
 * a type is not one). test/signatures.test.ts checks src/ with it.
 */

export interface ExportedSignature {
  readonly name: string;
  /** 1-based line of the declaration. */
  readonly line: number;
  /** Each parameter's text, comments removed and whitespace collapsed (`force: boolean`, `{ a, b }: Options`). */
  readonly parameters: readonly string[];
}

const DECLARATION =
  /^export\s+(?:declare\s+)?(?:async\s+)?function\s*\*?\s*([\w$]+)\s*|^export\s+const\s+([\w$]+)\s*(?::[^=\n]+)?=\s*(?:async\s+)?(?:function\s*\*?\s*[\w$]*\s*)?/gm;

/** From an opening bracket at `open`, the index just past its closing one, and the text between with comments removed. */
function readBracketed(text: string, open: number): { end: number; inner: string } {
  const closing: Record<string, string> = { '(': ')', '[': ']', '{': '}', '<': '>' };
  const stack = [closing[text[open]]];
  let inner = '';
  let i = open + 1;
  while (i < text.length) {
    const c = text[i];
    const next = text[i + 1];
    if (c === '/' && next === '*') {
      const stop = text.indexOf('*/', i + 2);
      i = stop < 0 ? text.length : stop + 2;
      inner += ' ';
      continue;
    }
    if (c === '/' && next === '/') {
      const stop = text.indexOf('\n', i);
      i = stop < 0 ? text.length : stop;
      continue;
    }
    if (c === "'" || c === '"' || c === '`') {
      let j = i + 1;
      while (j < text.length && text[j] !== c) j += text[j] === '\\' ? 2 : 1;
      inner += text.slice(i, j + 1);
      i = j + 1;
      continue;
    }
    if (c === '=' && next === '>') {
      inner += '=>';
      i += 2;
      continue;
    }
    if (c === '(' || c === '[' || c === '{' || (c === '<' && /[\w$[{(]/.test(next ?? ''))) stack.push(closing[c]);
    else if (c === stack[stack.length - 1]) {
      stack.pop();
      if (stack.length === 0) return { end: i + 1, inner };
    }
    inner += c;
    i += 1;
  }
  throw new Error(`unclosed ${text[open]} at offset ${open}`);
}

/** Split a parameter list at its top-level commas (brackets and generic types kept whole). */
function splitParameters(inner: string): string[] {
  const parts: string[] = [];
  let depth = 0;
  let current = '';
  for (let i = 0; i < inner.length; i += 1) {
    const c = inner[i];
    if (c === "'" || c === '"' || c === '`') {
      let j = i + 1;
      while (j < inner.length && inner[j] !== c) j += inner[j] === '\\' ? 2 : 1;
      current += inner.slice(i, j + 1);
      i = j;
      continue;
    }
    if (c === '=' && inner[i + 1] === '>') {
      current += '=>';
      i += 1;
      continue;
    }
    if (c === '(' || c === '[' || c === '{' || (c === '<' && /[\w$[{(]/.test(inner[i + 1] ?? ''))) depth += 1;
    else if (c === ')' || c === ']' || c === '}' || (c === '>' && depth > 0)) depth -= 1;
    if (c === ',' && depth === 0) {
      parts.push(current);
      current = '';
    } else current += c;
  }
  parts.push(current);
  return parts.map((part) => part.replace(/\s+/g, ' ').trim()).filter((part) => part !== '');
}

/** The exported functions of a module's text with their parameters (a `this` parameter left out). */
export function exportedSignatures(text: string): ExportedSignature[] {
  const found: ExportedSignature[] = [];
  for (const match of text.matchAll(DECLARATION)) {
    const name = match[1] ?? match[2];
    let at = (match.index ?? 0) + match[0].length;
    if (text[at] === '<') at = readBracketed(text, at).end;
    while (/\s/.test(text[at] ?? '')) at += 1;
    if (text[at] !== '(') continue; // a constant that is not a function (or an arrow with one bare parameter)
    const list = readBracketed(text, at);
    if (match[2] !== undefined && match[0].indexOf('function') < 0) {
      // `export const name = (…)`: an arrow function only when `=>` or a return type follows the list.
      const after = text.slice(list.end).trimStart();
      if (!after.startsWith('=>') && !after.startsWith(':')) continue;
    }
    const parameters = splitParameters(list.inner).filter((parameter) => !/^this\s*:/.test(parameter));
    found.push({ name, line: text.slice(0, match.index).split('\n').length, parameters });
  }
  return found;
}

/** A parameter typed exactly `boolean` (`flag: boolean`, `flag?: boolean`, `flag: boolean = true`) or defaulted to `true`/`false` without a type. */
export function isBareBoolean(parameter: string): boolean {
  return /^(?:\.\.\.)?[\w$]+\??\s*:\s*boolean\s*(?:=.*)?$/.test(parameter) || /^[\w$]+\s*=\s*(?:true|false)$/.test(parameter);
}
