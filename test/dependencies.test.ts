import { readFileSync, readdirSync, statSync } from 'node:fs';
import { builtinModules } from 'node:module';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { build, type Metafile } from 'esbuild';
import { beforeAll, describe, expect, it } from 'vitest';

// Every dependency earns its place: a package in `dependencies` ships to every user, so each must be
// imported by the program (the library entry or the CLI), and nothing the program imports may be
// missing from it. The import graph is esbuild's (the bundler the CLI is built with): every module
// reachable from src/index.ts and src/cli/main.ts, with each import's kind (static or dynamic).

const ROOT = fileURLToPath(new URL('..', import.meta.url));
const manifest = JSON.parse(readFileSync(join(ROOT, 'package.json'), 'utf8')) as {
  dependencies: Record<string, string>;
  devDependencies: Record<string, string>;
  scripts: Record<string, string>;
};

/** The package a bare import specifier names ('ajv/dist/x' → 'ajv', '@types/node' → '@types/node'). */
const packageOf = (specifier: string): string =>
  specifier
    .split('/')
    .slice(0, specifier.startsWith('@') ? 2 : 1)
    .join('/');
const isBuiltin = (specifier: string): boolean => specifier.startsWith('node:') || builtinModules.includes(specifier);

interface PackageImport {
  readonly importer: string;
  readonly kind: string;
}

let imports: Map<string, PackageImport[]>;
/** Imports of our own modules: importer → [imported path, kind]. */
let ownImports: { importer: string; path: string; kind: string }[];

