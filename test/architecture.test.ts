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
