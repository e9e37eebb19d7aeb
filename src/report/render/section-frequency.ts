/**
 * The open loop at a few speeds: Bode magnitude and phase up to the Nyquist frequency π/Ts, with the
 * crossings that set the margins, and the Nyquist plot around −1 with the peak-sensitivity limit (the
 * circle of radius 1/Ms,max about −1: inside it |1 + L| < 1/Ms,max). With a baseline, the old gains on
 * the new vehicle beside the new ones.
 */
import { valueAtSpeed } from '../../core/by-speed.js';
import type { FrequencyResponseAtSpeed, LoopResponse, ReportData } from '../types.js';
import { renderFigure, type RenderContext } from './figure.js';
import { fixedNumber, numberCell, shownNumber } from './html.js';
import { ROLE_COLOURS } from './palette.js';
import type { Mark, PlotSpec } from './plot-types.js';

/** The Nyquist plot's window (equal aspect) and the |L| beyond which the curve is left out of it. */
const NYQUIST_WINDOW = { re: [-3, 1.5], im: [-2.5, 1], largest: 20 } as const;
/** Every k-th frequency in the fallback table. */
const TABLE_STRIDE = 12;

interface Series {
  readonly label: string;
  readonly response: LoopResponse;
  readonly colour: 'blue' | 'orange';
  readonly dash: 'solid' | 'dash';
}

function seriesOf(entry: FrequencyResponseAtSpeed, oldFile: string | null): Series[] {
  return [
    { label: 'new gains', response: entry.response, colour: ROLE_COLOURS.schedule, dash: 'solid' },
    ...(entry.old === null
      ? []
      : [{ label: `old gains (${oldFile ?? 'baseline'}) on the new vehicle`, response: entry.old, colour: ROLE_COLOURS.baseline, dash: 'dash' } as const]),
  ];
}

/** The value of `values` at `frequency` by linear interpolation in log frequency (for a crossing marker). */
function at(response: LoopResponse, values: readonly number[], frequency: number): number | null {
  const f = response.frequency_radps;
  for (let k = 1; k < f.length; k++) {
    if (f[k] >= frequency) {
      const t = (Math.log(frequency) - Math.log(f[k - 1])) / (Math.log(f[k]) - Math.log(f[k - 1]));
      return values[k - 1] + t * (values[k] - values[k - 1]);
    }
  }
  return null;
}

function bodePanels(series: readonly Series[], speed: string): PlotSpec[] {
  const low = Math.min(...series.map((s) => s.response.frequency_radps[0]));
  const high = Math.max(...series.map((s) => s.response.nyquistFrequency_radps));
  const x = { label: 'frequency, rad/s', scale: 'log', domain: [low, high] } as const;
  const magnitude: Mark[] = [{ kind: 'rule', label: '0 dB', axis: 'y', at: 0, style: { colour: 'grey', dash: 'dot', width: 1.2 }, legend: false }];
  const phase: Mark[] = [{ kind: 'rule', label: '−180°', axis: 'y', at: -180, style: { colour: 'grey', dash: 'dot', width: 1.2 }, legend: false }];
  for (const s of series) {
    const r = s.response;
    magnitude.push({ kind: 'line', label: s.label, x: r.frequency_radps, y: r.magnitude_dB, style: { colour: s.colour, dash: s.dash, width: 2 } });
    phase.push({ kind: 'line', label: s.label, x: r.frequency_radps, y: r.phase_deg, style: { colour: s.colour, dash: s.dash, width: 2 } });
    const gm = r.margins.upperGainMarginFrequency_radps;
    if (gm !== null && r.margins.upperGainMargin_dB !== null) {
      magnitude.push({
        kind: 'points',
        label: 'phase crossover (sets the upper gain margin)',
        x: [gm],
        y: [-r.margins.upperGainMargin_dB],
        style: { colour: s.colour },
        shape: 'square',
        size: 4,
      });
    }
    const pm = r.margins.phaseMarginFrequency_radps;
    const pmPhase = pm === null ? null : at(r, r.phase_deg, pm);
    if (pm !== null && pmPhase !== null) {
      phase.push({
        kind: 'points',
        label: 'gain crossover (sets the phase margin)',
        x: [pm],
        y: [pmPhase],
        style: { colour: s.colour },
        shape: 'diamond',
        size: 5,
      });
    }
  }
  return [
    {
      title: `Bode magnitude at ${speed} m/s`,
      description: `Open-loop magnitude |L| in dB against frequency at ${speed} m/s, up to the Nyquist frequency of the sampled loop`,
      x,
      y: { label: '|L|, dB', include: [0] },
      marks: magnitude,
      height: 220,
    },
    {
      title: `Bode phase at ${speed} m/s`,
      description: `Open-loop phase of L in degrees (continuous, not wrapped) against frequency at ${speed} m/s`,
      x,
      y: { label: 'phase of L, °', include: [-180] },
      marks: phase,
      height: 220,
    },
  ];
}

