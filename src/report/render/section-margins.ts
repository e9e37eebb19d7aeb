/**
 * Margins against speed on the dense grid: one plot per figure (phase margin, both gain margins, delay
 * margin, peak sensitivity Ms and peak complementary sensitivity Mt) with the side beyond its limit shaded, the breakpoints, the failing speeds
 * marked, and with a baseline the old gains on the new vehicle. A figure no speed has (no lower gain margin
 * on a loop that is not conditionally stable) is said in words, not drawn empty.
 */
import type { NumberOverSpeed } from '../../core/by-speed.js';
import type { ReportCheck, ReportData } from '../types.js';
import type { CheckCriterion } from '../../schedule/types.js';
import { renderFigure, type RenderContext } from './figure.js';
import { escapeHtml, fixedNumber, numberCell, shownNumber, textCell } from './html.js';
import { ROLE_COLOURS } from './palette.js';
import { limitMarks } from './limit-marks.js';
import type { Mark, PlotSpec } from './plot-types.js';

type Figure = 'phaseMargin_deg' | 'upperGainMargin_dB' | 'lowerGainMargin_dB' | 'delayMargin_s' | 'sensitivityPeak' | 'complementarySensitivityPeak';

interface FigureWords {
  readonly field: Figure;
  readonly criterion: CheckCriterion;
  readonly name: string;
  /** A shorter y-axis label (default: the name). */
  readonly axis?: string;
  readonly unit: string;
  /** The limit and which side of it fails. */
  readonly limit: (data: ReportData) => { value: NumberOverSpeed; failsBelow: boolean };
}

const FIGURES: readonly FigureWords[] = [
  {
    field: 'phaseMargin_deg',
    criterion: 'phaseMargin',
    name: 'phase margin',
    unit: '°',
    limit: (d) => ({ value: d.schedule.check.thresholds.minimumPhaseMargin_deg, failsBelow: true }),
  },
  {
    field: 'upperGainMargin_dB',
    criterion: 'upperGainMargin',
    name: 'upper gain margin',
    unit: 'dB',
    limit: (d) => ({ value: d.schedule.check.thresholds.minimumUpperGainMargin_dB, failsBelow: true }),
  },
  {
    field: 'lowerGainMargin_dB',
    criterion: 'lowerGainMargin',
    name: 'lower gain margin',
    unit: 'dB',
    limit: (d) => ({ value: d.schedule.check.thresholds.maximumLowerGainMargin_dB, failsBelow: false }),
  },
  {
    field: 'delayMargin_s',
    criterion: 'delayMargin',
    name: 'delay margin',
    unit: 's',
    limit: (d) => ({ value: d.schedule.check.thresholds.minimumDelayMargin_s, failsBelow: true }),
  },
  {
    field: 'sensitivityPeak',
    criterion: 'sensitivityPeak',
    name: 'peak sensitivity Ms',
    unit: '',
    limit: (d) => ({ value: d.schedule.check.thresholds.maximumSensitivityPeak, failsBelow: false }),
  },
  {
    field: 'complementarySensitivityPeak',
    criterion: 'complementarySensitivityPeak',
    name: 'peak complementary sensitivity Mt',
    axis: 'Mt (peak of |T|)',
    unit: '',
    limit: (d) => ({ value: d.schedule.check.thresholds.maximumComplementarySensitivityPeak, failsBelow: false }),
  },
];

const values = (check: ReportCheck, field: Figure): (number | null)[] => check.points.map((point) => point.margins[field]);
const failing = (check: ReportCheck, criterion: CheckCriterion) =>
  check.points.filter((point) => point.failures.includes(criterion) || point.failures.includes('stability'));

