/**
 * The identified models against speed: each step's FOPDT, each speed's combined FOPDT with its 95 %
 * interval, and the check model's prediction (the joint single-track fit read as FOPDT) — with a baseline,
 * the old schedule's model too; then the joint fit's parameters and its steady-gain comparison.
 */
import type { ModelsFile } from '../../identify/models-schema.js';
import type { ReportData } from '../types.js';
import { renderFigure, type RenderContext } from './figure.js';
import { escapeHtml, fixedNumber, htmlTable, numberCell, shownNumber, textCell } from './html.js';
import { ROLE_COLOURS } from './palette.js';
import type { Mark, PlotSpec } from './plot-types.js';

const PARAMETERS = [
  { field: 'gain', name: 'steady yaw gain K', unit: '1/s' },
  { field: 'timeConstant_s', name: 'time constant τ', unit: 's' },
  { field: 'deadTime_s', name: 'dead time θ', unit: 's' },
] as const;

function jointFitTable(models: ModelsFile): string {
  const fit = models.singleTrack;
  if (fit === null) return `<p>No joint single-track fit: ${escapeHtml(models.singleTrackRefusal?.reason ?? 'not recorded')}.</p>`;
  const row = (name: string, field: keyof typeof fit.ci95, unit: string) => [
    textCell(name),
    numberCell(fit[field], field),
    numberCell(fit.ci95[field][0], `${field}.ci95.low`),
    numberCell(fit.ci95[field][1], `${field}.ci95.high`),
    textCell(unit),
  ];
  return (
    htmlTable({
      id: 'joint-fit',
      caption: `Joint single-track fit over ${fit.stepCount} steps (R² ${shownNumber(fit.r2, 4)}, RMSE ${shownNumber(fit.rmse, 3)} rad/s)`,
      header: ['parameter', 'value', '95 % low', '95 % high', 'unit'],
      rows: [
        row('front cornering stiffness (axle)', 'frontCorneringStiffness_NPerRad', 'N/rad'),
        row('rear cornering stiffness (axle)', 'rearCorneringStiffness_NPerRad', 'N/rad'),
        row('actuator lag', 'actuatorLag_s', 's'),
        row('actuator delay', 'actuatorDelay_s', 's'),
        row('understeer gradient', 'understeerGradient_radPerMps2', 'rad per m/s²'),
      ],
    }) +
    htmlTable({
      id: 'steady-gain-comparison',
      caption: 'Steady yaw gain per test speed: the speed\u2019s FOPDT against the joint single-track model',
      header: ['speed m/s', 'FOPDT K 1/s', 'single-track K 1/s', 'difference %'],
      rows: fit.comparison.map((entry) => [
        numberCell(entry.speed_mps, 'speed_mps', fixedNumber(entry.speed_mps, 2)),
        numberCell(entry.fopdtGain, 'fopdtGain'),
        numberCell(entry.singleTrackGain, 'singleTrackGain'),
        numberCell(entry.difference_pct, 'difference_pct', fixedNumber(entry.difference_pct, 1)),
      ]),
    })
  );
}

export function renderIdentificationSection(data: ReportData, context: RenderContext): string {
  const models = data.models!.content;
  const prediction = data.prediction;
  const old = data.baseline?.prediction ?? null;
  const panels = PARAMETERS.map((parameter): PlotSpec => {
    const marks: Mark[] = [
      {
        kind: 'points',
        label: 'each step',
        x: models.tests.map((test) => test.speed_mps),
        y: models.tests.map((test) => test.fopdt[parameter.field]),
        style: { colour: ROLE_COLOURS.measured },
        shape: 'open-circle',
        size: 2.5,
      },
      {
        kind: 'error-bars',
        label: '95 % interval of the speed',
        x: models.speeds.map((speed) => speed.speed_mps),
        low: models.speeds.map((speed) => speed.fopdt.ci95[parameter.field][0]),
        high: models.speeds.map((speed) => speed.fopdt.ci95[parameter.field][1]),
        style: { colour: ROLE_COLOURS.breakpoint, width: 1.4 },
      },
      {
        kind: 'points',
        label: 'each speed (inverse-variance mean)',
        x: models.speeds.map((speed) => speed.speed_mps),
        y: models.speeds.map((speed) => speed.fopdt[parameter.field]),
        style: { colour: ROLE_COLOURS.breakpoint },
        shape: 'circle',
        size: 3.5,
      },
      ...(prediction === null
        ? []
        : [
            {
              kind: 'line',
              label: `check model: ${prediction.description}`,
              x: prediction.speeds_mps,
              y: prediction[parameter.field],
              style: { colour: ROLE_COLOURS.model, width: 2 },
            } as const,
          ]),
      ...(old === null
        ? []
        : [
            {
              kind: 'line',
              label: `old schedule's model (${data.baseline!.file})`,
              x: old.speeds_mps,
              y: old[parameter.field],
              style: { colour: ROLE_COLOURS.baseline, dash: 'dash', width: 2 },
            } as const,
          ]),
    ];
    return {
      title: `${parameter.name} against speed`,
      description: `Identified ${parameter.name} of the steering command to yaw rate response (FOPDT, actuator included) against speed, ${parameter.unit}`,
      x: { label: 'speed, m/s' },
      y: { label: `${parameter.name}, ${parameter.unit}`, include: [0] },
      marks,
      width: 400,
      height: 260,
    };
  });
  const interval = (speed: (typeof models.speeds)[number], field: (typeof PARAMETERS)[number]['field']) => [
    numberCell(speed.fopdt[field], field),
    numberCell(speed.fopdt.ci95[field][0], `${field}.ci95.low`),
    numberCell(speed.fopdt.ci95[field][1], `${field}.ci95.high`),
  ];
  const figure = renderFigure(
    {
      id: 'figure-identified',
      caption: 'Identified FOPDT parameters against speed, with the check model\u2019s prediction.',
      panels,
      layout: 'row',
      notes: [
        `${models.tests.length} steps used at ${models.speeds.length} speeds; ${models.refusedTests.length} refused by the quality gate, ${models.rejectedSteps.length} candidate steps rejected by the segmentation.`,
        ...(prediction === null ? [] : [`The check model (the one the gains were tuned and checked on): ${prediction.description}.`]),
      ],
      table: {
        caption: 'Per-speed FOPDT with 95 % intervals',
        header: ['speed m/s', 'steps', 'K 1/s', 'K low', 'K high', 'τ s', 'τ low', 'τ high', 'θ s', 'θ low', 'θ high'],
        rows: models.speeds.map((speed) => [
          numberCell(speed.speed_mps, 'speed_mps', fixedNumber(speed.speed_mps, 2)),
          numberCell(speed.stepCount, 'stepCount'),
          ...interval(speed, 'gain'),
          ...interval(speed, 'timeConstant_s'),
          ...interval(speed, 'deadTime_s'),
        ]),
      },
    },
    context,
  );
  const warnings =
    models.warnings.length === 0
      ? ''
      : `<h3>Identification warnings</h3><ul>${models.warnings.map((warning) => `<li>${escapeHtml(warning)}</li>`).join('')}</ul>`;
  return `<div class="grid">${figure}</div><div class="table-scroll">${jointFitTable(models)}</div>${warnings}`;
}
