/**
 * The closed-loop responses at one breakpoint as one figure (closed-loop-traces.ts gathers them): the reference
 * step and the step through the steering limits against the overshoot limit, the disturbances against the
 * recovery band and limit, the path loop's lane change and curve entry against their limits, and the steering
 * angle and rate against the vehicle's limits.
 */
import { atSpeed as readAtSpeed } from '../../core/by-speed.js';
import type { ClosedLoopTraces, ClosedLoopTracesAtSpeed, ReportData, TraceSignal } from '../types.js';
import { renderFigure, type RenderContext } from './figure.js';
import { fixedNumber, numberCell, shownNumber, textCell, type Cell } from './html.js';
import { ROLE_COLOURS, type PaletteColour } from './palette.js';
import type { Mark, MarkerShape, PlotSpec } from './plot-types.js';

const SECOND: PaletteColour = 'reddishPurple';

/** Each scenario's look, the same on the plots against speed and the plots against time. */
export const LOOKS = {
  referenceStep: { colour: 'blue', shape: 'circle', dash: 'solid' },
  limitedStep: { colour: 'reddishPurple', shape: 'diamond', dash: 'dash' },
  steeringMisalignment: { colour: 'bluishGreen', shape: 'square', dash: 'solid' },
  lateralForce: { colour: 'black', shape: 'open-circle', dash: 'dash' },
  laneChange: { colour: 'blue', shape: 'circle', dash: 'solid' },
  curveEntry: { colour: 'reddishPurple', shape: 'diamond', dash: 'dash' },
} as const satisfies Readonly<Record<string, { colour: PaletteColour; shape: MarkerShape; dash: 'solid' | 'dash' }>>;
export type Look = (typeof LOOKS)[keyof typeof LOOKS];

const line = (label: string, signal: TraceSignal, look: { readonly colour: PaletteColour; readonly dash: 'solid' | 'dash' }): Mark => ({
  kind: 'line',
  label,
  x: signal.time_s,
  y: signal.value,
  style: { colour: look.colour, dash: look.dash, width: 1.6 },
});
const limitRule = (label: string, at: number): Mark => ({
  kind: 'rule',
  label,
  axis: 'y',
  at,
  style: { colour: ROLE_COLOURS.failure, dash: 'dash', width: 1.2 },
});
const end = (...signals: TraceSignal[]): number => Math.max(...signals.map((signal) => signal.time_s[signal.time_s.length - 1]));
const peak = (signal: TraceSignal): number => Math.max(...signal.value.map(Math.abs));

/** A steering angle or rate against its limit: ± the limit as rules, the side beyond shaded. */
function steeringPanel(
  title: string,
  quantity: string,
  unit: string,
  limit: number,
  signals: readonly { label: string; signal: TraceSignal }[],
  description: string,
): PlotSpec {
  const negative = signals.some(({ signal }) => Math.min(...signal.value) < -0.05 * limit);
  const marks: Mark[] = [
    { kind: 'region', label: `beyond the vehicle's limit (±${shownNumber(limit)} ${unit})`, axis: 'y', from: limit, to: 'max', colour: ROLE_COLOURS.failure },
    limitRule(`vehicle limit ±${shownNumber(limit)} ${unit}`, limit),
  ];
  if (negative)
    marks.push(
      {
        kind: 'region',
        label: `beyond the vehicle's limit (±${shownNumber(limit)} ${unit})`,
        axis: 'y',
        from: 'min',
        to: -limit,
        colour: ROLE_COLOURS.failure,
      },
      limitRule(`vehicle limit ±${shownNumber(limit)} ${unit}`, -limit),
    );
  signals.forEach(({ label, signal }, k) =>
    marks.push(line(label, signal, { colour: k === 0 ? ROLE_COLOURS.schedule : SECOND, dash: k === 0 ? 'solid' : 'dash' })),
  );
  const all = signals.map(({ signal }) => signal);
  return {
    title,
    description,
    x: { label: 'time, s', domain: [0, end(...all)] },
    y: { label: `${quantity}, ${unit}`, include: [0, limit * 1.08, ...(negative ? [-limit * 1.08] : [])] },
    marks,
    width: 420,
    height: 200,
  };
}

