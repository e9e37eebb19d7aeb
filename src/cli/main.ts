import yargs from 'yargs';
import { isatty } from 'node:tty';
import { exitCodeForError } from '../core/error-codes.js';
import { describeError, isSpeedbandError } from '../core/errors.js';
import { safeMessageText } from '../core/quote.js';
import type { AnyCommand, CommandModule } from './command.js';
import { COMMANDS } from './commands/index.js';
import { EXIT, processIo, type CommandIo } from './io.js';
import { SAFETY_EPILOGUE } from '../core/safety.js';
import { VERSION } from '../version.js';

export interface RunOptions {
  /** The commands to offer (default: all of speedband's); tests pass a command made with other dependencies. */
  readonly commands?: readonly AnyCommand[];
}

/**
 * Run the CLI on an argument vector and return the exit code.
 * Usage errors and `SpeedbandError`s become a message on stderr and exit 2 (code `internal`: 3,
 * src/core/error-codes.ts); anything else is a bug (exit 3).
 */
export async function runCli(argv: readonly string[], io: CommandIo = processIo, options: RunOptions = {}): Promise<number> {
  let exitCode: number = EXIT.ok;
  let parser = yargs()
    .scriptName('speedband')
    .usage(
      'speedband — speed-scheduled steering gains from step-steer test logs\n\n' +
        'Usage: speedband <command> [options]\n\n' +
        'Units: SI everywhere (m, s, rad, m/s, rad/s) unless an option says otherwise. ' +
        'Axes follow ISO 8855: x forward, y left, z up; positive steer and yaw rate are to the left.',
    )
    .version(VERSION)
    .strict()
    .recommendCommands()
    .demandCommand(1, 'Name a command: speedband <command> --help shows its options.')
    .wrap(Math.min(110, terminalColumns() ?? 100))
    .epilogue(SAFETY_EPILOGUE)
    .exitProcess(false)
    .fail((message, error) => {
      if (error) throw error;
      throw new UsageError(message ?? 'invalid usage');
    });

  for (const module of options.commands ?? COMMANDS) {
    parser = parser.command(
      module.command,
      module.describe,
      (y) => {
        let built = module.builder(y);
        for (const [example, meaning] of module.examples ?? []) built = built.example(example, meaning);
        return built.epilogue([...(module.epilogue === undefined ? [] : [module.epilogue]), exitCodesText(module), SAFETY_EPILOGUE].join('\n\n'));
      },
      async (args) => {
        exitCode = await module.run(args, io);
      },
    );
  }

  skipHelpCache(parser);
  try {
    await parser.parseAsync([...argv], {}, (error, _argv, output) => {
      if (output) (error ? io.stderr : io.stdout)(output.endsWith('\n') ? output : `${output}\n`);
    });
    return exitCode;
  } catch (error) {
    const json = wantsJson(argv);
    if (error instanceof UsageError) {
      return reportError(
        io,
        json,
        EXIT.badInput,
        { code: 'cli.usage', message: safeMessageText(error.message), location: {} },
        `speedband: ${safeMessageText(error.message)}`,
      );
    }
    if (isSpeedbandError(error)) {
      const report = { code: error.code, message: safeMessageText(error.message), location: error.location };
      // Standard output itself failed: the error can only go to standard error.
      return reportError(io, json && error.code !== 'output.stdoutFailed', exitCodeForError(error.code), report, `speedband: ${describeError(error)}`);
    }
    const stack = safeMessageText((error as Error).stack ?? String(error));
    return reportError(
      io,
      json,
      EXIT.internal,
      { code: 'internal', message: `internal error — please report it with the command you ran: ${stack}`, location: {} },
      `speedband: internal error — please report it with the command you ran:\n${stack}`,
    );
  }
}

/** `--json` given (the last of --json / --no-json / --json=BOOLEAN wins, as yargs reads them). */
function wantsJson(argv: readonly string[]): boolean {
  let json = false;
  for (const argument of argv) {
    if (argument === '--') break;
    if (argument === '--json' || argument === '--json=true') json = true;
    if (argument === '--no-json' || argument === '--json=false') json = false;
  }
  return json;
}

/**
 * An error as words on standard error, and — under --json — as JSON on standard output too:
 * {"error": {"code", "message", "location"}}, so that a script reading the output always gets JSON.
 */
function reportError(io: CommandIo, json: boolean, exitCode: number, error: { code: string; message: string; location: object }, words: string): number {
  io.stderr(`${words}\n`);
  if (json) {
    try {
      io.stdout(`${JSON.stringify({ error: { code: error.code, message: error.message, location: error.location } }, null, 2)}\n`);
    } catch {
      /* standard output failed as well: the words went to standard error */
    }
  }
  return exitCode;
}

/** The exit codes of a command, for its --help. */
function exitCodesText(module: CommandModule): string {
  const lines = [...module.exitCodes, [3, 'a bug in speedband: please report it with the command you ran'] as const].map(
    ([code, meaning]) => `  ${code}  ${meaning}`,
  );
  return `Exit codes:\n${lines.join('\n')}`;
}

class UsageError extends Error {}

/** The terminal's width when standard output is one (process.stdout is not touched otherwise: io writes to fd 1 itself). */
function terminalColumns(): number | undefined {
  return isatty(1) ? process.stdout.columns : undefined;
}

/**
 * yargs renders the whole help text after starting every command, to show it should the command
 * fail later (50–90 ms: text wrapping of every option and example). Our `.fail` throws instead of
 * printing help, so that text is never used: the cache step is made a no-op on this parser's usage
 * instance (yargs 18 internals, pinned in package.json; without them nothing changes). `--help` and
 * usage errors render help as before.
 */
function skipHelpCache(parser: unknown): void {
  const internals = (parser as { getInternalMethods?: () => { getUsageInstance?: () => { cacheHelpMessage?: unknown } } }).getInternalMethods?.();
  const usage = internals?.getUsageInstance?.();
  if (usage !== undefined && typeof usage.cacheHelpMessage === 'function') usage.cacheHelpMessage = () => {};
}
