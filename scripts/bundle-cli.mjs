// Bundle the built CLI (dist/cli/main.js and everything it imports, yargs and ml-matrix included)
// into one ES module, dist/cli/speedband.bundle.js, which bin/speedband.js loads. One file instead of
// ~150 modules saves their resolution, reading and linking at every start (measured in DEVELOPERS.md,
// "Performance"). The bundle sits in dist/cli/ like the module it replaces, so paths resolved from
// import.meta.url (the bundled vehicles, ajv's runtime helpers) point where they did. Identifiers are
// kept, so stack traces in "internal error" reports still name our functions.
import { build } from 'esbuild';

await build({
  entryPoints: ['dist/cli/main.js'],
  outfile: 'dist/cli/speedband.bundle.js',
  bundle: true,
  platform: 'node',
  format: 'esm',
  target: 'node20',
  minifyWhitespace: true,
  minifySyntax: true,
  minifyIdentifiers: false,
  legalComments: 'eof',
  logLevel: 'warning',
  // jsonc-parser's "main" is a UMD build that loads its parts with a dynamic require esbuild cannot follow;
  // its ES module build bundles cleanly (Node itself, unbundled, loads the UMD build fine).
  alias: { 'jsonc-parser': 'jsonc-parser/lib/esm/main.js' },
});
