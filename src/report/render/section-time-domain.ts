/**
 * The time-domain figures of the schedule (breakpoints[].timeDomain, from its exact sampled closed loop)
 * against speed with their limits, their table as the file holds them, and — when the model the schedule
 * records can be rebuilt — the responses behind them at a few breakpoints: the reference step (and the step
 * through the steering limits), the disturbances, the path loop's lane change and curve entry, and the
 * steering angle and rate against the vehicle's limits.
 */
import { limitWords } from './limit-marks.js';
import type { NumberOverSpeed } from '../../core/by-speed.js';
import { limitMarks } from './limit-marks.js';
import type { ScheduleFile } from '../../schedule/schedule-types.js';
import type { RobustTimeDomainFigure } from '../../schedule/variation-types.js';
import type { ReportData } from '../types.js';
import { LOOKS, tracesFigure, type Look } from './closed-loop-figure.js';
import { renderFigure, type RenderContext } from './figure.js';
import { escapeHtml, fixedNumber, htmlTable, numberCell, shownNumber, textCell, type Cell } from './html.js';
import { ROLE_COLOURS } from './palette.js';
import type { Mark, PlotSpec } from './plot-types.js';

/** Whether any breakpoint of the schedule has time-domain figures. */
export const hasTimeDomain = (data: ReportData): boolean => data.schedule.breakpoints.some((breakpoint) => breakpoint.timeDomain !== null);

/** Every time-domain figure of every breakpoint as schedule.json holds it (exact values in `<data>`). */
export function timeDomainTable(schedule: ScheduleFile): string {
  type Figures = NonNullable<ScheduleFile['breakpoints'][number]['timeDomain']>;
  const figures = schedule.breakpoints.map((breakpoint) => breakpoint.timeDomain);
  const columns: { header: string; field: string; value: (t: Figures) => number | null | undefined }[] = [
    { header: 'overshoot %', field: 'referenceStep.overshoot_pct', value: (t) => t.referenceStep.overshoot_pct },
    { header: 'settling s', field: 'referenceStep.settlingTime_s', value: (t) => t.referenceStep.settlingTime_s },
    { header: 'misalignment recovery s', field: 'steeringMisalignment.recoveryTime_s', value: (t) => t.steeringMisalignment.recoveryTime_s },
    { header: 'lateral force recovery s', field: 'lateralForce.recoveryTime_s', value: (t) => t.lateralForce?.recoveryTime_s },
    { header: 'lane-change error m', field: 'laneChange.peakError_m', value: (t) => t.laneChange?.peakError_m },
    { header: 'curve-entry error m', field: 'curveEntry.errorAfterSettle_m', value: (t) => t.curveEntry?.errorAfterSettle_m },
    { header: 'step through the limits: overshoot %', field: 'limitedStep.overshoot_pct', value: (t) => t.limitedStep?.overshoot_pct },
    { header: 'step through the limits: settling s', field: 'limitedStep.settlingTime_s', value: (t) => t.limitedStep?.settlingTime_s },
    {
      header: `largest reference the actuator allows (${schedule.units.error})`,
      field: 'actuator.largestReference',
      value: (t) => t.actuator.largestReference,
    },
  ];
  // A column no breakpoint has (a figure of another loop or model) is left out.
  const shown = columns.filter((column) => figures.some((t) => t !== null && column.value(t) !== undefined && column.value(t) !== null));
  const rows = schedule.breakpoints.map((breakpoint): Cell[] => {
    const t = breakpoint.timeDomain;
    return [
      numberCell(breakpoint.speed_mps, 'speed_mps', fixedNumber(breakpoint.speed_mps, 2)),
      numberCell(breakpoint.setpointWeightProportional, 'setpointWeightProportional', shownNumber(breakpoint.setpointWeightProportional, 3)),
      numberCell(breakpoint.setpointWeightDerivative, 'setpointWeightDerivative', shownNumber(breakpoint.setpointWeightDerivative, 3)),
      numberCell(breakpoint.feedForward, 'feedForward'),
      numberCell(breakpoint.feedForwardLeadTime_s, 'feedForwardLeadTime_s', shownNumber(breakpoint.feedForwardLeadTime_s, 3)),
      ...shown.map((column) => {
        const value = t === null ? null : (column.value(t) ?? null);
        return numberCell(value, column.field, shownNumber(value, 3));
      }),
      textCell(t === null ? '—' : t.actuator.limitedBy, 'actuator.limitedBy'),
    ];
  });
  const { limits } = schedule.check.timeDomain;
  const pathLimits =
    schedule.loop.kind === 'path'
      ? `, lane-change error ≤ ${limitWords(limits.maximumLaneChangeError_m)} m, curve-entry error ≤ ${limitWords(limits.maximumCurveEntryError_m)} m`
      : '';
  return htmlTable({
    id: 'time-domain-table',
    caption:
      `Set-point weights b and c, feed-forward and the time-domain figures at each breakpoint (— where the loop is not stable or a figure is not reached in the simulated time); ` +
      `limits: overshoot ≤ ${limitWords(limits.maximumOvershoot_pct)} %, recovery ≤ ${limitWords(limits.maximumRecoveryTime_s)} s${pathLimits}`,
    header: ['speed m/s', 'b', 'c', `feed-forward ${schedule.units.feedForward}`, 'lead s', ...shown.map((column) => column.header), 'limited by'],
    rows,
  });
}

