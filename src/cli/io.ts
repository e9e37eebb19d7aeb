import { SpeedbandError } from '../core/errors.js';
import { describeFileError } from '../core/files.js';
import { writeAllSync, type WriteCall } from '../core/write-all.js';
import { isatty } from 'node:tty';

/** Where a command writes. Tests pass a recorder; the binary passes the process streams. */
export interface CommandIo {
  readonly stdout: (text: string) => void;
  readonly stderr: (text: string) => void;
  /** Progress lines for long work; silent when not a terminal or with --quiet. */
  readonly progress: (text: string) => void;
}

/**
 * Io on file descriptors, written synchronously and completely (src/core/write-all.ts): a failed write
 * to standard output (a full disk ENOSPC, a closed pipe EPIPE) throws `output.stdoutFailed`, which the
 * CLI reports with exit 2 — never a truncated file with exit 0. Failures on standard error are
 * ignored (there is nowhere left to report them).
 */
export function fileDescriptorIo(stdoutFd: number, stderrFd: number, write?: WriteCall): CommandIo {
  const toStderr = (text: string): void => {
    try {
      writeAllSync(stderrFd, text, write);
    } catch {
      /* nowhere to report it */
    }
  };
  return {
    stdout: (text) => {
      try {
        writeAllSync(stdoutFd, text, write);
      } catch (cause) {
        throw new SpeedbandError(
          'output.stdoutFailed',
          `cannot write to standard output: ${describeFileError(cause)} — the output is incomplete; do not use it (free space, or read the whole output)`,
          { details: { reason: (cause as NodeJS.ErrnoException).code ?? null }, cause },
        );
      }
    },
    stderr: toStderr,
    progress: (text) => {
      if (isatty(stderrFd)) toStderr(text);
    },
  };
}

export const processIo: CommandIo = fileDescriptorIo(1, 2);

/** A recording io for tests and for library callers that want the text. */
export function recordingIo(): CommandIo & { out: () => string; err: () => string } {
  let out = '';
  let err = '';
  return {
    stdout: (text) => {
      out += text;
    },
    stderr: (text) => {
      err += text;
    },
    progress: () => {},
    out: () => out,
    err: () => err,
  };
}

/** Exit codes used by every command. */
export const EXIT = {
  ok: 0,
  /** The command ran and found a failure or a flag (a check failed, a comparison flagged a change). */
  failed: 1,
  /** Bad input or usage: nothing was computed. */
  badInput: 2,
  /** A bug in speedband. */
  internal: 3,
} as const;