beforeAll(async () => {
  const result = await build({
    entryPoints: [join(ROOT, 'src/index.ts'), join(ROOT, 'src/cli/main.ts')],
    bundle: true,
    write: false,
    metafile: true,
    platform: 'node',
    format: 'esm',
    packages: 'external',
    outdir: join(ROOT, 'dist-graph-unused'),
    logLevel: 'silent',
  });
  const metafile: Metafile = result.metafile;
  imports = new Map();
  ownImports = Object.entries(metafile.inputs).flatMap(([importer, input]) =>
    input.imports.filter((found) => found.external !== true).map((found) => ({ importer, path: found.path, kind: found.kind })),
  );
  const add = (name: string, entry: PackageImport): void => {
    imports.set(name, [...(imports.get(name) ?? []), entry]);
  };
  for (const [importer, input] of Object.entries(metafile.inputs)) {
    for (const found of input.imports) {
      if (found.external === true && !isBuiltin(found.path)) add(packageOf(found.path), { importer, kind: found.kind });
    }
    // The precompiled validators load ajv's runtime helpers through createRequire: require("…") calls.
    for (const match of readFileSync(join(ROOT, importer), 'utf8').matchAll(/\brequire\(\s*['"]([^'"./][^'"]*)['"]\s*\)/g)) {
      if (!isBuiltin(match[1])) add(packageOf(match[1]), { importer, kind: 'require-call' });
    }
  }
});

describe('run-time dependencies (package.json "dependencies") match the import graph of the program', () => {
  it('every dependency is imported by the library or the CLI, and every imported package is a dependency', () => {
    expect([...imports.keys()].sort()).toEqual(Object.keys(manifest.dependencies).sort());
  });

  it('mathjs is imported in one place only (src/core/mathjs.ts), and only dynamically: it is never loaded at start-up', () => {
    expect(imports.get('mathjs')).toEqual([{ importer: 'src/core/mathjs.ts', kind: 'dynamic-import' }]);
  });

  it('jsonc-parser (repeated keys in JSON inputs) is a run-time dependency imported by the strict JSON parser alone', () => {
    expect(manifest.dependencies['jsonc-parser']).toBeDefined();
    expect(imports.get('jsonc-parser')).toEqual([{ importer: 'src/core/json-text.ts', kind: 'import-statement' }]);
  });

  it("d3 (the report's plots) is imported by the report renderer alone, and the renderer only dynamically, by write-report.ts: no other command loads it", () => {
    const d3 = [...imports.entries()].filter(([name]) => name.startsWith('d3-'));
    expect(d3.map(([name]) => name).sort()).toEqual(['d3-array', 'd3-scale', 'd3-shape']);
    for (const [, found] of d3) for (const entry of found) expect(entry.importer).toMatch(/^src\/report\/render\//);
    const renderer = ownImports.filter((entry) => entry.path.startsWith('src/report/render/') && !entry.importer.startsWith('src/report/render/'));
    expect(renderer).toEqual([{ importer: 'src/report/write-report.ts', path: 'src/report/render/index.ts', kind: 'dynamic-import' }]);
    // The renderer is a pure function of plain data: it imports nothing of ours outside src/report/render/ but types
    // and the small pure module that reads a limit at a speed (scripts/bundle-cli.mjs SHARED_PURE: a copy in each bundle).
    const shared = ['src/core/by-speed.ts'];
    const outside = ownImports.filter(
      (entry) => entry.importer.startsWith('src/report/render/') && !entry.path.startsWith('src/report/render/') && !shared.includes(entry.path),
    );
    expect(outside).toEqual([]);
  });

  it('csv-parse, used only by a benchmark, is a development dependency', () => {
    expect(manifest.dependencies['csv-parse']).toBeUndefined();
    expect(manifest.devDependencies['csv-parse']).toBeDefined();
  });
});

/** Every file under a folder (relative to the repository), skipping generated and installed ones. */
function filesUnder(folder: string): string[] {
  const found: string[] = [];
  for (const name of readdirSync(join(ROOT, folder))) {
    const path = join(folder, name);
    if (statSync(join(ROOT, path)).isDirectory()) found.push(...filesUnder(path));
    else if (/\.(ts|mjs|js|json)$/.test(name)) found.push(path);
  }
  return found;
}

describe('development dependencies are each used by the tests, benchmarks, scripts or build', () => {
  it('each is imported, run by an npm script, a type package of something used, or a required peer of another', () => {
    const sources = [...filesUnder('test'), ...filesUnder('bench'), ...filesUnder('scripts'), 'vitest.config.ts']
      .map((path) => readFileSync(join(ROOT, path), 'utf8'))
      .join('\n');
    const tsconfigTypes =
      (JSON.parse(readFileSync(join(ROOT, 'tsconfig.json'), 'utf8')) as { compilerOptions: { types?: string[] } }).compilerOptions.types ?? [];
    const scripts = Object.values(manifest.scripts).join(' ');
    const unused = Object.keys(manifest.devDependencies).filter((name) => {
      const installed = JSON.parse(readFileSync(join(ROOT, 'node_modules', name, 'package.json'), 'utf8')) as { bin?: string | Record<string, string> };
      const bins = typeof installed.bin === 'string' ? [name] : Object.keys(installed.bin ?? {});
      const imported = new RegExp(`(from|import\\()\\s*['"]${name}(/[^'"]*)?['"]`).test(sources);
      const run = bins.some((bin) => new RegExp(`(^|[\\s&;])${bin}\\b`).test(scripts));
      const typesOf = name.startsWith('@types/') ? name.slice('@types/'.length) : null;
      const typeUsed = typesOf !== null && (typesOf in manifest.dependencies || tsconfigTypes.includes(typesOf));
      const peerOf = Object.keys(manifest.devDependencies).some((other) => {
        const otherManifest = JSON.parse(readFileSync(join(ROOT, 'node_modules', other, 'package.json'), 'utf8')) as {
          peerDependencies?: Record<string, string>;
          peerDependenciesMeta?: Record<string, { optional?: boolean }>;
        };
        return otherManifest.peerDependencies?.[name] !== undefined && otherManifest.peerDependenciesMeta?.[name]?.optional !== true;
      });
      return !(imported || run || typeUsed || peerOf);
    });
    expect(unused).toEqual([]);
  });
});

describe('a fresh `npm ci` is quiet', () => {
  it('every installed package with an install script is reviewed in package.json "allowScripts" (npm 11.16+ warns about the others)', () => {
    // Source: npm CLI documentation, `npm install-scripts` / `npm approve-scripts` (the allowScripts field of package.json).
    const lock = JSON.parse(readFileSync(join(ROOT, 'package-lock.json'), 'utf8')) as { packages: Record<string, { hasInstallScript?: boolean }> };
    const withScripts = Object.entries(lock.packages)
      .filter(([path, entry]) => path !== '' && entry.hasInstallScript === true)
      .map(([path]) => path.slice(path.lastIndexOf('node_modules/') + 'node_modules/'.length));
    const allowScripts = (JSON.parse(readFileSync(join(ROOT, 'package.json'), 'utf8')) as { allowScripts?: Record<string, boolean> }).allowScripts ?? {};
    expect(withScripts.length).toBeGreaterThan(0);
    expect(withScripts.filter((name) => typeof allowScripts[name] !== 'boolean')).toEqual([]);
  });
});
