import { mkdtempSync, readFileSync, readdirSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { dirname, join, basename } from 'node:path';
import { describe, expect, it } from 'vitest';
import { runCli } from '../src/cli/main.js';
import { recordingIo } from '../src/cli/io.js';
import { COMMANDS } from '../src/cli/commands/index.js';

const readme = readFileSync(new URL('../README.md', import.meta.url), 'utf8');

/** Every `npx speedband …` command in the README's sh blocks, continuation lines joined. */
function readmeCommands(): string[] {
  const blocks = [...readme.matchAll(/```sh\n([\s\S]*?)```/g)].map((match) => match[1].replace(/\\\n\s*/g, ''));
  return blocks
    .flatMap((block) => block.split('\n'))
    .map((line) => line.trim())
    .filter((line) => line.includes('npx speedband'))
    .map((line) => line.slice(line.indexOf('npx speedband') + 'npx speedband'.length).trim());
}

/** Expand a `folder/*.csv` word the way the shell would (sorted); other words unchanged. */
function expand(word: string): string[] {
  if (!word.includes('*')) return [word];
  const folder = dirname(word);
  const pattern = new RegExp(`^${basename(word).replace(/[.]/g, '\\.').replace(/\*/g, '.*')}$`);
  return readdirSync(folder)
    .filter((name) => pattern.test(name))
    .sort()
    .map((name) => join(folder, name));
}

describe('README', () => {
  it('starts with one paragraph stating the job, then the two commands: demo and tests', () => {
    const firstParagraph = readme.split('\n\n')[1];
    expect(firstParagraph).toMatch(/step-steer test logs/);
    expect(readme).toContain('npm ci && npx speedband demo');
    expect(readme).toContain('npm ci && npm test');
  });

  it('names only commands the CLI has', () => {
    const known = new Set(COMMANDS.map((command) => command.command.split(' ')[0]));
    for (const match of readme.matchAll(/`speedband ([a-z-]+)/g)) expect(known.has(match[1])).toBe(true);
  });

  it('its examples run as written: the demo, the refit flow with --baseline, and compare', async () => {
    const out = mkdtempSync(join(tmpdir(), 'speedband-readme-'));
    const commands = readmeCommands();
    expect(commands.length).toBeGreaterThanOrEqual(3);
    const codes: Record<string, number> = {};
    for (const command of commands) {
      const argv = command
        .replace(/speedband-demo/g, join(out, 'speedband-demo'))
        .split(/\s+/)
        .flatMap(expand);
      const demo = argv[0] === 'demo' ? ['--out', join(out, 'speedband-demo')] : [];
      const io = recordingIo();
      const code = await runCli([...argv, ...demo], io);
      codes[argv[0]] = code;
      // 0: done; 1: a check failed or a comparison flagged (expected after the vehicle change). Never bad input.
      expect([0, 1], `${command}\n${io.err()}`).toContain(code);
    }
    expect(codes.demo).toBe(0);
    // The loaded van: the old gains fail at high speed (build exits 1) and compare flags ki changes (exit 1).
    expect(codes.build).toBe(1);
    expect(codes.compare).toBe(1);
  });
});