interface FigureAgainstSpeed {
  readonly name: string;
  readonly unit: string;
  /** The limit (at most), one number or a table over speed. */
  readonly limit: NumberOverSpeed;
  readonly series: readonly {
    readonly label: string;
    readonly look: Look;
    readonly values: readonly (number | null)[];
    /** The old gains on the new vehicle at the same breakpoints (with a baseline). */
    readonly old: readonly (number | null)[] | null;
    /** The worst value over the plan's variations at the breakpoints (when the schedule records them), and its name there. */
    readonly worst: readonly (number | null)[] | null;
    readonly robust: RobustTimeDomainFigure;
  }[];
}

type Figures = NonNullable<ScheduleFile['breakpoints'][number]['timeDomain']>;

/** The time-domain figures with a limit, against the speed of the breakpoints; `old`: the old gains' figures on the new vehicle. */
function figuresAgainstSpeed(schedule: ScheduleFile, old: readonly (Figures | null)[] | null): FigureAgainstSpeed[] {
  const { limits } = schedule.check.timeDomain;
  const ofList = (list: readonly (Figures | null)[], pick: (t: Figures) => number | null | undefined): (number | null)[] =>
    list.map((figures) => (figures === null ? null : (pick(figures) ?? null)));
  const variations = schedule.variations;
  const series = (
    label: string,
    look: Look,
    pick: (t: Figures) => number | null | undefined,
    robust: RobustTimeDomainFigure,
  ): FigureAgainstSpeed['series'][number] => ({
    label,
    look,
    values: ofList(
      schedule.breakpoints.map((breakpoint) => breakpoint.timeDomain),
      pick,
    ),
    old: old === null ? null : ofList(old, pick),
    worst: variations === undefined ? null : variations.breakpoints.map((b) => b.timeDomain?.worst[robust]?.value ?? null),
    robust,
  });
  const present = (entry: FigureAgainstSpeed['series'][number]): boolean => entry.values.some((value) => value !== null);
  const overshoot = [series('reference step (with the set-point weights)', LOOKS.referenceStep, (t) => t.referenceStep.overshoot_pct, 'overshoot_pct')];
  if (schedule.loop.kind === 'heading')
    overshoot.push(series('step through the steering limits', LOOKS.limitedStep, (t) => t.limitedStep?.overshoot_pct, 'limitedStepOvershoot_pct'));
  const figures: FigureAgainstSpeed[] = [
    { name: 'overshoot', unit: '%', limit: limits.maximumOvershoot_pct, series: overshoot.filter(present) },
    {
      name: 'recovery time',
      unit: 's',
      limit: limits.maximumRecoveryTime_s,
      series: [
        series('steering misalignment', LOOKS.steeringMisalignment, (t) => t.steeringMisalignment.recoveryTime_s, 'misalignmentRecoveryTime_s'),
        series('lateral force step', LOOKS.lateralForce, (t) => t.lateralForce?.recoveryTime_s, 'lateralForceRecoveryTime_s'),
      ].filter(present),
    },
    {
      name: 'lane-change error',
      unit: 'm',
      limit: limits.maximumLaneChangeError_m,
      series: [series('largest error while changing lane', LOOKS.laneChange, (t) => t.laneChange?.peakError_m, 'laneChangeError_m')].filter(present),
    },
    {
      name: 'curve-entry error',
      unit: 'm',
      limit: limits.maximumCurveEntryError_m,
      series: [series('largest error from 3 s after entry on', LOOKS.curveEntry, (t) => t.curveEntry?.errorAfterSettle_m, 'curveEntryError_m')].filter(present),
    },
  ];
  return figures.filter((figure) => figure.series.length > 0);
}

