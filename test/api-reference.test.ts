/**
 * The supported library API: src/index.ts re-exports it, docs/api.md documents it (generated), and every name in it
 * has a doc comment. Everything else is internal, reachable only by its module path under `speedband/internal/`.
 */
import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { API_ENTRY, apiGroups, apiReferenceMarkdown, apiReferenceOnDisk } from '../scripts/api-text.js';

describe('docs/api.md, the library API reference', () => {
  it('is what the generator makes from src/index.ts today (run `npm run api-reference` after changing the exports or their doc comments)', () => {
    expect(apiReferenceOnDisk()).toBe(apiReferenceMarkdown());
  });

  it('every exported name has a doc comment, and each stage comment of src/index.ts heads a group', () => {
    const groups = apiGroups();
    const undocumented = groups.flatMap((group) => group.entries.filter((entry) => entry.summary === '').map((entry) => `${entry.name} (${entry.module})`));
    expect(undocumented).toEqual([]);
    const stageComments = readFileSync(API_ENTRY, 'utf8').match(/^\/\/ .*$/gm) ?? [];
    expect(groups.map((group) => `// ${group.title}`)).toEqual(stageComments);
    expect(groups.some((group) => group.entries.some((entry) => entry.name === 'buildSchedule'))).toBe(true);
  });

  it('src/index.ts only re-exports, and the package exposes the root and, by module path, the internals', () => {
    const code = readFileSync(API_ENTRY, 'utf8')
      .replace(/\/\*[\s\S]*?\*\//g, '')
      .replace(/^\/\/.*$/gm, '');
    const statements = code
      .split(';')
      .map((text) => text.trim())
      .filter((text) => text !== '');
    for (const statement of statements) expect(statement).toMatch(/^export (type )?\{[^}]*\} from '\.\/[a-z/-]+\.js'$/);
    const pkg = JSON.parse(readFileSync('package.json', 'utf8')) as { exports: Record<string, unknown> };
    expect(Object.keys(pkg.exports).sort()).toEqual(['.', './internal/*', './package.json']);
  });
});
