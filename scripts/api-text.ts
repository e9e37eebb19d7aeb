/**
 * The API reference (docs/api.md), generated from src/index.ts: every name the package exports, by the stage comment it stands under in src/index.ts, with its kind, its module and the
 * first paragraph of its doc comment. `npm run api-reference` writes it; test/api-reference.test.ts fails when
 * it is stale or when an exported name has no doc comment.
 */
import { readFileSync } from 'node:fs';
import { dirname, join } from 'node:path';
import { fileURLToPath } from 'node:url';

const ROOT = join(dirname(fileURLToPath(import.meta.url)), '..');
export const API_ENTRY = join(ROOT, 'src', 'index.ts');
export const API_REFERENCE_PATH = join(ROOT, 'docs/api.md');

export interface ApiEntry {
  readonly name: string;
  readonly kind: 'function' | 'constant' | 'type' | 'class';
  /** The module it is defined in, relative to src/. */
  readonly module: string;
  /** First paragraph of its doc comment, one line ('' when it has none). */
  readonly summary: string;
}

export interface ApiGroup {
  readonly title: string;
  readonly entries: readonly ApiEntry[];
}

/** The declaration of `name` in a module's text: its kind and the doc comment right above it. */
function declarationIn(text: string, name: string, module: string): { kind: ApiEntry['kind']; summary: string } {
  const pattern = new RegExp(`^export (?:declare )?(?:((?:async )?function\\*? )|(const|let) |(interface|type) |(class) )${name}\\b`, 'm');
  const match = pattern.exec(text);
  if (match === null) throw new Error(`${name} is exported by src/index.ts from ${module}, which does not declare it (export it from the module that does)`);
  const before = text.slice(0, match.index).trimEnd();
  const comment = before.endsWith('*/') ? before.slice(before.lastIndexOf('/**')) : '';
  const summary = comment
    .replace(/^\/\*\*|\*\/$/g, '')
    .split('\n')
    .map((line) => line.replace(/^\s*\* ?/, ''))
    .join('\n')
    .trim()
    .split(/\n\s*\n/)[0]
    .replace(/\s+/g, ' ')
    .trim();
  const isArrow = match[2] !== undefined && new RegExp(`^export const ${name}\\b[^=]*=\\s*(?:async\\s*)?(?:<[^>]*>)?\\(`, 'm').test(text);
  const kind: ApiEntry['kind'] =
    match[1] !== undefined ? 'function' : match[3] !== undefined ? 'type' : match[4] !== undefined ? 'class' : isArrow ? 'function' : 'constant';
  return { kind, summary };
}

/** The exported names of src/index.ts, grouped under its `//` stage comments, in file order. */
export function apiGroups(): ApiGroup[] {
  const index = readFileSync(API_ENTRY, 'utf8');
  const groups: { title: string; entries: ApiEntry[] }[] = [];
  const statement = /(?:^\/\/ (.*)\n)?^export (type )?\{([^}]*)\} from '\.\/([^']+)\.js';/gm;
  for (let match = statement.exec(index); match !== null; match = statement.exec(index)) {
    if (match[1] !== undefined || groups.length === 0) groups.push({ title: match[1] ?? 'General', entries: [] });
    const module = `${match[4]}.ts`;
    const text = readFileSync(join(ROOT, 'src', module), 'utf8');
    for (const item of match[3]
      .split(',')
      .map((part) => part.trim())
      .filter((part) => part !== '')) {
      const name = item
        .replace(/^type\s+/, '')
        .split(/\s+as\s+/)
        .pop()!;
      const local = item.replace(/^type\s+/, '').split(/\s+as\s+/)[0];
      const found = declarationIn(text, local, module);
      groups[groups.length - 1].entries.push({ name, module, ...found });
    }
  }
  return groups;
}

/** The text of docs/api.md. */
export function apiReferenceMarkdown(groups: readonly ApiGroup[] = apiGroups()): string {
  const cell = (text: string): string => text.replace(/\|/g, '\\|');
  const lines = [
    '# speedband library API',
    '',
    'Generated from `src/index.ts` by `npm run api-reference` — do not edit by hand.',
    '',
    "What `import { … } from 'speedband'` gives: the supported API, by pipeline stage. Every other module is internal:",
    'reachable as `speedband/internal/<stage>/<module>.js` (the compiled tree), with no promise that it stays as it is.',
    'Units are in the names (`speed_mps`, `phaseMargin_deg`); errors are `SpeedbandError` with a code from',
    'docs/errors.md.',
    '',
  ];
  for (const group of groups) {
    lines.push(`## ${group.title}`, '', '| name | kind | module | what it is |', '|---|---|---|---|');
    for (const entry of group.entries) lines.push(`| \`${entry.name}\` | ${entry.kind} | \`${entry.module}\` | ${cell(entry.summary)} |`);
    lines.push('');
  }
  return `${lines.join('\n')}`;
}

/** The current file, for the staleness test. */
export const apiReferenceOnDisk = (): string => readFileSync(API_REFERENCE_PATH, 'utf8');
