/** Gains against speed: the lookup between breakpoints, the breakpoints (inserted ones marked), and with a baseline the old gains. */
import type { ReportData } from '../types.js';
import { renderFigure, type RenderContext } from './figure.js';
import { fixedNumber, numberCell, textCell } from './html.js';
import { ROLE_COLOURS } from './palette.js';
import type { Mark, PlotSpec } from './plot-types.js';

const GAINS = ['kp', 'ki', 'kd'] as const;

export function renderGainsSection(data: ReportData, context: RenderContext): string {
  const { schedule, gainCurve } = data;
  // The old gains are drawn only when they mean the same thing (same loop, controller form, sample time, discretisation).
  const baseline = data.baseline?.comparison.gainsComparable ? data.baseline : null;
  const planned = schedule.breakpoints.filter((breakpoint) => !breakpoint.insertedByRefinement);
  const inserted = schedule.breakpoints.filter((breakpoint) => breakpoint.insertedByRefinement);
  const [low, high] = [schedule.check.range.minimum_mps, schedule.check.range.maximum_mps];
  const floor = schedule.interpolation.lowSpeedFloor_mps;
  const oldBreakpoints = baseline?.schedule.breakpoints.filter((breakpoint) => breakpoint.speed_mps >= low && breakpoint.speed_mps <= high) ?? [];
  const panels = GAINS.map((gain): PlotSpec => {
    const marks: Mark[] = [
      ...(floor > low
        ? [
            {
              kind: 'rule',
              label: `low-speed floor ${fixedNumber(floor, 2)} m/s (its gains below)`,
              axis: 'x',
              at: floor,
              style: { colour: 'grey', dash: 'dot', width: 1.2 },
            } as const,
          ]
        : []),
      {
        kind: 'line',
        label: `${schedule.interpolation.method} lookup (new schedule)`,
        x: gainCurve.speeds_mps,
        y: gainCurve[gain],
        style: { colour: ROLE_COLOURS.schedule, width: 2 },
      },
      ...(baseline === null
        ? []
        : [
            {
              kind: 'line',
              label: `old schedule ${baseline.file}`,
              x: baseline.gainCurve.speeds_mps,
              y: baseline.gainCurve[gain],
              style: { colour: ROLE_COLOURS.baseline, dash: 'dash', width: 2 },
            } as const,
            {
              kind: 'points',
              label: 'old breakpoints',
              x: oldBreakpoints.map((b) => b.speed_mps),
              y: oldBreakpoints.map((b) => b[gain]),
              style: { colour: ROLE_COLOURS.baseline },
              shape: 'open-circle',
            } as const,
          ]),
      {
        kind: 'points',
        label: 'breakpoints',
        x: planned.map((b) => b.speed_mps),
        y: planned.map((b) => b[gain]),
        style: { colour: ROLE_COLOURS.breakpoint },
        shape: 'circle',
      },
      ...(inserted.length === 0
        ? []
        : [
            {
              kind: 'points',
              label: 'breakpoints inserted by the check',
              x: inserted.map((b) => b.speed_mps),
              y: inserted.map((b) => b[gain]),
              style: { colour: ROLE_COLOURS.inserted },
              shape: 'diamond',
              size: 6,
            } as const,
          ]),
    ];
    return {
      title: `${gain} against speed`,
      description: `${gain} of the schedule against speed, ${schedule.units[gain]}: the breakpoints and the ${schedule.interpolation.method} lookup between them${baseline === null ? '' : ', and the old schedule'}`,
      x: { label: 'speed, m/s', domain: [low, high] },
      y: { label: `${gain}, ${schedule.units[gain]}`, include: [0] },
      marks,
      width: 400,
      height: 260,
    };
  });
  const lookupAt = (gain: (typeof GAINS)[number], speed: number): number | null => {
    if (baseline === null) return null;
    const k = baseline.gainCurve.speeds_mps.indexOf(speed);
    return k < 0 ? null : baseline.gainCurve[gain][k];
  };
  const figure = renderFigure(
    {
      id: 'figure-gains',
      caption: `Gains against speed (kp ${schedule.units.kp}; ki ${schedule.units.ki}; kd ${schedule.units.kd}).`,
      panels,
      layout: 'row',
      notes: [
        `Between breakpoints the firmware's lookup interpolates (${schedule.interpolation.method}); outside the range it holds the end gains, and below the low-speed floor (${fixedNumber(floor, 2)} m/s) it uses the floor's gains.`,
        ...(inserted.length > 0
          ? [`${inserted.length} breakpoint${inserted.length === 1 ? ' was' : 's were'} inserted where the check failed between breakpoints.`]
          : []),
        ...(data.baseline !== null && baseline === null
          ? [
              `The old gains of ${data.baseline.file} are not drawn: a loop or controller setting changed, so they are not comparable one by one (see the change from the baseline).`,
            ]
          : []),
      ],
      table: {
        caption: 'Gains at the breakpoints',
        header: ['speed m/s', 'breakpoint', 'kp', 'ki', 'kd', ...(baseline === null ? [] : ['old kp', 'old ki', 'old kd'])],
        rows: schedule.breakpoints.map((b) => [
          numberCell(b.speed_mps, 'speed_mps', fixedNumber(b.speed_mps, 2)),
          textCell(b.insertedByRefinement ? 'inserted' : 'planned'),
          numberCell(b.kp, 'kp'),
          numberCell(b.ki, 'ki'),
          numberCell(b.kd, 'kd'),
          ...(baseline === null ? [] : GAINS.map((gain) => numberCell(lookupAt(gain, b.speed_mps), `old.${gain}`))),
        ]),
      },
    },
    context,
  );
  return `<div class="grid">${figure}</div>`;
}
