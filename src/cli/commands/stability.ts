import { SpeedbandError } from '../../core/errors.js';
import { CONTROLLER_DEFAULTS, describeControllerSettings, resolveControllerSettings } from '../../controller/defaults.js';
import type { Argv } from 'yargs';
import { defineCommand, type OptionsOf } from '../command.js';
import { numberOption } from '../number-option.js';
import { EXIT } from '../io.js';
import type { LoopMargins } from '../../verify/types.js';
import { quoted } from '../../core/quote.js';

/** "1 3 2" or "1,3,2" → [1, 3, 2]; each entry must be a finite number. */
function coefficientOption(args: Args, name: 'numerator' | 'denominator'): number[] | undefined {
  const value = args[name];
  if (value === undefined) return undefined;
  const text = String(value).trim();
  const parts = text.split(/[\s,;]+/).filter((part) => part !== '');
  const numbers = parts.map(Number);
  const bad = parts.findIndex((_part, i) => !Number.isFinite(numbers[i]));
  if (parts.length === 0 || bad >= 0) {
    throw new SpeedbandError(
      'cli.badCoefficients',
      `--${name} is ${quoted(text)}${bad >= 0 ? ` (entry ${bad + 1}, ${quoted(parts[bad])}, is not a number)` : ''} — expected coefficients highest power first, separated by spaces or commas, e.g. --${name} "1 3 2" for s² + 3s + 2`,
      { details: { option: name, value: text } },
    );
  }
  return numbers;
}

/** N: a number > 0, or "none"/"infinity" for an unfiltered derivative. */
function filterOption(value: unknown): number {
  if (typeof value === 'number') return value;
  const text = String(value).trim().toLowerCase();
  if (text === 'none' || text === 'infinity' || text === 'inf') return Infinity;
  const parsed = Number(text);
  if (!Number.isFinite(parsed)) {
    throw new SpeedbandError(
      'cli.badNumber',
      `--derivative-filter is ${quoted(String(value))} — expected a number N > 0 (Tf = Td/N) or "none" for an unfiltered derivative`,
      {
        details: { option: 'derivative-filter' },
      },
    );
  }
  return parsed;
}

/** The evidence behind the verdict: the deciding test and its cross-check. */
const verdictEvidence = (margins: LoopMargins): string => {
  const analysis = margins.analysis;
  if (analysis === undefined) return '';
  const count = analysis.encirclementVerdict;
  const agreement =
    analysis.crossCheckAgrees === null
      ? `cross-check not counted${analysis.encirclementNote ? ` (${analysis.encirclementNote})` : ''}`
      : analysis.crossCheckAgrees
        ? `the Nyquist count agrees (${count})`
        : `THE NYQUIST COUNT DISAGREES (${count}) — please report this loop`;
  if (analysis.sampledDataVerdict !== undefined) {
    const pole = analysis.sampledDataDecidingPole;
    const poleText =
      pole === null || pole === undefined
        ? ''
        : `, largest |z| ${pole.magnitude.toFixed(6)}${pole.errorBound > 0 ? ` (rounding bound ${pole.errorBound.toExponential(1)})` : ''}`;
    const slowest = analysis.sampledDataSlowestTimeConstant_s;
    return ` — decided by the ${analysis.decidedBy}${poleText}${slowest === null || slowest === undefined ? '' : `, slowest time constant ${slowest.toPrecision(3)} s`}; ${agreement}`;
  }
  return ` — decided by the ${analysis.decidedBy}${analysis.padeOrder > 0 ? ` of order ${analysis.padeOrder}` : ''}; ${agreement}`;
};

const format = (value: number | null, digits: number, unit: string): string => (value === null ? 'none' : `${value.toFixed(digits)} ${unit}`);
const at = (frequency: number | null): string => (frequency === null ? '' : ` at ${frequency.toPrecision(4)} rad/s`);