function nyquistPanel(series: readonly Series[], speed: string, msLimit: number): PlotSpec {
  const marks: Mark[] = [
    {
      kind: 'ring',
      label: `|1 + L| < 1/${shownNumber(msLimit)}: peak sensitivity beyond its limit`,
      cx: -1,
      cy: 0,
      r: 1 / msLimit,
      style: { colour: ROLE_COLOURS.failure, dash: 'dash', width: 1.2 },
      fill: ROLE_COLOURS.failure,
    },
    { kind: 'ring', label: 'unit circle (|L| = 1)', cx: 0, cy: 0, r: 1, style: { colour: 'grey', dash: 'dot', width: 1.2 } },
    { kind: 'rule', label: 'real axis', axis: 'y', at: 0, style: { colour: 'grey', width: 0.8 }, legend: false },
  ];
  for (const s of series) {
    const r = s.response;
    const inWindow = (k: number): boolean => Math.hypot(r.re[k], r.im[k]) <= NYQUIST_WINDOW.largest;
    marks.push({
      kind: 'line',
      label: s.label,
      x: r.re,
      y: r.im.map((value, k) => (inWindow(k) ? value : null)),
      style: { colour: s.colour, dash: s.dash, width: 2 },
    });
  }
  marks.push({ kind: 'points', label: 'critical point −1', x: [-1], y: [0], style: { colour: ROLE_COLOURS.failure }, shape: 'cross', size: 5 });
  return {
    title: `Nyquist plot at ${speed} m/s`,
    description: `L(e^(jωTs)) in the complex plane for frequencies from the lowest plotted up to the Nyquist frequency, at ${speed} m/s; the closer the curve passes to −1, the smaller the margins`,
    x: { label: 'real part of L', domain: NYQUIST_WINDOW.re },
    y: { label: 'imaginary part of L', domain: NYQUIST_WINDOW.im },
    marks,
    height: 430,
    equalAspect: true,
  };
}

function figureOf(entry: FrequencyResponseAtSpeed, data: ReportData, context: RenderContext): string {
  const speed = fixedNumber(entry.speed_mps, 2);
  const series = seriesOf(entry, data.baseline?.file ?? null);
  const r = entry.response;
  const rows = r.frequency_radps
    .map((frequency, k) => ({ frequency, k }))
    .filter(({ k }) => k % TABLE_STRIDE === 0 || k === r.frequency_radps.length - 1)
    .map(({ frequency, k }) => [
      numberCell(frequency, 'frequency_radps'),
      numberCell(r.magnitude_dB[k], 'magnitude_dB'),
      numberCell(r.phase_deg[k], 'phase_deg'),
      numberCell(r.re[k], 're'),
      numberCell(r.im[k], 'im'),
    ]);
  const m = r.margins;
  return renderFigure(
    {
      id: `figure-loop-${context.ids.next('speed')}`,
      caption: `Open loop at ${speed} m/s (${entry.reason}): Bode and Nyquist plots.`,
      panels: [...bodePanels(series, speed), nyquistPanel(series, speed, valueAtSpeed(data.schedule.check.thresholds.maximumSensitivityPeak, entry.speed_mps))],
      notes: [
        `New gains kp ${shownNumber(r.gains.kp)}, ki ${shownNumber(r.gains.ki)}, kd ${shownNumber(r.gains.kd)}: phase margin ${fixedNumber(m.phaseMargin_deg, 1)}° at ${shownNumber(m.phaseMarginFrequency_radps, 3)} rad/s, upper gain margin ${fixedNumber(m.upperGainMargin_dB, 2)} dB at ${shownNumber(m.upperGainMarginFrequency_radps, 3)} rad/s, Ms ${shownNumber(m.sensitivityPeak, 3)}, Mt ${shownNumber(m.complementarySensitivityPeak, 3)}; closed loop ${m.verdict}.`,
        ...(entry.old === null
          ? []
          : [
              `Old gains on the new vehicle: phase margin ${fixedNumber(entry.old.margins.phaseMargin_deg, 1)}°, upper gain margin ${fixedNumber(entry.old.margins.upperGainMargin_dB, 2)} dB, Ms ${shownNumber(entry.old.margins.sensitivityPeak, 3)}, Mt ${shownNumber(entry.old.margins.complementarySensitivityPeak, 3)}; closed loop ${entry.old.margins.verdict}.`,
            ]),
      ],
      table: {
        caption: `L of the new gains at ${speed} m/s (every ${TABLE_STRIDE}th frequency)`,
        header: ['frequency rad/s', '|L| dB', 'phase °', 'Re L', 'Im L'],
        rows,
      },
    },
    context,
  );
}

export function renderFrequencySection(data: ReportData, context: RenderContext): string {
  const speeds = data.frequencyResponses.map((entry) => `${fixedNumber(entry.speed_mps, 2)} m/s (${entry.reason})`).join(', ');
  const intro = `<p>The loop the dense check analyses — the discrete PID and the zero-order-hold plant with its delay, exactly as sampled — at ${speeds}.</p>`;
  return `${intro}<div class="grid">${data.frequencyResponses.map((entry) => figureOf(entry, data, context)).join('\n')}</div>`;
}
