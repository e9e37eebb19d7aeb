/**
 * The repository stands alone: every document that code, tests, scripts or docs cite (a `*.md` path, or
 * `docs/domain.md §n`) is in the repository and, for a section, has that section.
 */
import { existsSync, readdirSync, readFileSync, statSync } from 'node:fs';
import { dirname, join, relative } from 'node:path';
import { describe, expect, it } from 'vitest';

const ROOTS = ['src', 'test', 'bench', 'scripts', 'docs', 'README.md', 'DEVELOPERS.md'];
const SKIP = new Set(['node_modules', 'dist', '.git']);

function files(path: string): string[] {
  if (!existsSync(path)) return [];
  if (statSync(path).isFile()) return [path];
  return readdirSync(path)
    .filter((name) => !SKIP.has(name))
    .flatMap((name) => files(join(path, name)));
}

const sources = ROOTS.flatMap(files).filter((file) => /\.(ts|mjs|js|md)$/.test(file) && !file.endsWith('precompiled-validators.ts'));
const domainSections = new Set([...readFileSync('docs/domain.md', 'utf8').matchAll(/^## (\d+b?)\./gm)].map((match) => match[1]));

describe('citations of documents', () => {
  it('every cited *.md file exists in the repository (relative to the citing file or the repository root)', () => {
    const missing: string[] = [];
    for (const file of sources) {
      const text = readFileSync(file, 'utf8');
      for (const match of text.matchAll(/(?<![\w/.-])((?:\.\.?\/|[\w-]+\/)*[\w-]+\.md)\b/g)) {
        const cited = match[1];
        if (text.slice(Math.max(0, (match.index ?? 0) - 2), match.index).endsWith('> ')) continue; // an output file in a shell example
        if (cited.startsWith('../shared') || !(existsSync(cited) || existsSync(join(dirname(file), cited)))) missing.push(`${relative('.', file)}: ${cited}`);
      }
    }
    expect(missing).toEqual([]);
  });

  it('every "docs/domain.md §n" names a section the reference has', () => {
    const unknown: string[] = [];
    let citations = 0;
    for (const file of sources) {
      for (const match of readFileSync(file, 'utf8').matchAll(/docs\/domain\.md §(\d+b?)/g)) {
        citations++;
        if (!domainSections.has(match[1])) unknown.push(`${relative('.', file)}: §${match[1]}`);
      }
    }
    expect(unknown).toEqual([]);
    expect(citations).toBeGreaterThan(50);
  });
});
