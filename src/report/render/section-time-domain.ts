/**
 * The time-domain figures of the schedule (breakpoints[].timeDomain, from its exact sampled closed loop)
 * against speed with their limits, their table as the file holds them, and — when the model the schedule
 * records can be rebuilt — the responses behind them at a few breakpoints: the reference step (and the step
 * through the steering limits), the disturbances, the path loop's lane change and curve entry, and the
 * steering angle and rate against the vehicle's limits.
 */
import type { ScheduleFile } from '../../schedule/schedule-types.js';
import type { ClosedLoopTraces, ClosedLoopTracesAtSpeed, ReportData, TraceSignal } from '../types.js';
import { renderFigure, type RenderContext } from './figure.js';
import { escapeHtml, fixedNumber, htmlTable, numberCell, shownNumber, textCell, type Cell } from './html.js';
import { ROLE_COLOURS, type PaletteColour } from './palette.js';
import type { Mark, MarkerShape, PlotSpec } from './plot-types.js';

/** Whether any breakpoint of the schedule has time-domain figures. */
export const hasTimeDomain = (data: ReportData): boolean => data.schedule.breakpoints.some((breakpoint) => breakpoint.timeDomain !== null);

const SECOND: PaletteColour = 'reddishPurple';

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
    { header: `largest reference the actuator allows (${schedule.units.error})`, field: 'actuator.largestReference', value: (t) => t.actuator.largestReference },
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
  const pathLimits = schedule.loop.kind === 'path' ? `, lane-change error ≤ ${shownNumber(limits.maximumLaneChangeError_m)} m, curve-entry error ≤ ${shownNumber(limits.maximumCurveEntryError_m)} m` : '';
  return htmlTable({
    id: 'time-domain-table',
    caption:
      `Set-point weights b and c, feed-forward and the time-domain figures at each breakpoint (— where the loop is not stable or a figure is not reached in the simulated time); ` +
      `limits: overshoot ≤ ${shownNumber(limits.maximumOvershoot_pct)} %, recovery ≤ ${shownNumber(limits.maximumRecoveryTime_s)} s${pathLimits}`,
    header: ['speed m/s', 'b', 'c', `feed-forward ${schedule.units.feedForward}`, 'lead s', ...shown.map((column) => column.header), 'limited by'],
    rows,
  });
}

interface FigureAgainstSpeed {
  readonly name: string;
  readonly unit: string;
  readonly limit: number;
  readonly series: readonly { readonly label: string; readonly values: readonly (number | null)[] }[];
}

/** The time-domain figures with a limit, against the speed of the breakpoints. */
function figuresAgainstSpeed(schedule: ScheduleFile): FigureAgainstSpeed[] {
  const { limits } = schedule.check.timeDomain;
  const of = <T>(pick: (t: NonNullable<ScheduleFile['breakpoints'][number]['timeDomain']>) => T | null | undefined): (T | null)[] =>
    schedule.breakpoints.map((breakpoint) => (breakpoint.timeDomain === null ? null : (pick(breakpoint.timeDomain) ?? null)));
  const present = (values: readonly (number | null)[]): boolean => values.some((value) => value !== null);
  const overshoot = [{ label: 'reference step (with the set-point weights)', values: of((t) => t.referenceStep.overshoot_pct) }];
  if (schedule.loop.kind === 'heading') overshoot.push({ label: 'step through the steering limits', values: of((t) => t.limitedStep?.overshoot_pct) });
  const figures: FigureAgainstSpeed[] = [
    { name: 'overshoot', unit: '%', limit: limits.maximumOvershoot_pct, series: overshoot.filter((series) => present(series.values)) },
    {
      name: 'recovery time',
      unit: 's',
      limit: limits.maximumRecoveryTime_s,
      series: [
        { label: 'steering misalignment', values: of((t) => t.steeringMisalignment.recoveryTime_s) },
        { label: 'lateral force step', values: of((t) => t.lateralForce?.recoveryTime_s) },
      ].filter((series) => present(series.values)),
    },
    { name: 'lane-change error', unit: 'm', limit: limits.maximumLaneChangeError_m, series: [{ label: 'largest error while changing lane', values: of((t) => t.laneChange?.peakError_m) }].filter((series) => present(series.values)) },
    { name: 'curve-entry error', unit: 'm', limit: limits.maximumCurveEntryError_m, series: [{ label: 'largest error from 3 s after entry on', values: of((t) => t.curveEntry?.errorAfterSettle_m) }].filter((series) => present(series.values)) },
  ];
  return figures.filter((figure) => figure.series.length > 0);
}