function panel(data: ReportData, figure: FigureWords): PlotSpec | null {
  const { check, schedule, baseline } = data;
  const old = baseline?.check ?? null;
  const any = (c: ReportCheck | null) => c?.points.some((point) => point.margins[figure.field] !== null);
  const atBreakpoints = schedule.breakpoints.map((b) => b.margins[figure.field]);
  if (!any(check) && !any(old) && atBreakpoints.every((value) => value === null)) return null;
  const written = figure.limit(data);
  const drawn = limitMarks({
    limit: written.value,
    failsBelow: written.failsBelow,
    regionLabel: (value, varies) =>
      `beyond the limit${varies ? ' at every speed' : ''} (${figure.name} ${written.failsBelow ? '<' : '>'} ${shownNumber(value)}${figure.unit === '' ? '' : ` ${figure.unit}`})`,
  });
  const limit = { value: drawn.value, failsBelow: written.failsBelow };
  // Room beyond the limit so that the shaded side shows even when every value is far from it.
  const shown = [...(check === null ? [] : values(check, figure.field)), ...(old === null ? [] : values(old, figure.field)), ...atBreakpoints].filter(
    (value): value is number => value !== null,
  );
  const span = Math.max(...shown.map((value) => Math.abs(value - limit.value)), 1e-9);
  const room = limit.value + (limit.failsBelow ? -0.12 : 0.12) * span;
  const marks: Mark[] = [...drawn.marks];
  if (check !== null) {
    marks.push({
      kind: 'line',
      label: 'new gains, dense check',
      x: check.points.map((p) => p.speed_mps),
      y: values(check, figure.field),
      style: { colour: ROLE_COLOURS.schedule, width: 2 },
    });
  }
  if (old !== null) {
    marks.push({
      kind: 'line',
      label: 'old gains on the new vehicle',
      x: old.points.map((p) => p.speed_mps),
      y: values(old, figure.field),
      style: { colour: ROLE_COLOURS.baseline, dash: 'dash', width: 2 },
    });
    const oldFails = failing(old, figure.criterion);
    if (oldFails.length > 0)
      marks.push({
        kind: 'points',
        label: 'old gains fail here',
        x: oldFails.map((p) => p.speed_mps),
        y: oldFails.map((p) => p.margins[figure.field] ?? limit.value),
        style: { colour: ROLE_COLOURS.failure },
        shape: 'plus',
        size: 4,
      });
  }
  const variations = schedule.variations;
  if (variations !== undefined) {
    marks.push({
      kind: 'points',
      label: 'worst case over the variations, at the breakpoints',
      x: variations.breakpoints.map((b) => b.speed_mps),
      y: variations.breakpoints.map((b) => (b.instability === null ? (b.worst[figure.field]?.value ?? null) : null)),
      style: { colour: 'skyBlue' },
      shape: 'diamond',
      size: 4.5,
    });
  }
  marks.push({
    kind: 'points',
    label: 'breakpoints (proven margins)',
    x: schedule.breakpoints.map((b) => b.speed_mps),
    y: atBreakpoints,
    style: { colour: ROLE_COLOURS.breakpoint },
    shape: 'circle',
    size: 3.5,
  });
  if (check !== null) {
    const fails = failing(check, figure.criterion);
    if (fails.length > 0)
      marks.push({
        kind: 'points',
        label: 'new gains fail here',
        x: fails.map((p) => p.speed_mps),
        y: fails.map((p) => p.margins[figure.field] ?? limit.value),
        style: { colour: ROLE_COLOURS.failure },
        shape: 'cross',
        size: 5,
      });
  }
  return {
    title: `${figure.name} against speed`,
    description: `${figure.name} of the loop against speed${figure.unit === '' ? '' : `, ${figure.unit}`}, with the limit ${shownNumber(limit.value)}${figure.unit === '' ? '' : ` ${figure.unit}`} (${limit.failsBelow ? 'at least' : 'at most'}) and the side beyond it shaded`,
    x: { label: 'speed, m/s', domain: [schedule.check.range.minimum_mps, schedule.check.range.maximum_mps] },
    y: { label: figure.unit === '' ? (figure.axis ?? figure.name) : `${figure.axis ?? figure.name}, ${figure.unit}`, include: [limit.value, room] },
    marks,
    height: 230,
  };
}

