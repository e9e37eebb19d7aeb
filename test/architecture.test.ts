/**
 * The layering of src/ is the pipeline's order: a folder imports only the folders below it, so the stages
 * can be read, tested and replaced from the bottom up. A new folder must be given its place here.
 */
import { readdirSync, readFileSync, statSync } from 'node:fs';
import { dirname, join, normalize, relative, sep } from 'node:path';
import { describe, expect, it } from 'vitest';

/** Rank of each folder of src/: imports may only go to a lower rank (or stay inside the folder). */
export const LAYERS: Readonly<Record<string, number>> = {
  core: 0,
  lti: 1,
  controller: 2,
  vehicle: 2,
  log: 2,
  identify: 3,
  loops: 4,
  verify: 5,
  tuning: 6,
  performance: 7,
  schedule: 8,
  robust: 9,
  export: 10,
  compare: 10,
  pipeline: 11,
  report: 12,
  cli: 13,
};

function sourceFiles(folder: string): string[] {
  return readdirSync(folder).flatMap((name) => {
    const path = join(folder, name);
    return statSync(path).isDirectory() ? sourceFiles(path) : path.endsWith('.ts') ? [path] : [];
  });
}

const folderOf = (file: string): string => relative('src', file).split(sep)[0];

describe('layering of src/ (import graph)', () => {
  const files = sourceFiles('src').filter((file) => relative('src', file).includes(sep));
  it('every folder of src/ has a layer', () => {
    const folders = [...new Set(files.map(folderOf))].sort();
    expect(folders.filter((folder) => LAYERS[folder] === undefined)).toEqual([]);
  });

  it('no module imports from a folder at its own layer or above (other than its own folder)', () => {
    const upward: string[] = [];
    for (const file of files) {
      const from = folderOf(file);
      const text = readFileSync(file, 'utf8');
      for (const match of text.matchAll(/(?:from|import)\s*\(?\s*'(\.{1,2}\/[^']+)'/g)) {
        const target = normalize(join(dirname(file), match[1]));
        if (!target.startsWith(`src${sep}`)) continue;
        const to = folderOf(target);
        if (to === from || !target.slice(4).includes(sep)) continue;
        if (!(LAYERS[to] < LAYERS[from]))
          upward.push(`${relative('.', file)} (${from}, layer ${LAYERS[from]}) imports ${match[1]} (${to}, layer ${LAYERS[to]})`);
      }
    }
    expect(upward).toEqual([]);
  });
});

/** The modules `file` loads when it runs: its value imports and re-exports, followed (type-only imports are erased). */
function loadedModules(entry: string): Map<string, string | null> {
  const reachedFrom = new Map<string, string | null>([[entry, null]]);
  const queue = [entry];
  while (queue.length > 0) {
    const file = queue.shift() as string;
    const text = readFileSync(file, 'utf8');
    for (const match of text.matchAll(/^(import|export)(?!\s+type\b)[^;]*?\bfrom\s*'(\.{1,2}\/[^']+)'/gms)) {
      const target = normalize(join(dirname(file), match[2])).replace(/\.js$/, '.ts');
      if (reachedFrom.has(target)) continue;
      reachedFrom.set(target, file);
      queue.push(target);
    }
  }
  return reachedFrom;
}

describe('what the worker threads load', () => {
  // A build starts them on every core; the file validators (src/core/precompiled-validators.ts, ~0.9 MB) read files,
  // which a worker never does. From the sources each module also costs a worker its compilation under tsx.
  it.each(['check-worker', 'scenario-worker'])('src/pipeline/%s.ts reaches no file validator', (name) => {
    const reached = loadedModules(join('src', 'pipeline', `${name}.ts`));
    const validators = join('src', 'core', 'precompiled-validators.ts');
    const chain: string[] = [];
    for (let file: string | null | undefined = validators; reached.has(validators) && file; file = reached.get(file)) chain.unshift(file);
    expect(chain.join(' → ')).toBe('');
    expect(reached.size).toBeGreaterThan(20);
  });
});