const SERIES_LOOKS: readonly (readonly [PaletteColour, MarkerShape])[] = [
  ['blue', 'circle'],
  ['reddishPurple', 'diamond'],
  ['bluishGreen', 'square'],
  ['black', 'open-circle'],
  ['skyBlue', 'diamond'],
];

/** One figure against speed; `first`: how many series the panels before it drew. */
function speedPanel(schedule: ScheduleFile, figure: FigureAgainstSpeed, first: number): PlotSpec {
  const speeds = schedule.breakpoints.map((breakpoint) => breakpoint.speed_mps);
  const marks: Mark[] = [
    { kind: 'region', label: 'beyond the limit', axis: 'y', from: figure.limit, to: 'max', colour: ROLE_COLOURS.failure },
    { kind: 'rule', label: 'limit', axis: 'y', at: figure.limit, style: { colour: ROLE_COLOURS.failure, dash: 'dash', width: 1.2 } },
  ];
  figure.series.forEach((series, k) => {
    // Each series of the figure its own colour and marker (the legend is shared by the panels).
    const [colour, shape] = SERIES_LOOKS[(first + k) % SERIES_LOOKS.length];
    marks.push({ kind: 'line', label: `${series.label}, between breakpoints`, x: speeds, y: series.values, style: { colour, dash: 'dot', width: 1 }, legend: false });
    marks.push({ kind: 'points', label: series.label, x: speeds, y: series.values, style: { colour }, shape, size: 3.5 });
  });
  return {
    title: `${figure.name} against speed`,
    description: `${figure.name} of the sampled closed loop at each breakpoint against speed, ${figure.unit}, with the limit ${shownNumber(figure.limit)} ${figure.unit} (at most) and the side beyond it shaded`,
    x: { label: 'speed, m/s', domain: [schedule.check.range.minimum_mps, schedule.check.range.maximum_mps] },
    y: { label: `${figure.name}, ${figure.unit}`, include: [0, figure.limit * 1.1] },
    marks,
    width: 420,
    height: 220,
  };
}

const line = (label: string, signal: TraceSignal, colour: PaletteColour, dash: 'solid' | 'dash' = 'solid'): Mark => ({ kind: 'line', label, x: signal.time_s, y: signal.value, style: { colour, dash, width: 1.6 } });
const limitRule = (label: string, at: number): Mark => ({ kind: 'rule', label, axis: 'y', at, style: { colour: ROLE_COLOURS.failure, dash: 'dash', width: 1.2 } });
const end = (...signals: TraceSignal[]): number => Math.max(...signals.map((signal) => signal.time_s[signal.time_s.length - 1]));
const peak = (signal: TraceSignal): number => Math.max(...signal.value.map(Math.abs));

/** A steering angle or rate against its limit: ± the limit as rules, the side beyond shaded. */
function steeringPanel(title: string, quantity: string, unit: string, limit: number, signals: readonly { label: string; signal: TraceSignal }[], description: string): PlotSpec {
  const negative = signals.some(({ signal }) => Math.min(...signal.value) < -0.05 * limit);
  const marks: Mark[] = [
    { kind: 'region', label: `beyond the vehicle's limit (±${shownNumber(limit)} ${unit})`, axis: 'y', from: limit, to: 'max', colour: ROLE_COLOURS.failure },
    limitRule(`vehicle limit ±${shownNumber(limit)} ${unit}`, limit),
  ];
  if (negative) marks.push({ kind: 'region', label: `beyond the vehicle's limit (±${shownNumber(limit)} ${unit})`, axis: 'y', from: 'min', to: -limit, colour: ROLE_COLOURS.failure }, limitRule(`vehicle limit ±${shownNumber(limit)} ${unit}`, -limit));
  signals.forEach(({ label, signal }, k) => marks.push(line(label, signal, k === 0 ? ROLE_COLOURS.schedule : SECOND, k === 0 ? 'solid' : 'dash')));
  const all = signals.map(({ signal }) => signal);
  return { title, description, x: { label: 'time, s', domain: [0, end(...all)] }, y: { label: `${quantity}, ${unit}`, include: [0, limit * 1.08, ...(negative ? [-limit * 1.08] : [])] }, marks, width: 420, height: 200 };
}

