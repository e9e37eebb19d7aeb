/**
 * Reading inputs and writing outputs. Outputs are written atomically and durably: a temporary file
 * in the same folder (created exclusively, with the mode of the file it replaces), every byte
 * written, fsync of the file, rename over the target, fsync of the folder — so after a crash the
 * target holds the old content or the new, never a mixture. Temporary files left by a crashed run
 * (their process no longer exists) are removed on the next write of the same target; others are
 * never read. A target that is a symbolic link, a folder or a device is refused (see output-paths.ts).
 */
import { createHash, randomBytes } from 'node:crypto';
import {
  closeSync,
  fsyncSync,
  fstatSync,
  fchmodSync,
  lstatSync,
  mkdirSync,
  openSync,
  readFileSync,
  readdirSync,
  renameSync,
  unlinkSync,
  type Stats,
} from 'node:fs';
import { basename, dirname, join } from 'node:path';
import { SpeedbandError } from './errors.js';
import { writeAllSync } from './write-all.js';

/** SHA-256 of bytes or text, lowercase hex. */
export function sha256Hex(content: string | Uint8Array): string {
  return createHash('sha256').update(content).digest('hex');
}

/** Words for a file-system error code (errno name kept in brackets). */
export function describeFileError(cause: unknown): string {
  const code = (cause as NodeJS.ErrnoException).code;
  const words: Readonly<Record<string, string>> = {
    ENOENT: 'no such file or folder',
    ENOTDIR: 'a part of the path is a file, not a folder',
    EISDIR: 'it is a folder',
    EACCES: 'permission denied',
    EPERM: 'operation not permitted',
    EROFS: 'read-only file system',
    ENOSPC: 'no space left on the device',
    EDQUOT: 'disk quota exceeded',
    EPIPE: 'the reader closed the pipe',
    EIO: 'input/output error',
    EFBIG: 'file too large',
  };
  return code === undefined ? String((cause as Error).message) : `${words[code] ?? String((cause as Error).message)} (${code})`;
}

/** Read a whole file as bytes, with a typed error naming the file when it cannot be read. */
export function readFileBytes(path: string): Buffer {
  try {
    return readFileSync(path);
  } catch (cause) {
    const reason = (cause as NodeJS.ErrnoException).code === 'ENOENT' ? 'no such file' : describeFileError(cause);
    throw new SpeedbandError('file.unreadable', `cannot read the file (${reason}) — check the path`, { location: { file: path }, cause });
  }
}

/** Read a whole file as UTF-8, with a typed error naming the file when it cannot be read. */
export function readTextFile(path: string): string {
  return readFileBytes(path).toString('utf8');
}

/** What writeFileAtomic did: wrote the file, or left it unchanged because it already held the same bytes. */
export type WriteOutcome = 'written' | 'unchanged';

/** How a writer treats an existing file: what every `write…` function of the library takes. */
export interface WriteOptions {
  /** Replace an existing file whose content differs (a command's `--force`); without it such a file is refused with `output.exists`. */
  readonly force: boolean;
}

/** Suffix of our temporary files: `.<target name>.<process id>.<8 hex digits>.speedband-tmp`. */
const TEMPORARY_SUFFIX = '.speedband-tmp';

const escapeRegExp = (text: string): string => text.replace(/[.*+?^${}()|[\]\\]/g, '\\$&');

function processIsAlive(pid: number): boolean {
  try {
    process.kill(pid, 0);
    return true;
  } catch (error) {
    return (error as NodeJS.ErrnoException).code === 'EPERM';
  }
}

/** Remove temporary files of `target` left by runs that crashed (their process is gone); leave the rest alone. */
export function removeStaleTemporaryFiles(target: string): string[] {
  const folder = dirname(target);
  const pattern = new RegExp(`^\\.${escapeRegExp(basename(target))}\\.(\\d+)\\.[0-9a-f]{8}${escapeRegExp(TEMPORARY_SUFFIX)}$`);
  const removed: string[] = [];
  let names: string[];
  try {
    names = readdirSync(folder);
  } catch {
    return removed;
  }
  for (const name of names) {
    const match = pattern.exec(name);
    if (match === null || Number(match[1]) === process.pid || processIsAlive(Number(match[1]))) continue;
    const path = join(folder, name);
    try {
      if (lstatSync(path).isFile()) {
        unlinkSync(path);
        removed.push(path);
      }
    } catch {
      /* gone already, or not ours to remove: ignored (never read) */
    }
  }
  return removed;
}

