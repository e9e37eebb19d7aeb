import { spawnSync } from 'node:child_process';
import { existsSync, mkdtempSync, readdirSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { describe, expect, it } from 'vitest';
import { fileDescriptorIo } from '../../src/cli/io.js';
import { removeStaleTemporaryFiles, writeFileAtomic } from '../../src/core/files.js';
import { writeAllSync } from '../../src/core/write-all.js';

const folder = () => mkdtempSync(join(tmpdir(), 'speedband-files-'));
const errno = (code: string): Error => Object.assign(new Error(code), { code });

/** A process id that is certainly not running: a child that has exited. */
function deadPid(): number {
  const child = spawnSync(process.execPath, ['-e', 'process.stdout.write(String(process.pid))'], { encoding: 'utf8' });
  return Number(child.stdout);
}

describe('writeFileAtomic', () => {
  it('removes temporary files a crashed run left for the same target, and leaves those of a running process alone', () => {
    const dir = folder();
    const target = join(dir, 'schedule.json');
    const stale = join(dir, `.schedule.json.${deadPid()}.0a1b2c3d.speedband-tmp`);
    const live = join(dir, `.schedule.json.${process.ppid}.0a1b2c3d.speedband-tmp`);
    const other = join(dir, `.other.json.${deadPid()}.0a1b2c3d.speedband-tmp`);
    for (const path of [stale, live, other]) writeFileSync(path, 'half a file');
    expect(writeFileAtomic(target, 'new\n', { force: false })).toBe('written');
    expect(existsSync(stale)).toBe(false);
    expect(existsSync(live)).toBe(true);
    expect(existsSync(other)).toBe(true);
    expect(readFileSync(target, 'utf8')).toBe('new\n');
    // Nothing of ours is left behind by a successful write.
    expect(readdirSync(dir).filter((name) => name.startsWith('.schedule.json.') && name !== live.slice(dir.length + 1))).toEqual([]);
    expect(removeStaleTemporaryFiles(join(dir, 'other.json'))).toEqual([other]);
  });

  it('refuses a folder, a device and a missing parent that is a file, with output.* codes (exit 2), never an internal error', () => {
    const dir = folder();
    const file = join(dir, 'file.txt');
    writeFileSync(file, 'x');
    expect(() => writeFileAtomic(dir, 'x', { force: true })).toThrow(expect.objectContaining({ code: 'output.isDirectory' }));
    expect(() => writeFileAtomic('/dev/null', 'x', { force: true })).toThrow(expect.objectContaining({ code: 'output.notRegularFile' }));
    expect(() => writeFileAtomic(join(file, 'below.txt'), 'x', { force: true })).toThrow(expect.objectContaining({ code: 'output.unwritable' }));
  });
});

describe('writeAllSync and standard output', () => {
  it('writes the rest after short writes and waits on a full non-blocking pipe (EAGAIN)', () => {
    const written: number[] = [];
    let calls = 0;
    const write = (_fd: number, buffer: Uint8Array, offset: number, length: number): number => {
      calls += 1;
      if (calls === 2) throw errno('EAGAIN');
      const n = Math.min(3, length);
      written.push(...buffer.subarray(offset, offset + n));
      return n;
    };
    writeAllSync(1, 'abcdefghij', write);
    expect(Buffer.from(written).toString()).toBe('abcdefghij');
  });

  it('a disk that fills after a short write (ENOSPC) or a closed pipe (EPIPE) is output.stdoutFailed, not silence', () => {
    for (const code of ['ENOSPC', 'EPIPE']) {
      let calls = 0;
      const write = (_fd: number, _buffer: Uint8Array, _offset: number, length: number): number => {
        calls += 1;
        if (calls > 1) throw errno(code);
        return Math.min(4, length);
      };
      const io = fileDescriptorIo(1, 2, write);
      expect(() => io.stdout('a header longer than four bytes')).toThrow(
        expect.objectContaining({ code: 'output.stdoutFailed', message: expect.stringContaining(code) }),
      );
    }
  });
});