export function tracesFigure(data: ReportData, traces: ClosedLoopTraces, at: ClosedLoopTracesAtSpeed, context: RenderContext): string {
  const { schedule } = data;
  const { steeringLimits } = schedule.check.timeDomain;
  const limits = readAtSpeed(schedule.check.timeDomain.limits, at.speed_mps);
  const speed = `${fixedNumber(at.speed_mps, 2)} m/s`;
  const unit = traces.errorUnit;
  const panels: PlotSpec[] = [];
  const summary: Cell[][] = [];
  const row = (name: string, signal: TraceSignal, signalUnit: string, limit: string) => {
    const k = signal.value.reduce((best, value, i) => (Math.abs(value) > Math.abs(signal.value[best]) ? i : best), 0);
    summary.push([
      textCell(name),
      numberCell(signal.value[k], 'peak', shownNumber(signal.value[k], 4)),
      numberCell(signal.time_s[k], 'peakTime_s', shownNumber(signal.time_s[k], 3)),
      numberCell(signal.value[signal.value.length - 1], 'final', shownNumber(signal.value[signal.value.length - 1], 4)),
      textCell(signalUnit),
      textCell(limit),
    ]);
  };

  // The reference step, and the step through the steering limits.
  const stepMarks: Mark[] = [
    {
      kind: 'region',
      label: `settling band ±${shownNumber(100 * traces.settlingBand)} %`,
      axis: 'y',
      from: 1 - traces.settlingBand,
      to: 1 + traces.settlingBand,
      colour: 'grey',
    },
    limitRule(`overshoot limit ${shownNumber(limits.maximumOvershoot_pct)} %`, 1 + limits.maximumOvershoot_pct / 100),
    line(
      `reference step, linear loop (b = ${shownNumber(schedule.breakpoints.find((b) => b.speed_mps === at.speed_mps)?.setpointWeightProportional, 3)})`,
      at.referenceStep,
      LOOKS.referenceStep,
    ),
  ];
  row('reference step: output per unit', at.referenceStep, '', `overshoot ≤ ${shownNumber(limits.maximumOvershoot_pct)} %`);
  if (at.limitedStep !== null) {
    const judged = schedule.loop.kind === 'heading' ? '' : ' (judged on settling only)';
    stepMarks.push(
      line(`a ${shownNumber(at.limitedStep.size, 3)} ${unit} step through the steering limits${judged}`, at.limitedStep.output, LOOKS.limitedStep),
    );
    row(
      `step of ${shownNumber(at.limitedStep.size, 3)} ${unit} through the limits: output per unit`,
      at.limitedStep.output,
      '',
      schedule.loop.kind === 'heading' ? `overshoot ≤ ${shownNumber(limits.maximumOvershoot_pct)} %, settles` : 'settles',
    );
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
    { label: 'steering misalignment', signal: at.steeringMisalignment, look: LOOKS.steeringMisalignment },
    ...(at.lateralForce === null ? [] : [{ label: 'lateral force step', signal: at.lateralForce, look: LOOKS.lateralForce }]),
  ];
  const disturbanceEnd = end(...disturbances.map((entry) => entry.signal));
  const disturbanceMarks: Mark[] = [
    {
      kind: 'region',
      label: `recovered: within ±${shownNumber(100 * traces.recoveryBand)} % of the peak`,
      axis: 'y',
      from: -traces.recoveryBand,
      to: traces.recoveryBand,
      colour: 'grey',
    },
    ...(limits.maximumRecoveryTime_s < disturbanceEnd
      ? [
          {
            kind: 'rule',
            label: `recovery limit ${shownNumber(limits.maximumRecoveryTime_s)} s`,
            axis: 'x',
            at: limits.maximumRecoveryTime_s,
            style: { colour: ROLE_COLOURS.failure, dash: 'dash', width: 1.2 },
          } as const,
        ]
      : []),
    ...disturbances.map((entry) => line(entry.label, entry.signal, entry.look)),
  ];
  for (const entry of disturbances)
    row(`${entry.label}: error per its peak`, entry.signal, '', `recovered within ${shownNumber(limits.maximumRecoveryTime_s)} s`);
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
      marks.push(
        limitRule(`lane-change limit ±${shownNumber(limits.maximumLaneChangeError_m)} m`, limits.maximumLaneChangeError_m),
        limitRule(`lane-change limit ±${shownNumber(limits.maximumLaneChangeError_m)} m`, -limits.maximumLaneChangeError_m),
      );
      marks.push(
        line(
          `lane change ${shownNumber(at.figures.laneChange?.size_m)} m over ${shownNumber(at.figures.laneChange?.length_m, 3)} m`,
          at.laneChange.error,
          LOOKS.laneChange,
        ),
      );
      row('lane change: error', at.laneChange.error, unit, `≤ ${shownNumber(limits.maximumLaneChangeError_m)} m`);
    }
    if (at.curveEntry !== null) {
      const from = traces.leadIn_s + traces.curveEntrySettle_s;
      marks.push({
        kind: 'region',
        label: `curve-entry error judged from ${shownNumber(traces.curveEntrySettle_s)} s after entry on`,
        axis: 'x',
        from,
        to: 'max',
        colour: 'grey',
      });
      marks.push({
        kind: 'rule',
        label: `curve-entry limit ±${shownNumber(limits.maximumCurveEntryError_m)} m`,
        axis: 'y',
        at: limits.maximumCurveEntryError_m,
        style: { colour: ROLE_COLOURS.failure, dash: 'dot', width: 1.4 },
      });
      marks.push({
        kind: 'rule',
        label: `curve-entry limit ±${shownNumber(limits.maximumCurveEntryError_m)} m`,
        axis: 'y',
        at: -limits.maximumCurveEntryError_m,
        style: { colour: ROLE_COLOURS.failure, dash: 'dot', width: 1.4 },
      });
      marks.push(line(`curve entry, curvature ${shownNumber(at.figures.curveEntry?.curvature_perM, 3)} 1/m`, at.curveEntry, LOOKS.curveEntry));
      row(
        'curve entry: error',
        at.curveEntry,
        unit,
        `≤ ${shownNumber(limits.maximumCurveEntryError_m)} m from ${shownNumber(traces.curveEntrySettle_s)} s after entry`,
      );
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
  const manoeuvre =
    at.laneChange !== null
      ? { name: 'lane change', angle: at.laneChange.angle, rate: at.laneChange.rate, rateWords: 'rate asked of the actuator' }
      : at.limitedStep === null
        ? null
        : { name: 'step through the limits', angle: at.limitedStep.angle, rate: at.limitedStep.rate, rateWords: 'road-wheel angle rate' };
  if (manoeuvre !== null) {
    panels.push(
      steeringPanel(
        `Steering angle at ${speed}`,
        'road-wheel angle',
        'rad',
        steeringLimits.maxSteerAngle_rad,
        [{ label: `road-wheel angle, ${manoeuvre.name}`, signal: manoeuvre.angle }],
        `Road-wheel angle during the ${manoeuvre.name} at ${speed}, rad, against time, with the vehicle's angle limit`,
      ),
    );
    panels.push(
      steeringPanel(
        `Steering rate at ${speed}`,
        'steering rate',
        'rad/s',
        steeringLimits.maxSteerRate_radps,
        [{ label: `${manoeuvre.rateWords}, ${manoeuvre.name}`, signal: manoeuvre.rate }],
        `Steering ${manoeuvre.rateWords} during the ${manoeuvre.name} at ${speed}, rad/s, against time, with the vehicle's rate limit`,
      ),
    );
    row(`${manoeuvre.name}: road-wheel angle`, manoeuvre.angle, 'rad', `±${shownNumber(steeringLimits.maxSteerAngle_rad)} rad`);
    row(
      `${manoeuvre.name}: ${manoeuvre.rateWords}`,
      manoeuvre.rate,
      'rad/s',
      `±${shownNumber(steeringLimits.maxSteerRate_radps)} rad/s (peak ${shownNumber(peak(manoeuvre.rate), 3)})`,
    );
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
      table: {
        caption: `Closed-loop responses at ${speed}: peak, its time and the final value of each curve`,
        header: ['curve', 'peak', 'at s', 'final', 'unit', 'limit'],
        rows: summary,
      },
    },
    context,
  );
}