function unwritable(path: string, cause: unknown, what = 'cannot write the file'): SpeedbandError {
  return new SpeedbandError(
    'output.unwritable',
    `${what}: ${describeFileError(cause)} — nothing was replaced; free space, fix the permissions or choose another output path`,
    {
      location: { file: path },
      details: { reason: (cause as NodeJS.ErrnoException).code ?? null },
      cause,
    },
  );
}

/** The existing target (lstat, never followed), or null when there is none; refuses links, folders and devices. */
function existingTarget(path: string): Stats | null {
  let stats: Stats;
  try {
    stats = lstatSync(path);
  } catch (cause) {
    if ((cause as NodeJS.ErrnoException).code === 'ENOENT') return null;
    throw unwritable(path, cause);
  }
  if (stats.isSymbolicLink()) {
    throw new SpeedbandError(
      'output.symlink',
      'the output path is a symbolic link — speedband never writes through a link; give the path of the real file (or remove the link)',
      {
        location: { file: path },
      },
    );
  }
  if (stats.isDirectory()) {
    throw new SpeedbandError('output.isDirectory', 'the output path is a folder — give a file name inside it', { location: { file: path } });
  }
  if (!stats.isFile()) {
    throw new SpeedbandError('output.notRegularFile', 'the output path is not a regular file (a device, pipe or socket) — give a file path', {
      location: { file: path },
    });
  }
  return stats;
}

/** Flush a folder's entries to disk (after a rename); file systems that cannot fsync a folder are let be. */
function syncFolder(folder: string): void {
  let fd: number | undefined;
  try {
    fd = openSync(folder, 'r');
    fsyncSync(fd);
  } catch (cause) {
    const code = (cause as NodeJS.ErrnoException).code;
    if (code !== 'EINVAL' && code !== 'ENOTSUP' && code !== 'EISDIR' && code !== 'EBADF') throw cause;
  } finally {
    if (fd !== undefined) closeSync(fd);
  }
}

/**
 * Write a file atomically and durably (see the file comment). An existing file with different content
 * is never replaced unless `options.force`; one with identical content is left alone ('unchanged'). A replaced
 * file keeps its permission bits. Missing folders are created. Every failure is `output.*` (exit 2).
 */
export function writeFileAtomic(path: string, content: string | Uint8Array, options: WriteOptions): WriteOutcome {
  const incoming = typeof content === 'string' ? Buffer.from(content, 'utf8') : Buffer.from(content);
  const existing = existingTarget(path);
  if (existing !== null) {
    let current: Buffer;
    try {
      current = readFileSync(path);
    } catch (cause) {
      throw unwritable(path, cause, 'cannot read the existing file to compare it');
    }
    if (current.equals(incoming)) return 'unchanged';
    if (!options.force) {
      throw new SpeedbandError(
        'output.exists',
        'the file exists with different content and was not replaced — pass --force to overwrite it, or choose another output path',
        { location: { file: path } },
      );
    }
  }
  const folder = dirname(path);
  try {
    mkdirSync(folder, { recursive: true });
  } catch (cause) {
    throw unwritable(path, cause, 'cannot create the folder');
  }
  removeStaleTemporaryFiles(path);
  const temporary = join(folder, `.${basename(path)}.${process.pid}.${randomBytes(4).toString('hex')}${TEMPORARY_SUFFIX}`);
  let fd: number | undefined;
  try {
    fd = openSync(temporary, 'wx', 0o666);
    if (existing !== null) fchmodSync(fd, existing.mode & 0o7777);
    writeAllSync(fd, incoming);
    fsyncSync(fd);
    if (fstatSync(fd).size !== incoming.length) throw Object.assign(new Error('short write'), { code: 'EIO' });
    closeSync(fd);
    fd = undefined;
    renameSync(temporary, path);
    syncFolder(folder);
  } catch (cause) {
    if (fd !== undefined) {
      try {
        closeSync(fd);
      } catch {
        /* already failing */
      }
    }
    try {
      unlinkSync(temporary);
    } catch {
      /* the temporary file may not exist (or was renamed) */
    }
    throw unwritable(path, cause);
  }
  return 'written';
}
