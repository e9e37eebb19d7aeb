import { createHash } from 'node:crypto';
import { existsSync, readFileSync, renameSync, writeFileSync, mkdirSync, unlinkSync } from 'node:fs';
import { dirname, basename, join } from 'node:path';
import { SpeedbandError } from './errors.js';

/** SHA-256 of bytes or text, lowercase hex. */
export function sha256Hex(content: string | Uint8Array): string {
  return createHash('sha256').update(content).digest('hex');
}

/** Read a whole file as UTF-8, with a typed error naming the file when it cannot be read. */
export function readTextFile(path: string): string {
  try {
    return readFileSync(path, 'utf8');
  } catch (cause) {
    const reason = (cause as NodeJS.ErrnoException).code === 'ENOENT' ? 'no such file' : String((cause as Error).message);
    throw new SpeedbandError('file.unreadable', `cannot read the file (${reason}) — check the path`, {
      location: { file: path },
      cause,
    });
  }
}

export type WriteOutcome = 'written' | 'unchanged';

/**
 * Write a file atomically: a temporary file in the same folder, then rename.
 * An existing file with different content is never replaced unless `force`;
 * an existing file with identical content is left alone ('unchanged').
 */
export function writeFileAtomic(path: string, content: string | Uint8Array, force: boolean): WriteOutcome {
  if (existsSync(path)) {
    const existing = readFileSync(path);
    const incoming = typeof content === 'string' ? Buffer.from(content, 'utf8') : Buffer.from(content);
    if (existing.equals(incoming)) return 'unchanged';
    if (!force) {
      throw new SpeedbandError(
        'output.exists',
        'the file exists with different content and was not replaced — pass --force to overwrite it, or choose another output path',
        { location: { file: path } },
      );
    }
  }
  mkdirSync(dirname(path), { recursive: true });
  const temporary = join(dirname(path), `.${basename(path)}.${process.pid}.tmp`);
  try {
    writeFileSync(temporary, content);
    renameSync(temporary, path);
  } catch (cause) {
    try {
      unlinkSync(temporary);
    } catch {
      /* the temporary file may not exist */
    }
    throw new SpeedbandError('output.unwritable', `cannot write the file: ${(cause as Error).message}`, {
      location: { file: path },
      cause,
    });
  }
  return 'written';
}
