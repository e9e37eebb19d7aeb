/**
 * Writing every byte to a file descriptor. `fs.writeSync` may write fewer bytes than asked (a nearly
 * full disk, a signal) and Node's own synchronous stream ignores that count — a header cut short
 * with exit 0. This loop writes the rest, waits briefly on a non-blocking pipe that is full (EAGAIN)
 * and lets every other error (ENOSPC, EPIPE, EIO …) reach the caller.
 */
import { writeSync } from 'node:fs';

/** The write call (replaceable in tests to simulate short writes and failures). */
export type WriteCall = (fd: number, buffer: Uint8Array, offset: number, length: number) => number;

const pause = new Int32Array(new SharedArrayBuffer(4));
/** How long to wait before writing again to a full non-blocking pipe, ms. */
const FULL_PIPE_WAIT_MS = 2;

/** Write all of `data` to `fd`, or throw the error that stopped it. */
export function writeAllSync(fd: number, data: string | Uint8Array, write: WriteCall = writeSync): void {
  const buffer = typeof data === 'string' ? Buffer.from(data, 'utf8') : data;
  let offset = 0;
  while (offset < buffer.length) {
    let written: number;
    try {
      written = write(fd, buffer, offset, buffer.length - offset);
    } catch (error) {
      if ((error as NodeJS.ErrnoException).code === 'EAGAIN') {
        Atomics.wait(pause, 0, 0, FULL_PIPE_WAIT_MS);
        continue;
      }
      throw error;
    }
    if (written <= 0) throw Object.assign(new Error(`write returned ${written}`), { code: 'EIO' });
    offset += written;
  }
}