/** Markers of the old gains' series, by the series' place in its panel (all in the baseline's colour). */
const OLD_SHAPES = ['open-circle', 'plus', 'cross'] as const;

/** One figure against speed. */
function speedPanel(schedule: ScheduleFile, figure: FigureAgainstSpeed): PlotSpec {
  const speeds = schedule.breakpoints.map((breakpoint) => breakpoint.speed_mps);
  const drawn = limitMarks({ limit: figure.limit, failsBelow: false, regionLabel: (_, varies) => `beyond the limit${varies ? ' at every speed' : ''}` });
  const marks: Mark[] = [...drawn.marks];
  figure.series.forEach((series, k) => {
    if (series.worst?.some((value) => value !== null)) {
      const speedsOfSet = schedule.variations?.breakpoints.map((b) => b.speed_mps) ?? speeds;
      marks.push({
        kind: 'points',
        label: `${series.label}: worst case over the variations`,
        x: speedsOfSet,
        y: series.worst,
        style: { colour: 'skyBlue' },
        shape: k === 0 ? 'diamond' : 'square',
        size: 4.5,
      });
    }
    if (series.old?.some((value) => value !== null)) {
      const label = `${series.label}: old gains on the new vehicle`;
      marks.push({
        kind: 'points',
        label,
        x: speeds,
        y: series.old,
        style: { colour: ROLE_COLOURS.baseline },
        shape: OLD_SHAPES[k % OLD_SHAPES.length],
        size: 4.5,
      });
    }
    const { colour, shape } = series.look;
    marks.push({
      kind: 'line',
      label: `${series.label}, between breakpoints`,
      x: speeds,
      y: series.values,
      style: { colour, dash: 'dot', width: 1 },
      legend: false,
    });
    marks.push({ kind: 'points', label: series.label, x: speeds, y: series.values, style: { colour }, shape, size: 3.5 });
  });
  return {
    title: `${figure.name} against speed`,
    description: `${figure.name} of the sampled closed loop at each breakpoint against speed, ${figure.unit}, with the limit ${limitWords(figure.limit)} ${figure.unit} (at most) and the side beyond it shaded`,
    x: { label: 'speed, m/s', domain: [schedule.check.range.minimum_mps, schedule.check.range.maximum_mps] },
    y: { label: `${figure.name}, ${figure.unit}`, include: [0, drawn.value * 1.1] },
    marks,
    width: 420,
    height: 220,
  };
}

