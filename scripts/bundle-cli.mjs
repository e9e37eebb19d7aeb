// Bundle the built CLI (dist/cli/main.js and everything it imports, yargs and ml-matrix included)
// into one ES module, dist/cli/speedband.bundle.js, which bin/speedband.js loads. One file instead of
// ~150 modules saves their resolution, reading and linking at every start (measured in DEVELOPERS.md,
// "Performance"). The bundle sits in dist/cli/ like the module it replaces, so paths resolved from
// import.meta.url (the bundled vehicles, ajv's runtime helpers) point where they did. Identifiers are
// kept, so stack traces in "internal error" reports still name our functions.
//
// mathjs is not in it: src/core/mathjs.ts imports it lazily (`await import('mathjs')`), and here that
// import becomes `import('./mathjs.bundle.js')`, a second file beside the bundle holding only what
// `create` and `all` need. `--help` and a build without unit or speed expressions never read it; the
// paths that need mathjs load one pre-linked file (≈ 0.15 s) instead of mathjs's ~1,000 modules
// (≈ 1 s). A static import of mathjs anywhere in the CLI is refused here.
//
// The HTML report's renderer is a chunk of its own in the same way: src/report/write-report.ts imports
// `./render/index.js` dynamically, and here that import becomes `import('./report.bundle.js')`, a file holding
// the renderer and d3 (d3-scale, d3-shape, d3-array). Only `report` and `build --report` read it. The renderer
// is a pure function of plain data: the chunk may hold nothing but src/report/render/ and d3's packages —
// a module with state (an error class, a cache) duplicated in two bundles would be two different modules —
// and a static import of the renderer, or of d3 anywhere, is refused.
import { build } from 'esbuild';

const common = {
  bundle: true,
  platform: 'node',
  format: 'esm',
  target: 'node20',
  minifyWhitespace: true,
  minifySyntax: true,
  minifyIdentifiers: false,
  legalComments: 'eof',
  logLevel: 'warning',
};

const MATHJS_CHUNK = './mathjs.bundle.js';

/** `import('mathjs')` → the separate chunk; a static import of mathjs is an error. */
const mathjsChunk = {
  name: 'mathjs-chunk',
  setup(bundler) {
    bundler.onResolve({ filter: /^mathjs(\/.*)?$/ }, (args) => {
      if (args.kind !== 'dynamic-import' || args.path !== 'mathjs') {
        return {
          errors: [
            {
              text: `${args.importer} imports "${args.path}" statically (${args.kind}): load mathjs only with \`await import('mathjs')\` (src/core/mathjs.ts)`,
            },
          ],
        };
      }
      return { path: MATHJS_CHUNK, external: true };
    });
  },
};

await build({
  ...common,
  stdin: { contents: "export { create, all } from 'mathjs';", resolveDir: process.cwd(), sourcefile: 'mathjs-chunk.js' },
  outfile: 'dist/cli/mathjs.bundle.js',
});

const REPORT_CHUNK = './report.bundle.js';
const REPORT_RENDERER = /[\\/]report[\\/]render[\\/]index\.js$/;
const D3 = /^(d3-[a-z-]+|internmap)(\/.*)?$/;

/** `import('./render/index.js')` of write-report.js → the report chunk; a static import of it, or of d3, is an error. */
const reportChunk = {
  name: 'report-chunk',
  setup(bundler) {
    bundler.onResolve({ filter: /render[\\/]index\.js$/ }, (args) => {
      if (!REPORT_RENDERER.test(`${args.resolveDir}/${args.path}`.replace(/\/\.\//g, '/'))) return undefined;
      if (args.kind !== 'dynamic-import') {
        return {
          errors: [
            {
              text: `${args.importer} imports the report renderer statically (${args.kind}): load it only with \`await import('./render/index.js')\` (src/report/write-report.ts)`,
            },
          ],
        };
      }
      return { path: REPORT_CHUNK, external: true };
    });
    bundler.onResolve({ filter: D3 }, (args) => ({
      errors: [
        {
          text: `${args.importer} imports "${args.path}" into the main bundle: d3 belongs to the report renderer (src/report/render/), loaded as its own chunk`,
        },
      ],
    }));
  },
};

// Small pure modules over plain data the renderer may share with the main bundle (a copy in each chunk, no state).
const SHARED_PURE = ['dist/core/by-speed.js'];
const reportBuild = await build({
  ...common,
  entryPoints: ['dist/report/render/index.js'],
  outfile: 'dist/cli/report.bundle.js',
  metafile: true,
});
const strays = Object.keys(reportBuild.metafile.inputs).filter(
  (input) => !/^dist\/report\/render\//.test(input) && !/node_modules\/(d3-[a-z-]+|internmap)\//.test(input) && !SHARED_PURE.includes(input),
);
if (strays.length > 0) {
  throw new Error(
    `the report chunk may hold only src/report/render/, d3 and ${SHARED_PURE.join(', ')}, but also bundles: ${strays.join(', ')} — pass what the renderer needs in ReportData instead of importing it`,
  );
}

await build({
  ...common,
  entryPoints: ['dist/cli/main.js'],
  outfile: 'dist/cli/speedband.bundle.js',
  plugins: [mathjsChunk, reportChunk],
  // jsonc-parser's "main" is a UMD build that loads its parts with a dynamic require esbuild cannot follow;
  // its ES module build bundles cleanly (Node itself, unbundled, loads the UMD build fine).
  alias: { 'jsonc-parser': 'jsonc-parser/lib/esm/main.js' },
});

// The worker thread of the parallel dense check (src/pipeline/parallel-check.ts resolves `./check-worker.js` beside
// the module that starts it — here, beside the bundle).
await build({
  ...common,
  entryPoints: ['dist/pipeline/check-worker.js'],
  outfile: 'dist/cli/check-worker.js',
  plugins: [mathjsChunk],
  alias: { 'jsonc-parser': 'jsonc-parser/lib/esm/main.js' },
});

// The helper thread of the scenario stage (src/pipeline/scenario-stage.ts resolves `./scenario-worker.js` beside the
// module that starts it — here, beside the bundle). It needs no mathjs: a schedule's lookup and the simulator only.
await build({
  ...common,
  entryPoints: ['dist/pipeline/scenario-worker.js'],
  outfile: 'dist/cli/scenario-worker.js',
  plugins: [mathjsChunk],
  alias: { 'jsonc-parser': 'jsonc-parser/lib/esm/main.js' },
});
