/**
 * The demo vehicles' identifications and schedules, built once per test run and shared by the test files that
 * only read them (the report's browser and trace tests, the default plans, containment). A build is deterministic
 * (test/pipeline/build.test.ts checks it byte for byte), so a file built by one test file is the file another would
 * build. The files live in a folder made for the run (test/helpers/global-setup.ts); the first test process to ask
 * for one builds it while holding a lock (a folder made atomically), and the others wait for it and read it.
 * Tests of the build itself build their own.
 */
import { createHash } from 'node:crypto';
import { existsSync, mkdirSync, mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { inject } from 'vitest';
import { identifyFromLogs } from '../../src/identify/identify-from-logs.js';
import { readModels, writeModels } from '../../src/identify/models-file.js';
import type { ModelsFile } from '../../src/identify/models-schema.js';
import { BUILD_IDENTIFY_OPTIONS, buildSchedule } from '../../src/pipeline/build-schedule.js';
import type { PartialPlan } from '../../src/schedule/plan.js';
import { readSchedule, writeSchedule } from '../../src/schedule/schedule-file.js';
import type { ScheduleFile } from '../../src/schedule/schedule-types.js';
import { bundledLogs } from './parcel-van.js';

declare module 'vitest' {
  export interface ProvidedContext {
    /** The run's folder of shared demo builds (global-setup.ts). */
    demoBuilds: string;
  }
}

let folder: string | undefined;
function buildsFolder(): string {
  folder ??= inject('demoBuilds') ?? mkdtempSync(join(tmpdir(), 'speedband-demo-builds-'));
  return folder;
}

const sleep = (ms: number) => new Promise((resolve) => setTimeout(resolve, ms));

/** Longest wait for another process's build, ms (a build takes seconds; a process that died holding the lock is not waited for). */
const WAIT_LIMIT_MS = 300_000;

/** The file `name` of the run's folder, made by `make` (which writes it atomically) in the first process to ask. */
async function shared(name: string, make: (path: string) => Promise<void>): Promise<string> {
  const path = join(buildsFolder(), name);
  const lock = `${path}.lock`;
  const started = Date.now();
  const failed = `${path}.failed`;
  for (;;) {
    if (existsSync(path)) return path;
    if (existsSync(failed)) throw new Error(`another test process could not make ${path}: ${readFileSync(failed, 'utf8')}`);
    try {
      mkdirSync(lock);
    } catch {
      if (Date.now() - started > WAIT_LIMIT_MS) throw new Error(`waited ${WAIT_LIMIT_MS} ms for ${path}, locked by another test process`);
      await sleep(50);
      continue;
    }
    if (!existsSync(path)) {
      try {
        await make(path);
      } catch (error) {
        writeFileSync(failed, error instanceof Error ? (error.stack ?? error.message) : String(error));
        throw error;
      }
    }
    return path;
  }
}

const models = new Map<string, Promise<{ readonly path: string; readonly models: ModelsFile }>>();

/** A demo vehicle identified from its bundled logs as `build` identifies (models.json in the run's folder). */
export function demoModels(vehicle: string): Promise<{ readonly path: string; readonly models: ModelsFile }> {
  let found = models.get(vehicle);
  if (found === undefined) {
    found = shared(`${vehicle}-models.json`, async (path) => {
      const identified = identifyFromLogs({
        vehicle: join('vehicles', vehicle),
        logPaths: bundledLogs(join('vehicles', vehicle)),
        options: BUILD_IDENTIFY_OPTIONS,
      });
      writeModels(path, identified, { force: false });
    }).then((path) => ({ path, models: readModels(path) }));
    models.set(vehicle, found);
  }
  return found;
}

const schedules = new Map<string, Promise<{ readonly path: string; readonly schedule: ScheduleFile }>>();

/** Object keys sorted at every level: one name per plan, however it was written. */
const canonical = (value: unknown): unknown =>
  Array.isArray(value)
    ? value.map(canonical)
    : value !== null && typeof value === 'object'
      ? Object.fromEntries(
          Object.keys(value as object)
            .sort()
            .map((key) => [key, canonical((value as Record<string, unknown>)[key])]),
        )
      : value;

/**
 * The schedule `build --logs` writes for a demo vehicle's bundled logs with `plan` (default: the default plan), in the
 * run's folder: its path and content. It is written whatever its status; each test says what it expects of it.
 */
export function demoSchedule(vehicle: string, plan: PartialPlan = {}): Promise<{ readonly path: string; readonly schedule: ScheduleFile }> {
  const text = JSON.stringify(canonical(plan));
  const key = `${vehicle} ${text}`;
  let found = schedules.get(key);
  if (found === undefined) {
    const index = createHash('sha256').update(text).digest('hex').slice(0, 16);
    found = shared(`${vehicle}-schedule-${index}.json`, async (path) => {
      const { models: identified } = await demoModels(vehicle);
      const { schedule } = await buildSchedule({ vehicle: join('vehicles', vehicle), logPaths: [], models: identified, plan });
      writeSchedule(path, schedule, { force: false });
    }).then((path) => ({ path, schedule: readSchedule(path) }));
    schedules.set(key, found);
  }
  return found;
}
