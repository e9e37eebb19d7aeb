import { readFileSync } from 'node:fs';
import { describe, expect, it } from 'vitest';
import { runCli } from '../src/cli/main.js';
import { recordingIo } from '../src/cli/io.js';
import { VERSION } from '../src/version.js';

describe('speedband CLI', () => {
  it('VERSION matches package.json', () => {
    const pkg = JSON.parse(readFileSync(new URL('../package.json', import.meta.url), 'utf8')) as { version: string };
    expect(VERSION).toBe(pkg.version);
  });

  it('--help lists the safety cautions and exits 0', async () => {
    const io = recordingIo();
    expect(await runCli(['--help'], io)).toBe(0);
    expect(io.out()).toMatch(/closed\s+track/);
    expect(io.out()).toMatch(/safety\s+driver/);
  });

  it('no command is a usage error with exit 2', async () => {
    const io = recordingIo();
    expect(await runCli([], io)).toBe(2);
    expect(io.err()).toMatch(/Name a command/);
  });
});