function builder(yargs: Argv) {
  return yargs
    .usage(
      'speedband stability (--numerator "..." --denominator "..." [--delay-s θ] | --gain K --time-constant-s T --dead-time-s L) --kp KP [--ki KI] [--kd KD] [options]\n\n' +
        'The plant is G(s) = N(s)/D(s)·e^(−θs) with coefficients highest power first, or the FOPDT K·e^(−Ls)/(Ts + 1). ' +
        'The loop L = C·G is analysed with the exact delay. The controller is the discrete PID the firmware runs, with the defaults of tune and build ' +
        '(0.01 s, one sample of latency, backward Euler, N = 10): the plant through a zero-order hold with its fractional delay, analysed exactly as sampled ' +
        '(margins, Ms and Mt on its frequency response up to the Nyquist frequency π/Ts). With --continuous, the continuous PID on the plant with its exact delay instead.\n\n' +
        'Verdict: decided by the closed-loop poles (sampled: the exact closed-loop poles in z, each with a bound on its rounding error; --continuous: with the delay ' +
        'as a Padé approximant of an order chosen from the band), cross-checked by the Nyquist encirclement count. "marginal" means a ' +
        'closed-loop pole lies on the stability boundary within that numerical tolerance; the output names it.\n\n' +
        'Margins are distances to instability, given only for a stable loop:\n' +
        '  phase margin  the smallest phase change, lag (as usual) or lead, that puts L on −1 at a gain crossover: |180° + ∠L| in (0°, 180°], ' +
        'the smallest over the crossovers, with its frequency; never negative on a stable loop (phase margin as the phase lag to the stability ' +
        'limit: Åström & Murray, Feedback Systems, 2008, §9.3; lead counted too)\n' +
        '  upper gain margin  raising the gain by this destabilises (dB)\n' +
        '  lower gain margin  reducing the gain by this destabilises (negative dB; conditionally stable loops)\n' +
        '  delay margin  the smallest added delay that destabilises: phase lag over frequency at the gain crossovers, confirmed (or shortened) ' +
        'by the exact verdict of the loop with that delay added (a sampled loop: any fraction of a sample)\n' +
        '  Ms = max|1/(1 + L)|, Mt = max|L/(1 + L)|',
    )
    .option('numerator', {
      type: 'string',
      describe: 'Plant numerator coefficients, highest power first, e.g. "2 1" (a leading minus needs the = form: --numerator="-2 1")',
    })
    .option('denominator', { type: 'string', describe: 'Plant denominator coefficients, highest power first, e.g. "1 3 2"' })
    .option('delay-s', { type: 'number', describe: 'Plant delay θ with --numerator/--denominator, s (default 0)' })
    .option('gain', { type: 'number', describe: 'FOPDT steady-state gain K (plant output per unit input; negative allowed with negative controller gains)' })
    .option('time-constant-s', { type: 'number', describe: 'FOPDT time constant T, s' })
    .option('dead-time-s', { type: 'number', describe: 'FOPDT dead time L, s' })
    .option('kp', { type: 'number', demandOption: true, describe: 'Proportional gain (with --form ideal or series: the gain Kc)' })
    .option('ki', { type: 'number', describe: 'Integral gain, per s (with --form ideal or series: the integral time in s; omit for no integral action)' })
    .option('kd', { type: 'number', describe: 'Derivative gain, s (with --form ideal or series: the derivative time in s); default 0' })
    .option('form', {
      type: 'string',
      choices: ['parallel', 'ideal', 'series'] as const,
      default: 'parallel' as const,
      describe: 'How --kp --ki --kd are written: parallel kp + ki/s + kd·s; ideal Kc(1 + 1/(Ti·s) + Td·s); series Kc(1 + 1/(τI·s))(1 + τD·s)',
    })
    .option('derivative-filter', {
      type: 'string',
      default: String(CONTROLLER_DEFAULTS.derivativeFilter),
      describe: 'Derivative filter factor N: Tf = Td/N; "none" for an unfiltered derivative',
    })
    .option('sample-time-s', {
      type: 'number',
      describe: `Firmware sample time Ts, s: the discrete PID with a zero-order hold, margins and verdict on the exact sampled loop (default ${CONTROLLER_DEFAULTS.sampleTime_s}, as tune and build)`,
    })
    .option('discretisation', {
      type: 'string',
      choices: ['backward-euler', 'tustin'] as const,
      default: CONTROLLER_DEFAULTS.discretisation,
      describe: 'Discretisation of the discrete PID',
    })
    .option('latency-s', {
      type: 'number',
      describe: 'Computation latency from sample to actuator command, s, added to the plant delay (default: one sample, Ts, as tune and build)',
    })
    .option('continuous', {
      type: 'boolean',
      default: false,
      describe: 'Analyse a continuous PID instead (no sampling; latency 0 s unless --latency-s): textbook loops, or a controller much faster than the plant',
    })
    .option('json', { type: 'boolean', default: false, describe: 'Print the margins as JSON (units in field names; absent margins are null)' });
}

