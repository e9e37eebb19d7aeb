import { SpeedbandError } from '../../core/errors.js';
import type { Argv } from 'yargs';
import { TEST_LOG_DEFAULTS } from '../../vehicle/test-logs.js';
import { defineCommand } from '../command.js';
import { EXIT } from '../io.js';
import { quoted } from '../../core/quote.js';

/** Linear-range habit for step tests (docs/domain.md §6, common practice): warn above this steady lateral acceleration. */
const LINEAR_RANGE_WARNING_mps2 = 4;

/** At most this many values in a list option (bounded work: one log file per speed). */
const MAX_LISTED_VALUES = 1000;

/**
 * A list of numbers: "2,4,6.5" or "start:step:end" (inclusive, e.g. "2:2:10").
 * Throws a usage-level `SpeedbandError` naming the option and the bad item.
 */
function parseNumberList(text: string, option: string): number[] {
  const bad = (item: string) =>
    new SpeedbandError(
      'cli.badList',
      `--${option} ${quoted(text)}: ${quoted(item)} is not a number — give comma-separated numbers (2,4,6) or start:step:end (2:2:10)`,
      {
        details: { option, text },
      },
    );
  const range = /^\s*([^:]+):([^:]+):([^:]+)\s*$/.exec(text);
  if (range) {
    const [start, step, end] = range.slice(1).map((item) => {
      const value = Number(item);
      if (item.trim() === '' || !Number.isFinite(value)) throw bad(item);
      return value;
    });
    if (!(step > 0) || end < start) {
      throw new SpeedbandError('cli.badList', `--${option} ${quoted(text)}: a range needs step > 0 and end ≥ start`, { details: { option, text } });
    }
    const count = Math.floor((end - start) / step + 1e-9) + 1;
    if (count > MAX_LISTED_VALUES) {
      throw new SpeedbandError('cli.badList', `--${option} ${quoted(text)} lists ${count} values; at most ${MAX_LISTED_VALUES} — use a larger step`, {
        details: { option, text },
      });
    }
    return Array.from({ length: count }, (_, k) => Number((start + k * step).toPrecision(12)));
  }
  return text.split(',').map((item) => {
    const value = Number(item);
    if (item.trim() === '' || !Number.isFinite(value)) throw bad(item);
    return value;
  });
}

function builder(yargs: Argv) {
  return yargs
    .usage(
      'speedband make-test-logs --vehicle V --speeds LIST --out DIR [options]\n\n' +
        'Writes invented demo data, labelled synthetic (file names synthetic-steps-<speed>mps.csv and a README.md). ' +
        "Each log simulates the vehicle file's nominal single-track model and actuator exactly at one constant speed: " +
        '2 s at zero, then steps left and right at a large and a small road-wheel amplitude (8 steps with the returns to zero), ' +
        'each a 0.15–0.4 s ramp, held 4.5 s, back to zero and held 3 s. ' +
        'Columns: time_s, speed_mps, steer_cmd_rad, steer_angle_rad, yaw_rate_radps, lat_accel_mps2 (ISO 8855 signs: positive = left).',
    )
    .option('vehicle', {
      type: 'string',
      demandOption: true,
      describe: 'Vehicle file (vehicle.json) or a folder holding one; it must carry nominal cornering stiffnesses',
    })
    .option('speeds', {
      type: 'string',
      demandOption: true,
      describe: 'Test speeds in m/s: comma-separated (2,5,10) or start:step:end (2:2:20); one log per speed',
    })
    .option('out', { type: 'string', demandOption: true, describe: 'Folder to write the logs and a README.md into (created if needed)' })
    .option('seed', { type: 'number', default: TEST_LOG_DEFAULTS.seed, describe: 'Integer seed of the noise; the same seed gives byte-identical files' })
    .option('amplitudes-deg', {
      type: 'string',
      describe:
        'Road-wheel step amplitudes in degrees for every speed, e.g. 2,1 (default: per speed, the large one aiming at 1.5 m/s² steady lateral acceleration within half the angle limit and the rate limit; the small one half of it)',
    })
    .option('sample-rate-hz', { type: 'number', default: TEST_LOG_DEFAULTS.sampleRate_hz, describe: 'Sample rate of the logs, Hz' })
    .option('noise-scale', {
      type: 'number',
      default: TEST_LOG_DEFAULTS.noiseScale,
      describe: 'Multiplies every sensor noise level and the yaw-rate bias (1: yaw rate σ 0.001 rad/s, bias within ±0.003 rad/s; 0: noise-free)',
    })
    .option('command-resolution-deg', {
      type: 'number',
      default: 0,
      describe: 'Quantise the steer command to multiples of this road-wheel angle, degrees, as a firmware with a coarse command would (0: not quantised)',
    })
    .option('force', { type: 'boolean', default: false, describe: 'Replace existing files whose content differs' })
    .option('json', {
      type: 'boolean',
      default: false,
      describe: 'Print a JSON summary (files, speeds, amplitudes in rad, step onsets in s) instead of a table',
    });
}

