/** Where a command writes. Tests pass a recorder; the binary passes the process streams. */
export interface CommandIo {
  readonly stdout: (text: string) => void;
  readonly stderr: (text: string) => void;
  /** Progress lines for long work; silent when not a terminal or with --quiet. */
  readonly progress: (text: string) => void;
}

export const processIo: CommandIo = {
  stdout: (text) => process.stdout.write(text),
  stderr: (text) => process.stderr.write(text),
  progress: (text) => {
    if (process.stderr.isTTY) process.stderr.write(text);
  },
};

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
