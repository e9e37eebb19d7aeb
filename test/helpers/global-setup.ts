/**
 * Once per test run: the folder of shared demo builds (demo-builds.ts), removed when the run ends. A new folder each run,
 * so that a build is never taken from an earlier run of other code.
 */
import { mkdtempSync, rmSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import type { TestProject } from 'vitest/node';

export default function setup(project: TestProject): () => void {
  const folder = mkdtempSync(join(tmpdir(), 'speedband-demo-builds-'));
  project.provide('demoBuilds', folder);
  return () => rmSync(folder, { recursive: true, force: true });
}