export const command = defineCommand({
  command: 'make-test-logs',
  describe: 'Write synthetic (invented, labelled) step-steer test logs for a vehicle file: one CSV per speed, simulated exactly with seeded noise',
  builder,
  exitCodes: [
    [0, 'the logs and their README were written'],
    [2, 'bad input: vehicle file without nominal cornering stiffnesses, bad speed list, an output that exists (--force)'],
  ],
  examples: [
    [
      'speedband make-test-logs --vehicle vehicles/parcel-van --speeds 2,4,6,8,10,12.5,15,18,21,25 --seed 101 --out vehicles/parcel-van/logs',
      'Regenerate the parcel van demo logs',
    ],
    ['speedband make-test-logs --vehicle my-van.json --speeds 5:5:25 --seed 7 --noise-scale 0 --out /tmp/clean', 'Noise-free logs at 5, 10, 15, 20 and 25 m/s'],
    [
      'speedband make-test-logs --vehicle vehicles/sidewalk-robot --speeds 1,2 --amplitudes-deg 6,3 --out /tmp/robot',
      'Fixed amplitudes of 6° and 3° at every speed',
    ],
  ],
  run: async (args, io) => {
    const { loadVehicle, resolveVehiclePath } = await import('../../vehicle/load.js');
    const { writeTestLogs, testLogFileName } = await import('../../vehicle/test-logs.js');
    const { LIMITED_BY_WORDS } = await import('../../vehicle/step-plan.js');
    const { degreesToRadians, radiansToDegrees } = await import('../../core/units.js');
    const { checkOutputFolder, checkOutputPaths } = await import('../../core/output-paths.js');
    const { join } = await import('node:path');
    const speeds = parseNumberList(args.speeds, 'speeds');
    const out = args.out;
    checkOutputFolder({ path: out, option: '--out' });
    checkOutputPaths(
      // Each file once: two speeds with one file name are refused by writeTestLogs, with its own words.
      [
        ...new Set([
          ...speeds.filter((speed) => Number.isFinite(speed) && speed > 0).map((speed) => join(out, testLogFileName(speed))),
          join(out, 'README.md'),
        ]),
      ].map((path) => ({
        path,
        option: '--out',
      })),
      [{ path: resolveVehiclePath(args.vehicle), role: 'vehicle file' }],
    );
    const vehicle = loadVehicle(args.vehicle);
    const amplitudesText = args['amplitudes-deg'];
    const amplitudes_rad = amplitudesText === undefined ? undefined : parseNumberList(amplitudesText, 'amplitudes-deg').map(degreesToRadians);
    const result = writeTestLogs({
      vehicle,
      speeds_mps: speeds,
      outDir: out,
      generation: {
        seed: args.seed,
        sampleRate_hz: args['sample-rate-hz'],
        noiseScale: args['noise-scale'],
        commandResolution_rad: degreesToRadians(args['command-resolution-deg']),
        commandPaths: { vehicle: args.vehicle, out },
        ...(amplitudes_rad === undefined ? {} : { amplitudes_rad }),
      },
      force: args.force,
    });
    const outcomes = new Map(result.files.map((file) => [file.path, file.outcome]));
    const rows = result.logs.map((log, index) => ({
      file: result.files[index].path,
      speed_mps: log.speed_mps,
      largeAmplitude_rad: log.amplitudes.large_rad,
      smallAmplitude_rad: log.amplitudes.small_rad,
      amplitudeLimitedBy: log.amplitudes.limitedBy,
      steadyLateralAcceleration_mps2: log.amplitudes.steadyLateralAcceleration_mps2,
      samples: log.sampleCount,
      stepOnsets_s: log.steps.map((step) => step.onset_s),
      outcome: outcomes.get(result.files[index].path),
    }));
    for (const row of rows) {
      if (row.steadyLateralAcceleration_mps2 > LINEAR_RANGE_WARNING_mps2) {
        io.stderr(
          `warning: at ${row.speed_mps} m/s the large step gives about ${row.steadyLateralAcceleration_mps2.toFixed(1)} m/s² steady lateral acceleration — above ~${LINEAR_RANGE_WARNING_mps2} m/s² real tyres leave the linear range the model assumes; choose smaller --amplitudes-deg\n`,
        );
      }
    }
    if (args.json) {
      io.stdout(`${JSON.stringify({ synthetic: true, vehicle: vehicle.name, logs: rows, readme: result.files[result.files.length - 1].path }, null, 2)}\n`);
      return EXIT.ok;
    }
    const table = [
      ['file', 'speed m/s', 'steps °', 'limited by', 'steady ay m/s²', 'samples', ''],
      ...rows.map((row) => [
        row.file,
        row.speed_mps.toString(),
        `±${radiansToDegrees(row.largeAmplitude_rad).toFixed(2)} ±${radiansToDegrees(row.smallAmplitude_rad).toFixed(2)}`,
        LIMITED_BY_WORDS[row.amplitudeLimitedBy],
        row.steadyLateralAcceleration_mps2.toFixed(2),
        row.samples.toString(),
        row.outcome ?? '',
      ]),
    ];
    const widths = table[0].map((_, column) => Math.max(...table.map((line) => line[column].length)));
    const text = table.map((line) =>
      line
        .map((cell, column) => (column === 0 ? cell.padEnd(widths[column]) : cell.padStart(widths[column])))
        .join('  ')
        .trimEnd(),
    );
    io.stdout(`${text.join('\n')}\n`);
    io.stdout(
      `\nSynthetic data for demos and tests only (vehicle ${quoted(vehicle.name)}, seed ${args.seed}): ${rows.length} logs, each with ${rows[0]?.stepOnsets_s.length ?? 0} steps (left and right at two amplitudes, with returns to zero). ` +
        `How they were made: ${result.files[result.files.length - 1].path}\n`,
    );
    return EXIT.ok;
  },
});
