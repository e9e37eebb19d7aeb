/**
 * Output paths are checked before any work: an output is never one of the command's inputs (not even
 * with --force, and not through another name: a symbolic link, `..`, or a hard link), never the same
 * file as another output of the command, and never a folder, a device or a symbolic link; its folder
 * (or the nearest existing ancestor, as missing folders are created) must be a folder that accepts a new
 * file (a probe file is created and removed).
 * Symbolic links: a link as the output file itself is refused (speedband never writes through one);
 * folders on the way may be links. Inputs are followed through links when compared.
 */
import { randomBytes } from 'node:crypto';
import { accessSync, closeSync, constants, lstatSync, openSync, realpathSync, statSync, unlinkSync } from 'node:fs';
import { basename, dirname, join, resolve } from 'node:path';
import { SpeedbandError } from './errors.js';
import { describeFileError } from './files.js';

/** An output of a command and the option that named it (for messages). */
export interface OutputPath {
  readonly path: string;
  readonly option: string;
}

/** An input of a command and what it is (for messages). */
export interface InputPath {
  readonly path: string;
  readonly role: string;
}

interface Identity {
  /** Absolute path with every existing folder resolved through links. */
  readonly resolved: string;
  /** Device and inode of an existing file ("dev:ino"), else null. */
  readonly inode: string | null;
}

const inodeOf = (path: string): string | null => {
  try {
    const stats = statSync(path);
    return `${stats.dev}:${stats.ino}`;
  } catch {
    return null;
  }
};

/** The nearest existing ancestor of a path (itself when it exists), and the part below it. */
function nearestExisting(path: string): { existing: string; rest: string[] } {
  let current = resolve(path);
  const rest: string[] = [];
  for (;;) {
    try {
      lstatSync(current);
      return { existing: current, rest };
    } catch {
      const parent = dirname(current);
      if (parent === current) return { existing: current, rest };
      rest.unshift(basename(current));
      current = parent;
    }
  }
}

function identityOf(path: string): Identity {
  const { existing, rest } = nearestExisting(path);
  let real = existing;
  try {
    real = realpathSync(existing);
  } catch {
    /* a dangling link: compare by its own path */
  }
  return { resolved: join(real, ...rest), inode: rest.length === 0 ? inodeOf(existing) : null };
}

const same = (a: Identity, b: Identity): boolean => a.resolved === b.resolved || (a.inode !== null && a.inode === b.inode);

/** The folder that will hold `path` must be (or be creatable under) a writable folder. */
function checkFolderOf(output: OutputPath): void {
  const { existing, rest } = nearestExisting(dirname(resolve(output.path)));
  const where = { location: { file: output.path } };
  let folder: ReturnType<typeof statSync>;
  try {
    folder = statSync(existing);
  } catch (cause) {
    throw new SpeedbandError(
      'output.folderUnusable',
      `${output.option}: cannot use the folder ${existing}: ${describeFileError(cause)} — choose another output path`,
      where,
    );
  }
  if (!folder.isDirectory()) {
    throw new SpeedbandError(
      'output.parentNotFolder',
      `${output.option}: ${existing} is a file, not a folder, so nothing can be written ${rest.length === 0 ? 'in it' : 'under it'} — choose another output path`,
      where,
    );
  }
  // access(2) says yes to root on folders that still refuse new files (sysfs); creating and removing a probe file asks the file system itself.
  const probe = join(existing, `.speedband-probe-${process.pid}-${randomBytes(4).toString('hex')}`);
  try {
    accessSync(existing, constants.W_OK | constants.X_OK);
    closeSync(openSync(probe, 'wx'));
    unlinkSync(probe);
  } catch (cause) {
    throw new SpeedbandError(
      'output.folderNotWritable',
      `${output.option}: the folder ${existing} is not writable: ${describeFileError(cause)} — choose another output path`,
      {
        ...where,
        details: { reason: (cause as NodeJS.ErrnoException).code ?? null },
      },
    );
  }
}

/** The output itself, when it exists, must be a regular file (not a link, folder or device). */
function checkTarget(output: OutputPath): void {
  let stats: ReturnType<typeof lstatSync>;
  try {
    stats = lstatSync(output.path);
  } catch {
    return;
  }
  const where = { location: { file: output.path } };
  if (stats.isSymbolicLink()) {
    throw new SpeedbandError(
      'output.symlink',
      `${output.option} is a symbolic link — speedband never writes through a link; give the path of the real file (or remove the link)`,
      where,
    );
  }
  if (stats.isDirectory()) throw new SpeedbandError('output.isDirectory', `${output.option} is a folder — give a file name inside it`, where);
  if (!stats.isFile())
    throw new SpeedbandError('output.notRegularFile', `${output.option} is not a regular file (a device, pipe or socket) — give a file path`, where);
}

/**
 * Check the outputs of one command against its inputs and each other, before any work (see the file
 * comment). Throws `output.isInput`, `output.sameFile`, `output.symlink`, `output.isDirectory`,
 * `output.notRegularFile`, `output.parentNotFolder` or `output.folderNotWritable` (all exit 2).
 */
export function checkOutputPaths(outputs: readonly OutputPath[], inputs: readonly InputPath[]): void {
  const inputIdentities = inputs.map((input) => ({ input, identity: identityOf(input.path) }));
  const seen: { output: OutputPath; identity: Identity }[] = [];
  for (const output of outputs) {
    checkTarget(output);
    checkFolderOf(output);
    const identity = identityOf(output.path);
    const input = inputIdentities.find((candidate) => same(candidate.identity, identity));
    if (input !== undefined) {
      throw new SpeedbandError(
        'output.isInput',
        `${output.option} ${output.path} is the ${input.input.role} ${input.input.path} this command reads — an output never replaces an input of the same command, ` +
          'not even with --force; choose another output path',
        { location: { file: output.path }, details: { option: output.option, input: input.input.path, role: input.input.role } },
      );
    }
    const earlier = seen.find((candidate) => same(candidate.identity, identity));
    if (earlier !== undefined) {
      throw new SpeedbandError(
        'output.sameFile',
        `${output.option} and ${earlier.output.option} name the same file (${output.path}) — give each output its own path`,
        { location: { file: output.path }, details: { options: [earlier.output.option, output.option] } },
      );
    }
    seen.push({ output, identity });
  }
}

/** An output folder (files are written into it): must be a folder or creatable under a writable one; not a link to check here. */
export function checkOutputFolder(folder: OutputPath): void {
  let stats: ReturnType<typeof statSync> | undefined;
  try {
    stats = statSync(folder.path);
  } catch {
    stats = undefined;
  }
  if (stats !== undefined && !stats.isDirectory()) {
    throw new SpeedbandError('output.notFolder', `${folder.option} ${folder.path} is a file, not a folder — give a folder (it is created when missing)`, {
      location: { file: folder.path },
    });
  }
  checkFolderOf({ path: join(folder.path, 'file'), option: folder.option });
}
