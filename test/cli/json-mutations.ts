/**
 * Seeded mutations of JSON files for the command-line fuzz test: values, types, keys and structure
 * of the parsed document, and a few text-level faults (cut, stray byte, repeated key).
 */
import type { RandomSource } from '../../src/core/random.js';

type Json = null | boolean | number | string | Json[] | { [key: string]: Json };

const REPLACEMENTS: readonly Json[] = [
  null,
  true,
  false,
  0,
  -1,
  1,
  0.5,
  1e308,
  -1e308,
  5e-324,
  1e-9,
  2 ** 53,
  '',
  'NaN',
  'Infinity',
  'x'.repeat(2000),
  [],
  {},
  [1, 2, 3],
  { unexpected: 1 },
];
const SCALES: readonly number[] = [-1, 0, 10, 1000, 1e6, 1e-3, 1e-6, 1e12];

const pick = <T>(random: RandomSource, items: readonly T[]): T => items[Math.floor(random.uniform() * items.length)];

/** Every path to a node of the document (the root included). */
function paths(value: Json, prefix: (string | number)[] = []): (string | number)[][] {
  const found: (string | number)[][] = [prefix];
  if (Array.isArray(value)) value.forEach((item, index) => found.push(...paths(item, [...prefix, index])));
  else if (value !== null && typeof value === 'object') for (const [key, item] of Object.entries(value)) found.push(...paths(item, [...prefix, key]));
  return found;
}

function parentOf(root: Json, path: readonly (string | number)[]): { parent: Json; key: string | number } | null {
  if (path.length === 0) return null;
  let node: Json = root;
  for (const part of path.slice(0, -1)) node = (node as Record<string | number, Json>)[part];
  return { parent: node, key: path[path.length - 1] };
}

/** One mutation of a parsed document, in place where possible; returns the new root and what was done. */
function mutateValue(root: Json, random: RandomSource): { root: Json; what: string } {
  const all = paths(root);
  const path = pick(random, all);
  const where = `/${path.join('/')}`;
  const located = parentOf(root, path);
  const current = located === null ? root : (located.parent as Record<string | number, Json>)[located.key];
  const set = (value: Json): Json => {
    if (located === null) return value;
    (located.parent as Record<string | number, Json>)[located.key] = value;
    return root;
  };
  const kind = Math.floor(random.uniform() * 8);
  if (kind === 0 && typeof current === 'number') {
    const scale = pick(random, SCALES);
    return { root: set(current * scale), what: `${where} ×${scale}` };
  }
  if (kind === 1 && located !== null) {
    if (Array.isArray(located.parent)) located.parent.splice(Number(located.key), 1);
    else delete (located.parent as Record<string, Json>)[located.key];
    return { root, what: `${where} removed` };
  }
  if (kind === 2 && current !== null && typeof current === 'object' && !Array.isArray(current)) {
    const keys = Object.keys(current);
    if (keys.length > 0) {
      const key = pick(random, keys);
      const renamed = `${key}${pick(random, ['_x', 'S', '_kg'])}`;
      current[renamed] = current[key];
      delete current[key];
      return { root, what: `${where}/${key} renamed ${renamed}` };
    }
  }
  if (kind === 3 && Array.isArray(current)) {
    const action = Math.floor(random.uniform() * 4);
    if (action === 0) current.length = 0;
    else if (action === 1 && current.length > 0) current.push(current[0]);
    else if (action === 2) current.reverse();
    else current.splice(Math.floor(random.uniform() * (current.length + 1)), 0, pick(random, REPLACEMENTS));
    return { root, what: `${where} array ${['emptied', 'first repeated', 'reversed', 'value inserted'][action]}` };
  }
  if (kind === 4 && current !== null && typeof current === 'object' && !Array.isArray(current)) {
    current[pick(random, ['extra', 'mass_kg', 'kind', 'speeds_mps'])] = pick(random, REPLACEMENTS);
    return { root, what: `${where} key added` };
  }
  if (kind === 5) return { root: set([current]), what: `${where} wrapped in an array` };
  const value = pick(random, REPLACEMENTS);
  return { root: set(JSON.parse(JSON.stringify(value)) as Json), what: `${where} = ${JSON.stringify(value).slice(0, 40)}` };
}

/** Text-level faults of a JSON file. */
function mutateText(text: string, random: RandomSource): { text: string; what: string } {
  const at = Math.floor(random.uniform() * text.length);
  switch (Math.floor(random.uniform() * 3)) {
    case 0:
      return { text: text.slice(0, at), what: `cut at byte ${at}` };
    case 1:
      return { text: `${text.slice(0, at)}${pick(random, ['\u0000', '{', '"', ',', '\ufffd', ']'])}${text.slice(at)}`, what: `stray character at ${at}` };
    default: {
      const key = /"([A-Za-z_]+)": /g;
      const matches = [...text.matchAll(key)];
      if (matches.length === 0) return { text: text.slice(0, at), what: `cut at byte ${at}` };
      const match = pick(random, matches);
      return { text: text.replace(match[0], `${match[0]}0, ${match[0]}`), what: `key "${match[1]}" repeated` };
    }
  }
}

/** 1–3 mutations of a JSON file's text; mostly structural, one in six at the text level. */
export function mutateJson(text: string, random: RandomSource): { text: string; what: string[] } {
  if (random.uniform() < 1 / 6) {
    const fault = mutateText(text, random);
    return { text: fault.text, what: [fault.what] };
  }
  let root = JSON.parse(text) as Json;
  const what: string[] = [];
  const count = 1 + Math.floor(random.uniform() * 3);
  for (let k = 0; k < count; k += 1) {
    const step = mutateValue(root, random);
    root = step.root;
    what.push(step.what);
  }
  return { text: JSON.stringify(root, null, 2), what };
}