function tracesFigure(data: ReportData, traces: ClosedLoopTraces, at: ClosedLoopTracesAtSpeed, context: RenderContext): string {
  const { schedule } = data;
  const { limits, steeringLimits } = schedule.check.timeDomain;
  const speed = `${fixedNumber(at.speed_mps, 2)} m/s`;
  const unit = traces.errorUnit;
  const panels: PlotSpec[] = [];
  const summary: Cell[][] = [];
  const row = (name: string, signal: TraceSignal, signalUnit: string, limit: string) => {
    const k = signal.value.reduce((best, value, i) => (Math.abs(value) > Math.abs(signal.value[best]) ? i : best), 0);
    summary.push([textCell(name), numberCell(signal.value[k], 'peak', shownNumber(signal.value[k], 4)), numberCell(signal.time_s[k], 'peakTime_s', shownNumber(signal.time_s[k], 3)), numberCell(signal.value[signal.value.length - 1], 'final', shownNumber(signal.value[signal.value.length - 1], 4)), textCell(signalUnit), textCell(limit)]);
  };

  // The reference step, and the step through the steering limits.
  const stepMarks: Mark[] = [
    { kind: 'region', label: `settling band ±${shownNumber(100 * traces.settlingBand)} %`, axis: 'y', from: 1 - traces.settlingBand, to: 1 + traces.settlingBand, colour: 'grey' },
    limitRule(`overshoot limit ${shownNumber(limits.maximumOvershoot_pct)} %`, 1 + limits.maximumOvershoot_pct / 100),
    line(`reference step, linear loop (b = ${shownNumber(schedule.breakpoints.find((b) => b.speed_mps === at.speed_mps)?.setpointWeightProportional, 3)})`, at.referenceStep, ROLE_COLOURS.schedule),
  ];
  row('reference step: output per unit', at.referenceStep, '', `overshoot ≤ ${shownNumber(limits.maximumOvershoot_pct)} %`);
  if (at.limitedStep !== null) {
    const judged = schedule.loop.kind === 'heading' ? '' : ' (judged on settling only)';
    stepMarks.push(line(`a ${shownNumber(at.limitedStep.size, 3)} ${unit} step through the steering limits${judged}`, at.limitedStep.output, SECOND, 'dash'));
    row(`step of ${shownNumber(at.limitedStep.size, 3)} ${unit} through the limits: output per unit`, at.limitedStep.output, '', schedule.loop.kind === 'heading' ? `overshoot ≤ ${shownNumber(limits.maximumOvershoot_pct)} %, settles` : 'settles');
  }
  panels.push({
    title: `Reference step at ${speed}`,
    description: `Loop output per unit of a reference step at ${speed} against time, with the overshoot limit and the settling band`,
    x: { label: 'time, s', domain: [0, end(at.referenceStep, ...(at.limitedStep === null ? [] : [at.limitedStep.output]))] },
    y: { label: 'output per unit of the step', include: [0, 1 + limits.maximumOvershoot_pct / 100] },
    marks: stepMarks,
    width: 420,
    height: 220,
  });

  // The disturbances, each error as a fraction of its peak.
  const disturbances = [
    { label: 'steering misalignment', signal: at.steeringMisalignment },
    ...(at.lateralForce === null ? [] : [{ label: 'lateral force step', signal: at.lateralForce }]),
  ];
  const disturbanceEnd = end(...disturbances.map((entry) => entry.signal));
  const disturbanceMarks: Mark[] = [
    { kind: 'region', label: `recovered: within ±${shownNumber(100 * traces.recoveryBand)} % of the peak`, axis: 'y', from: -traces.recoveryBand, to: traces.recoveryBand, colour: 'grey' },
    ...(limits.maximumRecoveryTime_s < disturbanceEnd ? [{ kind: 'rule', label: `recovery limit ${shownNumber(limits.maximumRecoveryTime_s)} s`, axis: 'x', at: limits.maximumRecoveryTime_s, style: { colour: ROLE_COLOURS.failure, dash: 'dash', width: 1.2 } } as const] : []),
    ...disturbances.map((entry, k) => line(entry.label, entry.signal, k === 0 ? ROLE_COLOURS.schedule : SECOND, k === 0 ? 'solid' : 'dash')),
  ];
  for (const entry of disturbances) row(`${entry.label}: error per its peak`, entry.signal, '', `recovered within ${shownNumber(limits.maximumRecoveryTime_s)} s`);
  panels.push({
    title: `Disturbances at ${speed}`,
    description: `Error after a ${shownNumber(at.figures.steeringMisalignment.size)} rad steering misalignment${at.figures.lateralForce === null ? '' : ` and a ${shownNumber(at.figures.lateralForce.size, 3)} N lateral force step`} at ${speed}, each as a fraction of its own peak, against time`,
    x: { label: 'time, s', domain: [0, disturbanceEnd] },
    y: { label: 'error per its peak', include: [-0.2, 1] },
    marks: disturbanceMarks,
    width: 420,
    height: 220,
  });

  // The path loop's manoeuvres.
  if (at.laneChange !== null || at.curveEntry !== null) {
    const marks: Mark[] = [];
    if (at.laneChange !== null) {
      marks.push(limitRule(`lane-change limit ±${shownNumber(limits.maximumLaneChangeError_m)} m`, limits.maximumLaneChangeError_m), limitRule(`lane-change limit ±${shownNumber(limits.maximumLaneChangeError_m)} m`, -limits.maximumLaneChangeError_m));
      marks.push(line(`lane change ${shownNumber(at.figures.laneChange?.size_m)} m over ${shownNumber(at.figures.laneChange?.length_m, 3)} m`, at.laneChange.error, ROLE_COLOURS.schedule));
      row('lane change: error', at.laneChange.error, unit, `≤ ${shownNumber(limits.maximumLaneChangeError_m)} m`);
    }
    if (at.curveEntry !== null) {
      const from = traces.leadIn_s + traces.curveEntrySettle_s;
      marks.push({ kind: 'region', label: `curve-entry error judged from ${shownNumber(traces.curveEntrySettle_s)} s after entry on`, axis: 'x', from, to: 'max', colour: 'grey' });
      marks.push({ kind: 'rule', label: `curve-entry limit ±${shownNumber(limits.maximumCurveEntryError_m)} m`, axis: 'y', at: limits.maximumCurveEntryError_m, style: { colour: ROLE_COLOURS.failure, dash: 'dot', width: 1.4 } });
      marks.push({ kind: 'rule', label: `curve-entry limit ±${shownNumber(limits.maximumCurveEntryError_m)} m`, axis: 'y', at: -limits.maximumCurveEntryError_m, style: { colour: ROLE_COLOURS.failure, dash: 'dot', width: 1.4 } });
      marks.push(line(`curve entry, curvature ${shownNumber(at.figures.curveEntry?.curvature_perM, 3)} 1/m`, at.curveEntry, SECOND, 'dash'));
      row('curve entry: error', at.curveEntry, unit, `≤ ${shownNumber(limits.maximumCurveEntryError_m)} m from ${shownNumber(traces.curveEntrySettle_s)} s after entry`);
    }
    const signals = [at.laneChange?.error, at.curveEntry].filter((signal): signal is TraceSignal => signal !== undefined && signal !== null);
    panels.push({
      title: `Lane change and curve entry at ${speed}`,
      description: `Path error at the preview point during the lane change and after the curve entry at ${speed}, m, against time (the manoeuvres start at ${shownNumber(traces.leadIn_s)} s), with the limits`,
      x: { label: 'time, s', domain: [0, end(...signals)] },
      y: { label: `error, ${unit}`, include: [0] },
      marks,
      width: 420,
      height: 220,
    });
  }

  // Steering angle and rate against the vehicle's limits: the manoeuvre at full size (lane change, or the step through the limits).
  const manoeuvre = at.laneChange !== null ? { name: 'lane change', angle: at.laneChange.angle, rate: at.laneChange.rate, rateWords: 'rate asked of the actuator' } : at.limitedStep === null ? null : { name: 'step through the limits', angle: at.limitedStep.angle, rate: at.limitedStep.rate, rateWords: 'road-wheel angle rate' };
  if (manoeuvre !== null) {
    panels.push(steeringPanel(`Steering angle at ${speed}`, 'road-wheel angle', 'rad', steeringLimits.maxSteerAngle_rad, [{ label: `road-wheel angle, ${manoeuvre.name}`, signal: manoeuvre.angle }], `Road-wheel angle during the ${manoeuvre.name} at ${speed}, rad, against time, with the vehicle's angle limit`));
    panels.push(steeringPanel(`Steering rate at ${speed}`, 'steering rate', 'rad/s', steeringLimits.maxSteerRate_radps, [{ label: `${manoeuvre.rateWords}, ${manoeuvre.name}`, signal: manoeuvre.rate }], `Steering ${manoeuvre.rateWords} during the ${manoeuvre.name} at ${speed}, rad/s, against time, with the vehicle's rate limit`));
    row(`${manoeuvre.name}: road-wheel angle`, manoeuvre.angle, 'rad', `±${shownNumber(steeringLimits.maxSteerAngle_rad)} rad`);
    row(`${manoeuvre.name}: ${manoeuvre.rateWords}`, manoeuvre.rate, 'rad/s', `±${shownNumber(steeringLimits.maxSteerRate_radps)} rad/s (peak ${shownNumber(peak(manoeuvre.rate), 3)})`);
  }

  return renderFigure(
    {
      id: `figure-closed-loop-${context.ids.next('closed-loop')}`,
      caption: `Closed-loop responses at ${speed} (${at.reason}).`,
      panels,
      layout: 'row',
      notes: [
        `Simulated again for this report as the build simulated them: the exact sampled closed loop with this breakpoint's gains, set-point weights and feed-forward on ${schedule.check.model.description}. Curves thinned for drawing (each stretch keeps its smallest and largest sample).`,
      ],
      table: { caption: `Closed-loop responses at ${speed}: peak, its time and the final value of each curve`, header: ['curve', 'peak', 'at s', 'final', 'unit', 'limit'], rows: summary },
    },
    context,
  );
}

