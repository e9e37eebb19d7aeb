/**
 * C99 header for firmware: the breakpoints and gains as const arrays and a `static inline` lookup
 * that computes exactly what src/schedule/interpolate.ts computes — clamp to the table, the
 * low-speed floor, linear or monotone cubic Hermite (Fritsch & Carlson 1980, slopes stored), exact
 * values at breakpoints, result kept between neighbouring values — and returns a status for a speed
 * that is NaN or infinite (c-lookup.ts). Arithmetic in IEEE 754 double. No dynamic memory, no library
 * calls. The floating-point header also holds the controller equation as a step function with its state struct
 * (c-controller.ts). With a fixed-point format the header holds integers only — speeds in 2^−16 m/s, each gain in its
 * Q format, the Hermite slope terms — and an integer lookup (c-integer-lookup.ts, the same computation as
 * integer-lookup.ts, which the export re-checks): no floating point on that path.
 * No text from the schedule reaches the header except through the comment whitelist (c-comment.ts);
 * identifiers come from the validated prefix, numbers from cDouble, the checksum is checked hex.
 * A schedule whose check did not pass gives a header that stops the build with #error unless the
 * user defines <PREFIX>_ALLOW_FAILING_SCHEDULE (for review only).
 */
import { SpeedbandError } from '../core/errors.js';
import { quoted } from '../core/quote.js';
import { gainSlopes } from '../schedule/interpolate.js';
import { scheduleLookupSettings, scheduleTable } from '../schedule/schedule-lookup.js';
import type { ScheduleFile } from '../schedule/schedule-types.js';
import { modelWords, referencePointText } from '../schedule/schedule-text.js';
import type { GainTable, WorstMargins, WorstValue } from '../schedule/types.js';
import { cComment, commentSafe } from './c-comment.js';
import { LOOKUP_STATUS, lookupFunctionsText } from './c-lookup.js';
import { integerLookupText } from './c-integer-lookup.js';
import { controllerFunctionsText } from './c-controller.js';
import { monotoneCubicSlopes } from '../schedule/monotone-cubic.js';
import { quantiseTable, type ExtraColumn, type FixedPointRequest, type QuantisedTable } from './fixed-point.js';
import { integerArithmeticLines } from './c-integer-comment.js';
import { integerControllerText } from './c-integer-controller.js';
import { integerStepPlan, type IntegerStepPlan } from './integer-step-plan.js';

/** The dense check whose figures the header states (at export: the gains it holds, re-checked). */
export interface HeaderCheck {
  readonly passed: boolean;
  readonly gridSize: number;
  readonly failedSpeeds: number;
  readonly worst: WorstMargins;
  /** Where the figures come from, in words. */
  readonly source: string;
}

/** One breakpoint's gains, proven to pass the dense check when held constant over the whole range. */
export interface FallbackGains {
  readonly breakpoint: number;
  readonly speed_mps: number;
  readonly gridSize: number;
  readonly worst: WorstMargins;
}

/** Options of exportC: fixed-point format, identifier prefix, the check to state, fallback gains. */
export interface CHeaderOptions {
  /** A Q format for every gain, or 'auto' (per gain, from its range): the integer-only header. */
  readonly fixedPoint?: FixedPointRequest;
  /** Prefix of every C identifier; the include guard is its upper case. Default 'speedband_schedule'. */
  readonly prefix?: string;
  /** The check to state and to decide on #error (default: the schedule's recorded check). */
  readonly check?: HeaderCheck;
  /** Fallback gains for a NaN or infinite speed (default: none — the lookup then returns LOOKUP_NO_GAINS). */
  readonly fallback?: FallbackGains | null;
}

/** The C header text and, with a fixed-point format, the quantised table and its errors and the step function's plan. */
export interface CHeaderExport {
  readonly text: string;
  /** Present with a fixed-point format: the quantised table and its errors. */
  readonly quantisation?: QuantisedTable;
  /** Present with a fixed-point format: the integer step function's formats, constants and ranges. */
  readonly stepPlan?: IntegerStepPlan;
}

/** Defaults of the C header: the identifier prefix. */
export const C_HEADER_DEFAULTS = { prefix: 'speedband_schedule' } as const;

/** The macro a user defines to compile the header of a schedule that failed its check (for review only). */
export const allowFailingMacro = (prefix: string): string => `${prefix.toUpperCase()}_ALLOW_FAILING_SCHEDULE`;

