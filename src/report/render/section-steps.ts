/**
 * The identification fits over the measured steps, one figure per test speed: the yaw rate per command
 * change of every step (both directions and amplitudes on one scale) with each step's FOPDT fit, and the
 * residuals below. What an engineer looks at before trusting a model.
 */
import type { ReportData, StepTracesAtSpeed } from '../types.js';
import { renderFigure, type RenderContext } from './figure.js';
import { escapeHtml, fixedNumber, numberCell, shownNumber, textCell } from './html.js';
import { ROLE_COLOURS } from './palette.js';
import type { Mark, PlotSpec } from './plot-types.js';

function figureOf(speed: StepTracesAtSpeed, data: ReportData, context: RenderContext): string {
  const at = fixedNumber(speed.speed_mps, 2);
  const response: Mark[] = [];
  const residual: Mark[] = [{ kind: 'rule', label: 'zero', axis: 'y', at: 0, style: { colour: 'grey', dash: 'dot', width: 1 }, legend: false }];
  speed.steps.forEach((step, k) => {
    const name = `step ${step.stepIndex} of ${step.file.split(/[\\/]/).pop()}`;
    response.push({
      kind: 'line',
      label: k === 0 ? 'measured' : name,
      x: step.time_s,
      y: step.measuredPerCommand_perS,
      style: { colour: ROLE_COLOURS.measured, width: 1.4 },
      legend: k === 0,
    });
    response.push({
      kind: 'line',
      label: k === 0 ? 'FOPDT fit of each step' : `${name}, fit`,
      x: step.time_s,
      y: step.fitPerCommand_perS,
      style: { colour: ROLE_COLOURS.fit, dash: 'dash', width: 1.1 },
      legend: k === 0,
    });
    residual.push({
      kind: 'line',
      label: k === 0 ? 'residual (measured − fit)' : `${name}, residual`,
      x: step.time_s,
      y: step.residual_radps,
      style: { colour: ROLE_COLOURS.measured, width: 1.1 },
      legend: k === 0,
    });
  });
  const times = speed.steps.flatMap((step) => [step.time_s[0], step.time_s[step.time_s.length - 1]]);
  const x = { label: 'time since the step, s', domain: [Math.min(...times), Math.max(...times)] as const };
  const panels: PlotSpec[] = [
    {
      title: `Steps at ${at} m/s and their fits`,
      description: `Yaw rate change per steering command change of ${speed.steps.length} steps at ${at} m/s against time since the step, 1/s, each with its FOPDT fit`,
      x,
      y: { label: 'yaw rate per command, 1/s', include: [0] },
      marks: response,
      height: 230,
    },
    {
      title: `Residuals at ${at} m/s`,
      description: `Measured minus fitted yaw rate of each step at ${at} m/s, rad/s`,
      x,
      y: { label: 'residual, rad/s', include: [0] },
      marks: residual,
      height: 160,
    },
  ];
  const rmse = speed.steps.map((step) => step.rmse_radps);
  const r2 = speed.steps.map((step) => step.r2);
  const tests = data.models!.content.tests;
  return renderFigure(
    {
      id: `figure-steps-${context.ids.next('steps')}`,
      caption: `Fits over the measured steps at ${at} m/s.`,
      panels,
      notes: [
        `${speed.steps.length} steps; R² ${shownNumber(Math.min(...r2), 4)} to ${shownNumber(Math.max(...r2), 4)}; residual RMSE ${shownNumber(Math.min(...rmse), 3)} to ${shownNumber(Math.max(...rmse), 3)} rad/s over every sample of each fitted window (the curves are thinned for drawing).`,
        ...(speed.missing > 0 ? [`${speed.missing} step${speed.missing === 1 ? '' : 's'} of this speed not drawn: their logs were not given.`] : []),
      ],
      table: {
        caption: `Steps at ${at} m/s and their FOPDT fits`,
        header: ['log', 'step', 'direction', 'amplitude rad', 'K 1/s', 'τ s', 'θ s', 'R²', 'RMSE rad/s'],
        rows: speed.steps.map((step) => {
          const fit = tests.find((test) => test.file === step.file && test.stepIndex === step.stepIndex)!.fopdt;
          return [
            textCell(step.file.split(/[\\/]/).pop() ?? step.file),
            numberCell(step.stepIndex, 'stepIndex', String(step.stepIndex)),
            textCell(step.direction),
            numberCell(step.amplitude_rad, 'amplitude_rad'),
            numberCell(fit.gain, 'gain'),
            numberCell(fit.timeConstant_s, 'timeConstant_s'),
            numberCell(fit.deadTime_s, 'deadTime_s'),
            numberCell(step.r2, 'r2'),
            numberCell(step.rmse_radps, 'rmse_radps'),
          ];
        }),
      },
    },
    context,
  );
}

export function renderStepsSection(data: ReportData, context: RenderContext): string {
  const speeds = data.stepTraces!.filter((speed) => speed.steps.length > 0);
  const missing = data.stepTraces!.reduce((sum, speed) => sum + speed.missing, 0);
  const intro =
    `<p>Each step as logged, its yaw rate taken relative to the fitted sensor offset and divided by the step's command change, so that steps to the left and right and of both amplitudes lie on one curve; ` +
    `each step's own FOPDT fit dashed; residuals below in rad/s.${missing > 0 ? ` ${missing} steps are not drawn: their logs were not given.` : ''}</p>`;
  if (speeds.length === 0) return `${intro}<p class="notice">${escapeHtml('None of the logs given holds a step of models.json.')}</p>`;
  return `${intro}<div class="grid">${speeds.map((speed) => figureOf(speed, data, context)).join('\n')}</div>`;
}
