import type { Argv } from 'yargs';
import type { CommandIo } from './io.js';

/**
 * One CLI command: its yargs definition and a thin `run` that calls the
 * library. `run` returns the exit code; it throws `SpeedbandError` for bad
 * input, which the CLI turns into words and exit code 2. `O` is the options'
 * type as yargs infers it from the builder (write commands with `defineCommand`,
 * so `run` reads typed options: no `String(args.x)`).
 */
export interface CommandModule<O = Record<string, unknown>> {
  /** yargs command string, e.g. 'inspect <logs..>'. */
  readonly command: string;
  readonly describe: string;
  readonly builder: (yargs: Argv) => Argv<O>;
  readonly examples?: ReadonlyArray<readonly [string, string]>;
  /** What each exit code means for this command (0, 1, 2; 3, a bug, is added for every command). Shown in --help. */
  readonly exitCodes: ReadonlyArray<readonly [0 | 1 | 2, string]>;
  /** Text after the options in --help, before the exit codes and the safety cautions. */
  readonly epilogue?: string;
  readonly run: (args: O, io: CommandIo) => Promise<number>;
}

/** A command whose `run` takes the options its builder declares, typed (yargs' inferred types). */
export const defineCommand = <O>(module: CommandModule<O>): CommandModule<O> => module;

/** Any command, for the list of commands (each checked against its own options by `defineCommand`). */
// biome-ignore lint/suspicious/noExplicitAny: the list holds commands of different option types
export type AnyCommand = CommandModule<any>;

/** The options a builder declares, as yargs infers them: `type Args = OptionsOf<typeof builder>`. */
export type OptionsOf<B extends (yargs: Argv) => Argv<unknown>> = ReturnType<B> extends Argv<infer O> ? O : never;
