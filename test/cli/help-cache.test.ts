import yargs from 'yargs';
import { describe, expect, it } from 'vitest';
import { recordingIo } from '../../src/cli/io.js';
import { runCli } from '../../src/cli/main.js';

// runCli turns off yargs' rendering of the help text after each command starts (start-up time;
// src/cli/main.ts skipHelpCache). These pin the yargs internals it relies on and that help still works.
describe('help text is rendered only when asked for', () => {
  it('yargs still exposes the usage instance whose help cache runCli switches off', () => {
    const usage = (yargs() as unknown as { getInternalMethods: () => { getUsageInstance: () => { cacheHelpMessage: unknown } } })
      .getInternalMethods()
      .getUsageInstance();
    expect(typeof usage.cacheHelpMessage).toBe('function');
  });

  it('speedband build --help still prints the options with units and the examples', async () => {
    const io = recordingIo();
    expect(await runCli(['build', '--help'], io)).toBe(0);
    expect(io.out()).toContain('--models-out');
    expect(io.out()).toContain('Examples:');
  });

  it('a usage error after a command still reports the problem and exits 2', async () => {
    const io = recordingIo();
    expect(await runCli(['build', '--vehicle', 'vehicles/parcel-van'], io)).toBe(2);
    expect(io.err()).toContain('Missing required argument: out');
  });
});
