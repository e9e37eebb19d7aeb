/**
 * How to write a speedband command so that it runs where it is printed (the demo's "Next:" lines):
 * `npx speedband` inside the package's folder (npx finds the package's own binary), `speedband` when the
 * command on PATH is this installation, else `node <path to bin/speedband.js>`.
 */
import { accessSync, constants, realpathSync } from 'node:fs';
import { delimiter, join, relative } from 'node:path';
import { fileURLToPath } from 'node:url';
import { shownPath } from '../vehicle/bundled.js';

/** The package's folder (…/ beside src/ or dist/; the CLI bundle sits in dist/cli/). */
const PACKAGE_ROOT = fileURLToPath(new URL('../../', import.meta.url));
const BINARY = join(PACKAGE_ROOT, 'bin', 'speedband.js');

const real = (path: string): string | undefined => {
  try {
    return realpathSync(path);
  } catch {
    return undefined;
  }
};

/** The `speedband` found first on PATH, when it is this installation's binary. */
function onPath(): boolean {
  const binary = real(BINARY);
  for (const folder of (process.env.PATH ?? '').split(delimiter).filter((entry) => entry !== '')) {
    const candidate = join(folder, 'speedband');
    try {
      accessSync(candidate, constants.X_OK);
    } catch {
      continue;
    }
    return binary !== undefined && real(candidate) === binary;
  }
  return false;
}

/** The words that start a speedband command run from the working folder. */
export function commandPrefix(): string {
  const inside = relative(PACKAGE_ROOT, process.cwd());
  if (!inside.startsWith('..') && !inside.startsWith('/')) return 'npx speedband';
  if (onPath()) return 'speedband';
  return `node ${shownPath(BINARY)}`;
}