/** A C double literal that parses back to exactly x (shortest round-trip digits). */
export function cDouble(x: number): string {
  if (typeof x !== 'number' || !Number.isFinite(x)) throw new SpeedbandError('export.notFinite', `the value ${String(x)} cannot be written as a C constant`);
  const text = String(x);
  return /[.e]/.test(text) ? text : `${text}.0`;
}

const list = (values: ArrayLike<number>, format: (x: number) => string): string => Array.from(values, format).join(', ');

const figure = (label: string, value: WorstValue | null, unit: string): string =>
  `${label}: ${value === null ? 'none' : `${Number(value.value.toPrecision(4))}${unit} at ${Number(value.speed_mps.toPrecision(4))} m/s`}`;

const worstLines = (worst: WorstMargins): string[] => [
  `  ${figure('worst phase margin', worst.phaseMargin_deg, ' deg')}; ${figure('worst upper gain margin', worst.upperGainMargin_dB, ' dB')};`,
  `  ${figure('worst lower gain margin', worst.lowerGainMargin_dB, ' dB')}; ${figure('worst delay margin', worst.delayMargin_s, ' s')}; ${figure('largest sensitivity peak', worst.sensitivityPeak, '')}.`,
];

/** The C99 header text for a schedule (see the file comment for what it computes). */
export function exportC(schedule: ScheduleFile, options: CHeaderOptions = {}): CHeaderExport {
  const prefix = options.prefix ?? C_HEADER_DEFAULTS.prefix;
  if (!/^[A-Za-z_][A-Za-z0-9_]{0,62}$/.test(prefix)) {
    throw new SpeedbandError(
      'export.prefixInvalid',
      `${quoted(prefix)} is not a C identifier — use letters, digits and underscores, not starting with a digit, at most 63 characters`,
    );
  }
  if (!/^[0-9a-f]{64}$/.test(schedule.checksum.value)) {
    throw new SpeedbandError('export.checksumInvalid', 'the schedule checksum is not 64 hexadecimal digits — read the schedule with readSchedule first');
  }
  const upper = prefix.toUpperCase();
  const settings = scheduleLookupSettings(schedule);
  const exact = scheduleTable(schedule);
  const quantisation = options.fixedPoint === undefined ? undefined : quantiseTable(exact, options.fixedPoint, settings, scheduleExtraColumns(schedule));
  const stepPlan = quantisation === undefined ? undefined : integerStepPlan(schedule, quantisation.integer);
  const table: GainTable = quantisation?.table ?? exact;
  const cubic = settings.interpolation === 'monotone-cubic';
  const slopes = gainSlopes(table, settings.interpolation);
  const n = table.speeds_mps.length;
  const { units, controller, loop } = schedule;
  const check: HeaderCheck = options.check ?? {
    passed: schedule.status === 'passed',
    gridSize: schedule.check.gridSize,
    failedSpeeds: schedule.check.failedSpeeds,
    worst: schedule.check.worst,
    source: 'as recorded in the schedule',
  };
  const fallback = options.fallback ?? null;
  if (fallback !== null && !(Number.isInteger(fallback.breakpoint) && fallback.breakpoint >= 0 && fallback.breakpoint < n)) {
    throw new SpeedbandError('export.fallbackInvalid', `fallback breakpoint ${fallback.breakpoint} is not a breakpoint of the table (0 to ${n - 1})`);
  }
  const optIn = allowFailingMacro(prefix);

  const header = cComment([
    `Gain schedule for ${schedule.vehicle.name} -- generated by speedband ${schedule.provenance.toolVersion} from schedule.json.`,
    'Do not edit: the checksum below covers every field of the schedule file (gains, margins, limits, texts, provenance).',
    '',
    `Loop: ${loop.kind}${loop.kind === 'path' ? ` (preview ${loop.preview_m} m${(loop.previewTime_s ?? 0) === 0 ? '' : ` + ${loop.previewTime_s} s x speed`} from the ${referencePointText(loop.referencePoint ?? 'cg')})` : ''}.`,
    `Error: ${loop.error}.`,
    `Units: speed ${units.speed}; output ${units.output} (road-wheel angle command); kp ${units.kp}; ki ${units.ki}; kd ${units.kd}.`,
    `Controller (${controller.form} form, derivative filter N = ${controller.derivativeFilter}, ${controller.discretisation}, sample time ${controller.sampleTime_s} s, computation latency ${controller.computationLatency_s} s, anti-windup ${controller.antiWindup}):`,
    `  ${controller.equation}`,
    `  Feed-forward: ${controller.feedForward}`,
    ...controller.update.map((line) => `  ${line}`),
    `  ${controller.integration}`,
    `Interpolation: ${schedule.interpolation.description}`,
    ...(quantisation === undefined || stepPlan === undefined
      ? ['Arithmetic: IEEE 754 double.']
      : integerArithmeticLines({ schedule, quantisation, plan: stepPlan, prefix })),
    `Dense check of the gains in this header (${modelWords(schedule.check.model.kind)}, ${check.gridSize} speeds, ${schedule.check.range.minimum_mps} to ${schedule.check.range.maximum_mps} m/s, ${check.source}): ` +
      `${check.passed ? 'PASSED' : `FAILED at ${check.failedSpeeds} speeds`}.`,
    ...worstLines(check.worst),
    ...(schedule.variations === undefined
      ? []
      : [
          `Worst case over ${schedule.variations.set.dimensions.length} varied parameters (${schedule.variations.acceptance} acceptance; as recorded in the schedule, not re-run at export): ` +
            `${schedule.variations.passed ? 'PASSED' : `FAILED at ${schedule.variations.failedSpeeds} speeds`}.`,
        ]),
    `Lookup status: ${upper}_LOOKUP_OK (${LOOKUP_STATUS.OK.value}), ${upper}_LOOKUP_FALLBACK (${LOOKUP_STATUS.FALLBACK.value}), ${upper}_LOOKUP_NO_GAINS (${LOOKUP_STATUS.NO_GAINS.value}): check it.`,
    quantisation !== undefined
      ? `An integer speed is never NaN: the lookup does not return ${upper}_LOOKUP_FALLBACK. ${
          fallback === null
            ? `No breakpoint's gains, held constant, pass the dense check over the whole range (${upper}_FALLBACK_BREAKPOINT -1).`
            : `Breakpoint ${fallback.breakpoint} (${fallback.speed_mps} m/s) holds gains that, held constant, pass the dense check at all ${fallback.gridSize} speeds (for a speed-sensor fault).`
        }`
      : fallback === null
        ? `Speed NaN or infinite: no fallback -- no breakpoint's gains, held constant, pass the dense check over the whole range; the lookup returns ${upper}_LOOKUP_NO_GAINS and leaves the gains unwritten (hand over or stop).`
        : `Speed NaN or infinite: fallback gains of breakpoint ${fallback.breakpoint} (${fallback.speed_mps} m/s), which held constant pass the dense check at all ${fallback.gridSize} speeds of the range; the lookup returns ${upper}_LOOKUP_FALLBACK.`,
    ...(check.passed
      ? []
      : [`This schedule FAILED its check: the header stops the build with #error unless ${optIn} is defined (review only, never to drive).`]),
    `Checksum: ${schedule.checksum.algorithm} ${schedule.checksum.value}`,
    `  (${schedule.checksum.canonicalForm})`,
    '',
    'Safety:',
    ...schedule.cautions.map((caution) => `  ${caution}`),
  ]);

  const unitsComment = `kp ${commentSafe(units.kp)}, ki ${commentSafe(units.ki)}, kd ${commentSafe(units.kd)}`;
  // Set-point weights and feed-forward, interpolated like the gains.
  const extras = scheduleExtraColumns(schedule);
  const extraNames = Object.keys(extras) as (keyof typeof extras)[];
  const status = [
    `#define ${upper}_LOOKUP_OK ${LOOKUP_STATUS.OK.value}`,
    `#define ${upper}_LOOKUP_FALLBACK ${LOOKUP_STATUS.FALLBACK.value}`,
    `#define ${upper}_LOOKUP_NO_GAINS ${LOOKUP_STATUS.NO_GAINS.value}`,
  ];
  const body =
    quantisation === undefined
      ? [
          ...status,
          `/* Breakpoint whose gains the lookup returns for a NaN or infinite speed; -1: none. */`,
          `#define ${upper}_FALLBACK_BREAKPOINT ${fallback === null ? -1 : fallback.breakpoint}`,
          '',
          `/* The scheduled values at one speed: ${unitsComment}; set-point weights b and c;`,
          ` * feed_forward ${commentSafe(units.feedForward)} (input ${commentSafe(units.feedForwardInput)}); feed_forward_lead_time_s s (read the input this far ahead). */`,
          `typedef struct ${prefix}_gains {`,
          '  double kp;',
          '  double ki;',
          '  double kd;',
          '  double setpoint_weight_p;',
          '  double setpoint_weight_d;',
          '  double feed_forward;',
          '  double feed_forward_lead_time_s;',
          `} ${prefix}_gains;`,
          '',
          '/* Breakpoint speeds, m/s, strictly increasing. */',
          `static const double ${prefix}_speed_mps[${upper}_BREAKPOINTS] = { ${list(table.speeds_mps, cDouble)} };`,
          ...(['kp', 'ki', 'kd'] as const).map(
            (name) =>
              `static const double ${prefix}_${name}[${upper}_BREAKPOINTS] = { ${list(
                table.gains.map((row) => row[name]),
                cDouble,
              )} };`,
          ),
          ...extraNames.map((name) => `static const double ${prefix}_${name}[${upper}_BREAKPOINTS] = { ${list(extras[name], cDouble)} };`),
          ...(cubic
            ? [
                '/* Hermite slopes (Fritsch & Carlson 1980), value per m/s. */',
                ...(['kp', 'ki', 'kd'] as const).map(
                  (name) => `static const double ${prefix}_${name}_slope[${upper}_BREAKPOINTS] = { ${list(slopes[name], cDouble)} };`,
                ),
                ...extraNames.map(
                  (name) =>
                    `static const double ${prefix}_${name}_slope[${upper}_BREAKPOINTS] = { ${list(monotoneCubicSlopes(table.speeds_mps, extras[name]), cDouble)} };`,
                ),
              ]
            : []),
          '',
          lookupFunctionsText({
            prefix,
            upper,
            cubic,
            gainValue: (name, index) => `${prefix}_${name}[${index}]`,
            fallbackBreakpoint: fallback?.breakpoint ?? null,
          }),
        ]
      : [
          ...status,
          `/* Breakpoint whose gains pass the dense check held constant over the whole range; -1: none. */`,
          `#define ${upper}_FALLBACK_BREAKPOINT ${fallback === null ? -1 : fallback.breakpoint}`,
          ...integerLookupText({ prefix, upper, quantisation, unitsComment }),
        ];

  const lines = [
    ...(check.passed
      ? []
      : [
          `#ifndef ${optIn}`,
          `#error "speedband: this gain schedule FAILED its dense stability check and is for review only; define ${optIn} to compile it anyway"`,
          '#endif',
        ]),
    header,
    `#ifndef ${upper}_H`,
    `#define ${upper}_H`,
    '',
    ...(quantisation === undefined ? [] : ['#include <stdint.h>', '']),
    `#define ${upper}_BREAKPOINTS ${n}`,
    `#define ${upper}_SAMPLE_TIME_S ${cDouble(controller.sampleTime_s)}`,
    `#define ${upper}_DERIVATIVE_FILTER ${cDouble(controller.derivativeFilter)}`,
    `#define ${upper}_INTEGRATOR_CLAMP_RAD ${cDouble(controller.integratorClamp_rad)}`,
    `/* The step function's command limit, rad (the steering-angle limit, as the integrator clamp). */`,
    `#define ${upper}_COMMAND_LIMIT_RAD ${cDouble(controller.integratorClamp_rad)}`,
    `#define ${upper}_LOW_SPEED_FLOOR_MPS ${cDouble(settings.lowSpeedFloor_mps)}`,
    `#define ${upper}_CHECKSUM "${schedule.checksum.value}"`,
    ...body,
    '',
    // The controller equation: in double, or in integers only with a fixed-point format.
    stepPlan === undefined
      ? controllerFunctionsText({ prefix, upper, discretisation: controller.discretisation, antiWindup: controller.antiWindup })
      : integerControllerText({ prefix, upper, plan: stepPlan }),
    '',
    `#endif /* ${upper}_H */`,
    '',
  ];
  return { text: lines.join('\n'), ...(quantisation === undefined || stepPlan === undefined ? {} : { quantisation, stepPlan }) };
}

/** The schedule's set-point weights, feed-forward gain and lead time per breakpoint, by their C names. */
export function scheduleExtraColumns(schedule: Pick<ScheduleFile, 'breakpoints'>): Record<ExtraColumn, number[]> {
  return {
    setpoint_weight_p: schedule.breakpoints.map((row) => row.setpointWeightProportional),
    setpoint_weight_d: schedule.breakpoints.map((row) => row.setpointWeightDerivative),
    feed_forward: schedule.breakpoints.map((row) => row.feedForward),
    feed_forward_lead_time_s: schedule.breakpoints.map((row) => row.feedForwardLeadTime_s),
  };
}