export function renderTimeDomainSection(data: ReportData, context: RenderContext): string {
  const { schedule, closedLoop } = data;
  const td = schedule.check.timeDomain;
  const figures = figuresAgainstSpeed(schedule);
  const unstable = schedule.breakpoints.filter((breakpoint) => breakpoint.timeDomain === null).map((breakpoint) => `${fixedNumber(breakpoint.speed_mps, 2)} m/s`);
  const parts = [
    `<p>The exact sampled closed loop (the firmware's controller equation, its sample time and latency) simulated at each breakpoint: a reference step with the set-point weights b and c, a steering misalignment of the road wheels, a lateral force step` +
      `${schedule.loop.kind === 'path' ? ', a lane change and a curve entry as planned path with the feed-forward on' : ', and a step through the steering angle and rate limits'}. ` +
      `<strong>${td.passed ? 'Every breakpoint keeps the time-domain limits.' : `${td.failures.length} breakpoint${td.failures.length === 1 ? '' : 's'} break a time-domain limit.`}</strong>` +
      `${unstable.length === 0 ? '' : ` No figures at ${escapeHtml(unstable.join(', '))}: the loop is not stable there.`}</p>`,
  ];
  if (td.failures.length > 0) parts.push(`<ul>${td.failures.map((failure) => `<li>${fixedNumber(failure.speed_mps, 2)} m/s: ${failure.messages.map(escapeHtml).join('; ')}</li>`).join('')}</ul>`);
  parts.push(`<div class="table-scroll">${timeDomainTable(schedule)}</div>`);
  if (figures.length > 0) {
    parts.push(
      renderFigure(
        {
          id: 'figure-time-domain-figures',
          caption: 'Time-domain figures at the breakpoints against speed, with their limits.',
          panels: figures.map((figure, k) => speedPanel(schedule, figure, figures.slice(0, k).reduce((sum, before) => sum + before.series.length, 0))),
          layout: 'row',
          table: {
            caption: 'Time-domain figures with a limit, per breakpoint',
            header: ['speed m/s', ...figures.flatMap((figure) => figure.series.map((series) => `${figure.name}: ${series.label} ${figure.unit}`))],
            rows: schedule.breakpoints.map((breakpoint, k) => [numberCell(breakpoint.speed_mps, 'speed_mps', fixedNumber(breakpoint.speed_mps, 2)), ...figures.flatMap((figure) => figure.series.map((series) => numberCell(series.values[k], figure.name)))]),
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
