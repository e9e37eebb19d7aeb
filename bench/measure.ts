import { spawnSync } from 'node:child_process';
import { existsSync } from 'node:fs';

/** Wall time of a synchronous or async function, ms. */
export async function timeMs(work: () => unknown): Promise<number> {
  const start = process.hrtime.bigint();
  await work();
  return Number(process.hrtime.bigint() - start) / 1e6;
}

/**
 * Run a whole command as a new process; return its wall time (ms) and peak
 * resident memory (MB, from GNU time's %M; null where /usr/bin/time is absent).
 * Throws if the command fails.
 */
export function measureProcess(command: string, args: readonly string[]): { wall_ms: number; peakMemory_MB: number | null } {
  const useTime = existsSync('/usr/bin/time');
  const start = process.hrtime.bigint();
  const result = useTime
    ? spawnSync('/usr/bin/time', ['-f', 'peak-kb=%M', command, ...args], { encoding: 'utf8', stdio: ['ignore', 'ignore', 'pipe'] })
    : spawnSync(command, [...args], { encoding: 'utf8', stdio: ['ignore', 'ignore', 'pipe'] });
  const wall_ms = Number(process.hrtime.bigint() - start) / 1e6;
  if (result.status !== 0) throw new Error(`${command} ${args.join(' ')} exited ${result.status}: ${result.stderr}`);
  const match = /peak-kb=(\d+)/.exec(result.stderr ?? '');
  return { wall_ms, peakMemory_MB: match ? Number(match[1]) / 1024 : null };
}

export function printFigure(label: string, value: number, unit: string, target?: string): void {
  const shown = Math.abs(value) >= 100 ? value.toFixed(0) : value.toPrecision(3);
  process.stdout.write(`${label.padEnd(58)} ${shown.padStart(10)} ${unit}${target ? `   (target ${target})` : ''}\n`);
}
