/**
 * The sections of the report, in order, each drawn only when the data it needs is present (a section is
 * keyed on what the schedule, the models and the other inputs contain — never drawn empty).
 * Add a section: a file `section-<name>.ts` exporting its render function, its data as an optional field
 * of ReportData (src/report/types.ts, gathered in report-data.ts), and one entry here. Further scenario
 * traces and robustness bands (nominal and worst case per speed) come in this way; a band about a margin curve is a 'band' mark (plot-types.ts) on the
 * margins plots.
 */
import type { ReportData } from '../types.js';
import type { RenderContext } from './figure.js';
import { renderComparisonSection } from './section-comparison.js';
import { renderFrequencySection } from './section-frequency.js';
import { renderGainsSection } from './section-gains.js';
import { renderIdentificationSection } from './section-identification.js';
import { renderMarginsSection } from './section-margins.js';
import { renderProvenanceSection } from './section-provenance.js';
import { renderScheduleSection } from './section-schedule.js';
import { renderStepsSection } from './section-steps.js';
import { hasTimeDomain, renderTimeDomainSection } from './section-time-domain.js';

export interface ReportSection {
  /** Anchor of the section. */
  readonly id: string;
  readonly title: string;
  /** Whether the data this section draws is present. */
  readonly present: (data: ReportData) => boolean;
  /** The section's body (its heading is added). */
  readonly render: (data: ReportData, context: RenderContext) => string;
}

export const SECTIONS: readonly ReportSection[] = [
  { id: 'schedule', title: 'Breakpoints and worst figures', present: () => true, render: renderScheduleSection },
  { id: 'gains', title: 'Gains against speed', present: () => true, render: renderGainsSection },
  { id: 'margins', title: 'Margins against speed', present: () => true, render: renderMarginsSection },
  { id: 'time-domain', title: 'Time-domain figures and closed-loop responses', present: hasTimeDomain, render: renderTimeDomainSection },
  {
    id: 'frequency-response',
    title: 'Frequency response and Nyquist plots',
    present: (data) => data.frequencyResponses.length > 0,
    render: renderFrequencySection,
  },
  { id: 'identification', title: 'Identified models against speed', present: (data) => data.models !== null, render: renderIdentificationSection },
  { id: 'step-fits', title: 'Fits over the measured steps', present: (data) => data.stepTraces !== null, render: renderStepsSection },
  { id: 'comparison', title: 'Change from the baseline', present: (data) => data.baseline !== null, render: renderComparisonSection },
  { id: 'provenance', title: 'Provenance', present: () => true, render: renderProvenanceSection },
];