type Args = OptionsOf<typeof builder>;

export const command = defineCommand({
  command: 'stability',
  describe:
    'Stability margins of one loop: a plant (transfer function with delay, or FOPDT) under a PID — phase, lower and upper gain, delay margins, sensitivity peaks and a verdict',
  builder,
  exitCodes: [
    [0, 'the loop is stable'],
    [1, 'it is not stable, or the two tests (closed-loop poles, Nyquist count) do not agree'],
    [2, 'bad input: plant, controller or options'],
  ],
  examples: [
    [
      'speedband stability --gain 2.4 --time-constant-s 0.12 --dead-time-s 0.07 --kp 0.35 --ki 2.5',
      'A yaw-rate PI loop on an identified FOPDT, run as firmware at 100 Hz with one sample of latency',
    ],
    [
      'speedband stability --numerator 1 --denominator "1 0 0" --delay-s 1 --kp 0.0625 --ki 8 --kd 8 --form series --derivative-filter none --continuous',
      'SIMC PID on a double integrator with delay, continuous as in the paper: both gain margins',
    ],
    [
      'speedband stability --gain 2.4 --time-constant-s 0.12 --dead-time-s 0.07 --kp 0.35 --ki 2.5 --sample-time-s 0.02 --latency-s 0.005 --json',
      'The same loop as firmware at 50 Hz with 5 ms latency, as JSON',
    ],
  ],
  run: async (args, io) => {
    const { analyseLoop } = await import('../../verify/analyse-loop.js');
    const numerator = coefficientOption(args, 'numerator');
    const denominator = coefficientOption(args, 'denominator');
    const gain = numberOption(args, 'gain');
    const timeConstant_s = numberOption(args, 'time-constant-s');
    const deadTime_s = numberOption(args, 'dead-time-s');
    const fopdtGiven = [gain, timeConstant_s, deadTime_s].filter((value) => value !== undefined).length;
    const rationalGiven = numerator !== undefined || denominator !== undefined;
    if (rationalGiven && fopdtGiven > 0) {
      throw new SpeedbandError(
        'cli.conflictingPlant',
        'both a transfer function (--numerator/--denominator) and a FOPDT (--gain/--time-constant-s/--dead-time-s) were given — pass one plant',
      );
    }
    let plant: { numerator: number[]; denominator: number[]; delay_s: number };
    if (rationalGiven) {
      if (numerator === undefined || denominator === undefined) {
        throw new SpeedbandError(
          'cli.incompleteModel',
          `--${numerator === undefined ? 'numerator' : 'denominator'} is missing — a transfer function needs both --numerator and --denominator`,
        );
      }
      plant = { numerator, denominator, delay_s: numberOption(args, 'delay-s') ?? 0 };
    } else if (fopdtGiven === 3) {
      if (!(timeConstant_s! >= 0) || !(deadTime_s! >= 0)) {
        throw new SpeedbandError('cli.badNumber', `FOPDT times must be ≥ 0 s; got time constant ${timeConstant_s} s and dead time ${deadTime_s} s`);
      }
      plant = { numerator: [gain!], denominator: [timeConstant_s!, 1], delay_s: deadTime_s! };
    } else {
      throw new SpeedbandError(
        'cli.missingModel',
        fopdtGiven === 0
          ? 'no plant given — pass --numerator and --denominator (and --delay-s), or --gain, --time-constant-s and --dead-time-s'
          : 'a FOPDT plant needs all of --gain, --time-constant-s and --dead-time-s',
      );
    }
    const form = args.form;
    const ki = numberOption(args, 'ki') ?? (form === 'parallel' ? 0 : Infinity);
    const continuous = args.continuous;
    if (continuous && args['sample-time-s'] !== undefined) {
      throw new SpeedbandError('cli.conflictingOptions', '--continuous and --sample-time-s both given — a continuous controller has no sample time: drop one');
    }
    const derivativeFilter = filterOption(args['derivative-filter']);
    // The same defaults as tune and build (src/controller/defaults.ts): 0.01 s, one sample of latency.
    const controller = continuous
      ? null
      : resolveControllerSettings({
          ...(args['sample-time-s'] === undefined ? {} : { sampleTime_s: numberOption(args, 'sample-time-s')! }),
          ...(args['latency-s'] === undefined ? {} : { computationLatency_s: numberOption(args, 'latency-s')! }),
          derivativeFilter,
          discretisation: args.discretisation,
        });
    const margins = analyseLoop({
      plant,
      pid: { kp: numberOption(args, 'kp')!, ki, kd: numberOption(args, 'kd') ?? 0, derivativeFilter, form },
      ...(controller === null ? {} : { sampleTime_s: controller.sampleTime_s, discretisation: controller.discretisation }),
      latency_s: controller?.computationLatency_s ?? numberOption(args, 'latency-s') ?? 0,
    });
    const controllerWords =
      controller === null
        ? `continuous PID, derivative filter N = ${derivativeFilter}, latency ${numberOption(args, 'latency-s') ?? 0} s`
        : describeControllerSettings(controller);
    if (args.json) {
      io.stdout(
        `${JSON.stringify({ controller: controller ?? { continuous: true, derivativeFilter: Number.isFinite(derivativeFilter) ? derivativeFilter : null, computationLatency_s: numberOption(args, 'latency-s') ?? 0 }, ...margins }, null, 2)}\n`,
      );
    } else {
      const lines = [
        `controller: ${controllerWords}`,
        `verdict: ${margins.verdict}${verdictEvidence(margins)}`,
        ...(margins.stable
          ? [
              `phase margin:        ${format(margins.phaseMargin_deg, 2, '°')}${at(margins.phaseMarginFrequency_radps)}${margins.phaseMarginDirection === 'lead' ? '  (a phase LEAD of this much reaches −1)' : ''}`,
              `upper gain margin:   ${format(margins.upperGainMargin_dB, 2, 'dB')}${at(margins.upperGainMarginFrequency_radps)}${margins.upperGainMargin_dB === null ? '' : '  (raising the gain by this destabilises)'}`,
              `lower gain margin:   ${format(margins.lowerGainMargin_dB, 2, 'dB')}${at(margins.lowerGainMarginFrequency_radps)}${margins.lowerGainMargin_dB === null ? '' : '  (reducing the gain by this destabilises)'}`,
              `delay margin:        ${format(margins.delayMargin_s, 4, 's')}${at(margins.delayMarginFrequency_radps)}`,
            ]
          : [
              `margins:             the loop is not stable: phase, gain and delay margins do not apply${margins.analysis?.verdictNote ? ` (${margins.analysis.verdictNote})` : ''}`,
              ...(margins.analysis?.gainCrossovers ?? []).map(
                (c) => `  gain crossover at ${c.frequency_radps.toPrecision(4)} rad/s: 180° + ∠L = ${c.phaseMargin_deg.toFixed(2)}°`,
              ),
            ]),
        `sensitivity peak Ms: ${margins.sensitivityPeak.toFixed(3)}${at(margins.sensitivityPeakFrequency_radps)}`,
        `complementary peak:  ${margins.complementarySensitivityPeak.toFixed(3)}${at(margins.complementarySensitivityPeakFrequency_radps)}`,
      ];
      if (margins.analysis?.neutralType) {
        lines.push(
          `|L(j∞)| = ${margins.analysis.highFrequencyLoopGain.toFixed(3)} ≥ 1 with a delay: a neutral-type loop, unstable whatever the margins — filter the derivative (--derivative-filter N)`,
        );
      }
      if (margins.analysis && margins.analysis.openLoopRightHalfPlanePoles > 0) {
        lines.push(
          `open loop has ${margins.analysis.openLoopRightHalfPlanePoles} pole(s) in the right half-plane${margins.analysis.sampledDataVerdict === undefined ? '' : ' (outside the unit circle once sampled)'}: stability comes from the encirclement count, not the margins alone`,
        );
      }
      io.stdout(`${lines.join('\n')}\n`);
    }
    return margins.stable ? EXIT.ok : EXIT.failed;
  },
});
