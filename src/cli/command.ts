import type { Argv } from 'yargs';
import type { CommandIo } from './io.js';

/**
 * One CLI command: its yargs definition and a thin `run` that calls the
 * library. `run` returns the exit code; it throws `SpeedbandError` for bad
 * input, which the CLI turns into words and exit code 2.
 */
export interface CommandModule {
  /** yargs command string, e.g. 'inspect <logs..>'. */
  readonly command: string;
  readonly describe: string;
  readonly builder: (yargs: Argv) => Argv;
  readonly examples?: ReadonlyArray<readonly [string, string]>;
  /** What each exit code means for this command (0, 1, 2; 3, a bug, is added for every command). Shown in --help. */
  readonly exitCodes: ReadonlyArray<readonly [0 | 1 | 2, string]>;
  /** Text after the options in --help, before the exit codes and the safety cautions. */
  readonly epilogue?: string;
  readonly run: (args: Record<string, unknown>, io: CommandIo) => Promise<number>;
}