export function renderTimeDomainSection(data: ReportData, context: RenderContext): string {
  const { schedule, closedLoop } = data;
  const td = schedule.check.timeDomain;
  const old = data.baseline?.timeDomain ?? null;
  const figures = figuresAgainstSpeed(schedule, old);
  const unstable = schedule.breakpoints
    .filter((breakpoint) => breakpoint.timeDomain === null)
    .map((breakpoint) => `${fixedNumber(breakpoint.speed_mps, 2)} m/s`);
  const parts = [
    `<p>The exact sampled closed loop (the firmware's controller equation, its sample time and latency) simulated at each breakpoint: a reference step with the set-point weights b and c, a steering misalignment of the road wheels, a lateral force step` +
      `${schedule.loop.kind === 'path' ? ', a lane change and a curve entry as planned path with the feed-forward on' : ', and a step through the steering angle and rate limits'}. ` +
      `<strong>${td.passed ? 'Every breakpoint keeps the time-domain limits.' : `${td.failures.length} breakpoint${td.failures.length === 1 ? '' : 's'} break a time-domain limit.`}</strong>` +
      `${unstable.length === 0 ? '' : ` No figures at ${escapeHtml(unstable.join(', '))}: the loop is not stable there.`}</p>`,
  ];
  if (td.failures.length > 0)
    parts.push(
      `<ul>${td.failures.map((failure) => `<li>${fixedNumber(failure.speed_mps, 2)} m/s: ${failure.messages.map(escapeHtml).join('; ')}</li>`).join('')}</ul>`,
    );
  parts.push(`<div class="table-scroll">${timeDomainTable(schedule)}</div>`);
  const scenarios = schedule.check.scenarios;
  if (scenarios !== undefined) {
    // The scenario check of the schedule (speedband simulate's scenarios), as schedule.json records it.
    const speeds = scenarios.speeds_mps.map((speed) => fixedNumber(speed, 2)).join(', ');
    parts.push(
      `<h3 id="scenarios">Closed-loop scenarios</h3><p>${escapeHtml(`${scenarios.scenarios.length} scenarios (${scenarios.scenarios.join(', ')}) at ${speeds} m/s and through the range, on ${scenarios.model}: `)}` +
        `<strong>${scenarios.passed ? 'every run within the scenario limits' : `${scenarios.failures.length} limit${scenarios.failures.length === 1 ? '' : 's'} broken`}</strong>.</p>` +
        (scenarios.failures.length === 0
          ? ''
          : `<ul>${scenarios.failures.map((failure) => `<li>${fixedNumber(failure.speed_mps, 2)} m/s, ${escapeHtml(failure.scenario)}: ${escapeHtml(failure.message)}</li>`).join('')}</ul>`) +
        (schedule.check.speedChange === undefined ? '' : `<p>${escapeHtml(schedule.check.speedChange.statement)}</p>`),
    );
  }
  if (figures.length > 0) {
    parts.push(
      renderFigure(
        {
          id: 'figure-time-domain-figures',
          caption: `Time-domain figures at the breakpoints against speed, with their limits${old === null ? '' : ', and the old gains on the new vehicle at the same speeds'}.`,
          panels: figures.map((figure) => speedPanel(schedule, figure)),
          layout: 'row',
          table: {
            caption: 'Time-domain figures with a limit, per breakpoint',
            header: [
              'speed m/s',
              ...figures.flatMap((figure) =>
                figure.series.flatMap((series) => [
                  `${figure.name}: ${series.label} ${figure.unit}`,
                  ...(series.old === null ? [] : [`old gains on the new vehicle ${figure.unit}`]),
                  ...(series.worst === null ? [] : [`worst case over the variations ${figure.unit}`]),
                ]),
              ),
            ],
            rows: schedule.breakpoints.map((breakpoint, k) => [
              numberCell(breakpoint.speed_mps, 'speed_mps', fixedNumber(breakpoint.speed_mps, 2)),
              ...figures.flatMap((figure) =>
                figure.series.flatMap((series) => [
                  numberCell(series.values[k], figure.name),
                  ...(series.old === null ? [] : [numberCell(series.old[k], `old.${figure.name}`)]),
                  ...(series.worst === null ? [] : [numberCell(series.worst[k], `worst.${series.robust}`)]),
                ]),
              ),
            ]),
          },
        },
        context,
      ),
    );
  }
  if (closedLoop === null) {
    parts.push(`<p class="notice">${escapeHtml(data.checkUnavailable ?? 'The closed-loop responses are not drawn.')}</p>`);
  } else {
    parts.push(closedLoop.speeds.map((at) => tracesFigure(data, closedLoop, at, context)).join('\n'));
  }
  return parts.join('\n');
}