export function renderMarginsSection(data: ReportData, context: RenderContext): string {
  const { check, baseline } = data;
  const figures: string[] = [];
  const absent: string[] = [];
  for (const figure of FIGURES) {
    const spec = panel(data, figure);
    if (spec === null) {
      absent.push(figure.name);
      continue;
    }
    const rows = (check?.points ?? []).map((point, k) => [
      numberCell(point.speed_mps, 'speed_mps', fixedNumber(point.speed_mps, 3)),
      numberCell(point.margins[figure.field], figure.field),
      textCell(point.failures.length === 0 ? 'within limits' : 'FAILS'),
      ...(baseline?.check == null ? [] : [numberCell(baseline.check.points[k]?.margins[figure.field] ?? null, `old.${figure.field}`)]),
    ]);
    figures.push(
      renderFigure(
        {
          id: `figure-${figure.field}`,
          caption: `${figure.name[0].toUpperCase()}${figure.name.slice(1)} against speed${check === null ? ' (breakpoints only)' : ` at the ${check.points.length} speeds of the dense check`}.`,
          panels: [spec],
          table: {
            caption: `${figure.name} per check speed`,
            header: ['speed m/s', `${figure.name}${figure.unit === '' ? '' : ` ${figure.unit}`}`, 'limits', ...(baseline?.check == null ? [] : ['old gains'])],
            rows,
          },
        },
        context,
      ),
    );
  }
  const intro =
    check === null
      ? `<p class="notice">${escapeHtml(data.checkUnavailable ?? 'The dense check is not available.')} Only the margins proven at the breakpoints are drawn.</p>`
      : `<p>Margins of the sampled loop (discrete PID, zero-order hold, the computation latency) at every speed of the dense check; the shaded side of each limit fails. A margin missing at a speed means there is no such crossing there (or the loop is not stable).</p>`;
  const missing = absent.length === 0 ? '' : `<p>Not drawn: ${absent.map(escapeHtml).join(', ')} — no speed has one (no crossing of that kind).</p>`;
  const variations =
    data.variations === null
      ? ''
      : `<p class="notice">${escapeHtml(data.variations.verdict)}${data.variations.weakest === null ? '' : ` ${escapeHtml(data.variations.weakest)}`} Its worst figures at the breakpoints are drawn as diamonds.</p>`;
  return `${intro}${verdictNotice(data)}${variations}<div class="grid">${figures.join('\n')}</div>${missing}`;
}

/** Where the closed loop is not stable — 'marginal' (a pole on the unit circle within its rounding bound) or unstable — as runs of check speeds, in words. */
function verdictNotice(data: ReportData): string {
  const points = data.check?.points ?? [];
  const words: string[] = [];
  for (const verdict of ['marginal', 'unstable'] as const) {
    const runs: [number, number][] = [];
    points.forEach((point, k) => {
      if (point.margins.verdict !== verdict) return;
      const last = runs[runs.length - 1];
      if (last !== undefined && points[k - 1]?.margins.verdict === verdict) last[1] = point.speed_mps;
      else runs.push([point.speed_mps, point.speed_mps]);
    });
    if (runs.length === 0) continue;
    const where = runs.map(([from, to]) => (from === to ? `${fixedNumber(from, 2)} m/s` : `${fixedNumber(from, 2)}–${fixedNumber(to, 2)} m/s`)).join(', ');
    words.push(
      verdict === 'marginal'
        ? `marginal at ${where} (a closed-loop pole on the unit circle within the bound on its rounding error: neither proven stable nor unstable)`
        : `unstable at ${where}`,
    );
  }
  return words.length === 0 ? '' : `<p class="notice">The closed loop of the new gains is ${escapeHtml(words.join('; '))}. No margins are drawn there.</p>`;
}
