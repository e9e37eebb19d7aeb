/**
 * The plan reference (docs/plan.md), generated from the plan's JSON Schema (field descriptions, allowed
 * values), PLAN_DEFAULTS and the tuning rules' own records: `npm run plan-reference` writes it and
 * test/schedule/plan-reference.test.ts fails when the file is stale. Plan errors point to it.
 */
import { TUNING_RULES } from '../tuning/registry.js';
import { PLAN_DEFAULTS } from './plan.js';
import { PLAN_SCHEMA } from './plan-schema.js';
import { VARIATION_DEFAULTS } from './plan-variations.js';

export { PLAN_REFERENCE_PATH } from './plan-reference-path.js';

/** Defaults that are not one constant: what decides them. */
const DERIVED_DEFAULTS: Readonly<Record<string, string>> = {
  'speeds.minimum_mps': 'the lowest test speed',
  'speeds.maximum_mps': 'the highest test speed',
  'speeds.lowSpeedFloor_mps': 'speeds.minimum_mps',
  'breakpoints.speeds_mps': 'none: automatic breakpoints',
  'controller.sampleTime_s': "the vehicle file's controllerSampleTime_s, else 0.01",
  'controller.computationLatency_s': 'one sample: controller.sampleTime_s',
  'check.rampAcceleration_mps2': "the vehicle file's serviceAcceleration_mps2, else 1",
  'check.brakingDeceleration_mps2': "the vehicle file's serviceDeceleration_mps2, else 2",
  'rule.parameters.controllerType': 'Ziegler–Nichols PID; SIMC by plant class (PI; PID with a second lag, a lag behind an integrator, or two integrators)',
  'rule.parameters.closedLoopTimeConstant_s': "λ = θ, the design model's dead time (the rule advises λ > 0.8·θ)",
  'rule.parameters.simcClosedLoopTimeConstant_s': "τc = θ, the design model's dead time",
  'rule.parameters.dampingRatio': '1 (critically damped)',
  'rule.parameters.naturalFrequency_radps': 'from settlingDistance_m, else ωn·θ_eff = 0.1 (and at most what the preview lead allows)',
  'rule.parameters.settlingDistance_m': 'none',
  'rule.parameters.integralPoleRatio': '5',
  'rule.parameters.sensitivityPeakTarget': '1.4 (searched with rule.tuneFor fastest-passing)',
  'rule.parameters.phaseMarginTarget_deg': 'none (a fastest-passing search sets acceptance.minimumPhaseMargin_deg)',
  'rule.name': 'per loop kind: yaw-rate simc; heading simc; path migo',
  'rule.tuneFor': 'per loop kind: yaw-rate rule-parameters; heading and path fastest-passing (rule-parameters when a rule is named)',
  'rule.searchOn': 'worst-case when the plan has variations under robust acceptance (and tuneFor is fastest-passing), else nominal',
  'loop.preview_m': '0.5 for a path loop when neither preview_m nor previewTime_s is given, else 0',
  'loop.previewTime_s': '0.3 for a path loop when neither preview_m nor previewTime_s is given, else 0',
  description: 'none',
  $schema: 'none',
  ...variationDefaults(),
};

/** The variations' defaults, which apply when the section is given (without it: the nominal check only). */
function variationDefaults(): Record<string, string> {
  const d = VARIATION_DEFAULTS;
  const pm = (value: number): string => `±${value} (when the section is given)`;
  return {
    variations: 'none: the nominal check only',
    'variations.acceptance': `\`"${d.acceptance}"\` (when the section is given)`,
    'variations.mass_pct': pm(d.mass_pct),
    'variations.yawInertia_pct': pm(d.yawInertia_pct),
    'variations.cgRearwardShift_m': pm(d.cgRearwardShift_m),
    'variations.frontCorneringStiffness_pct': pm(d.frontCorneringStiffness_pct),
    'variations.rearCorneringStiffness_pct': pm(d.rearCorneringStiffness_pct),
    'variations.actuatorLag_pct': pm(d.actuatorLag_pct),
    'variations.addedLatency_s': 'one sample: controller.sampleTime_s',
    'variations.fromIdentification': `\`${d.fromIdentification}\``,
    'variations.search.samples': `\`${d.search.samples}\``,
    'variations.search.seed': `\`${d.search.seed}\``,
    'variations.search.localSearchEvaluations': `\`${d.search.localSearchEvaluations}\``,
  };
}

/** Where each default comes from (a published source, common practice, or our choice and why). */
const DEFAULT_SOURCES: Readonly<Record<string, string>> = {
  'loop.kind': 'our choice: the loop every steering firmware can close',
  'loop.preview_m':
    'our choice: with previewTime_s a look-ahead that grows with speed (common practice in path following), sized so the default path plan passes on every demo vehicle',
  'loop.previewTime_s': 'our choice (see preview_m)',
  'loop.referencePoint': 'our choice',
  'rule.name': 'Skogestad 2003 (SIMC); Åström, Panagopoulos & Hägglund 1998 (MIGO) — each default passes on every demo vehicle',
  'rule.tuneFor': 'our choice: the fastest response that meets every acceptance limit',
  'rule.searchOn': 'our choice: under robust acceptance the search aims at what the schedule must pass',
  'rule.parameters.controllerType': 'Ziegler & Nichols 1942; Skogestad 2003',
  'rule.parameters.closedLoopTimeConstant_s': 'Rivera, Morari & Skogestad 1986 (from memory: λ > 0.8·θ)',
  'rule.parameters.simcClosedLoopTimeConstant_s': 'Skogestad 2003',
  'rule.parameters.dampingRatio': 'common practice for lateral control: no overshoot of the path',
  'rule.parameters.naturalFrequency_radps': 'our choice: half the warning bound ωn·θ_eff = 0.2',
  'rule.parameters.settlingDistance_m': '—',
  'rule.parameters.integralPoleRatio': 'common practice: the integral pole a factor ≈ 5 below ωn',
  'rule.parameters.sensitivityPeakTarget': 'Åström, Panagopoulos & Hägglund 1998: M = 1.4',
  'rule.parameters.phaseMarginTarget_deg': '—',
  'speeds.minimum_mps': 'the logs',
  'speeds.maximum_mps': 'the logs',
  'speeds.lowSpeedFloor_mps': 'our choice: no speed range left under one set of gains',
  'breakpoints.speeds_mps': '—',
  'breakpoints.count': 'our choice',
  'breakpoints.spacing': 'our choice: gains change fastest at low speed',
  interpolation: 'our choice; Fritsch & Carlson 1980',
  'controller.form': 'the only form stored',
  'controller.derivativeFilter': 'common practice',
  'controller.sampleTime_s': 'common practice: 100 Hz steering controllers',
  'controller.discretisation': 'its derivative-filter pole stays in [0, 1) for any N',
  'controller.computationLatency_s': 'our choice, on the safe side',
  'controller.antiWindup': 'Åström & Hägglund 2006, §3.5: no parameter to tune',
  'acceptance.maximumLowerGainMargin_dB': 'common practice: 6 dB both ways',
  'acceptance.minimumUpperGainMargin_dB': 'common practice: 6 dB both ways',
  'acceptance.minimumPhaseMargin_deg': 'common practice',
  'acceptance.maximumSensitivityPeak': 'Åström & Hägglund: Ms 1.4–2 is the usual robust range',
  'acceptance.delayMarginRoom_s': 'our choice',
  'acceptance.maximumComplementarySensitivityPeak': 'common practice: the same 6 dB bound as Ms',
  'acceptance.maximumOvershoot_pct': 'common practice',
  'acceptance.maximumRecoveryTime_s': "our choice: the product's target for lateral control",
  'acceptance.maximumLaneChangeError_m': 'our choice: half the clearance of a 2.5 m wide vehicle in a 3.5 m lane',
  'acceptance.maximumCurveEntryError_m': "our choice: the product's target for lateral control",
  'acceptance.maximumSpeedChangeError_m': 'our choice: the curve-entry target, held while the speed changes',
  'acceptance.maximumSpeedChangeError_rad': 'our choice: about 3° of heading while the speed changes',
  'acceptance.maximumSpeedChangeError_radps': 'our choice: about 3°/s of yaw rate while the speed changes',
  'check.scenarios': 'our choice: a schedule passes only when it drives the test-day manoeuvres within their limits',
  'check.gridSpeeds': 'our choice',
  'check.maxInsertedBreakpoints': 'our choice',
  'check.model': 'our choice: valid between and beyond the test speeds',
  'check.rampAcceleration_mps2': 'our choice: ≈ 0.1 g, a moderate acceleration; the speed changes are judged at what the vehicle does in service',
  'check.brakingDeceleration_mps2':
    'our choice: ≈ 0.2 g, firm but not an emergency stop (common practice for road vehicles); a vehicle that brakes more gently in service — a sprayer on a slope — states its own',
  description: '—',
  $schema: '—',
  'variations.acceptance': 'our choice: a set that is written is meant to be met',
  'variations.mass_pct': "common practice (from memory): a road vehicle's load moves its mass by about ±10 %; give your kerb-to-gross range",
  'variations.yawInertia_pct': 'common practice (from memory): follows the load, about ±10 %',
  'variations.cgRearwardShift_m': 'none: where the load sits depends on the vehicle',
  'variations.frontCorneringStiffness_pct':
    'common practice (from memory): tyre wear, inflation, temperature and dry road surfaces move cornering stiffness by about ±20 %',
  'variations.rearCorneringStiffness_pct': 'common practice (from memory): as the front axle, each axle on its own (that moves the understeer gradient)',
  'variations.actuatorLag_pct': "common practice (from memory): an actuator's lag moves by about ±20 % over temperature, supply voltage and wear",
  'variations.addedLatency_s': 'our choice: one missed sample (a late computation, bus jitter)',
  'variations.fromIdentification': "our choice: the identification's own uncertainty is always there",
  'variations.search.samples': 'our choice: about 20 ms a speed at ≈ 0.2 ms a loop analysis',
  'variations.search.seed': 'our choice',
  'variations.search.localSearchEvaluations': 'our choice: three step sizes over a few parameters',
};

interface SchemaNode {
  readonly description?: string;
  readonly type?: string;
  readonly enum?: readonly string[];
  readonly minimum?: number;
  readonly maximum?: number;
  readonly exclusiveMinimum?: number;
  readonly properties?: Readonly<Record<string, SchemaNode>>;
  readonly oneOf?: readonly SchemaNode[];
  readonly items?: SchemaNode | readonly SchemaNode[];
}

const UNITS: readonly (readonly [string, string])[] = [
  ['_pct', '%'],
  ['_mps2', 'm/s²'],
  ['_mps', 'm/s'],
  ['_radps', 'rad/s'],
  ['_dB', 'dB'],
  ['_deg', '°'],
  ['_m', 'm'],
  ['_s', 's'],
];

/** The unit a field's name states (units live in names), or "—". */
const unitOf = (name: string): string => UNITS.find(([suffix]) => name.endsWith(suffix))?.[1] ?? '—';

function allowedValues(node: SchemaNode): string {
  if (node.enum !== undefined) return node.enum.map((value) => `\`${value}\``).join(', ');
  if (node.oneOf?.some((branch) => branch.type === 'string')) {
    return `${allowedValues(node.oneOf[0])}; a table \`{"speeds_mps": […], "values": […]}\`; or an expression in \`speed_mps\``;
  }
  if (node.oneOf?.some((branch) => branch.type === 'array')) {
    return node.oneOf
      .map((branch) =>
        branch.type === 'array'
          ? `[down, up]: ${(Array.isArray(branch.items) ? branch.items : []).map((item: SchemaNode) => allowedValues(item)).join(' and ')}`
          : `± ${allowedValues(branch)}`,
      )
      .join('; or ');
  }
  if (node.type === 'array') return `list of ${allowedValues(Array.isArray(node.items) ? node.items[0] : (node.items ?? {}))}`;
  const bounds: string[] = [];
  if (node.exclusiveMinimum !== undefined) bounds.push(`> ${node.exclusiveMinimum}`);
  if (node.minimum !== undefined) bounds.push(`≥ ${node.minimum}`);
  if (node.maximum !== undefined) bounds.push(`≤ ${node.maximum}`);
  return `${node.type ?? 'value'}${bounds.length > 0 ? ` ${bounds.join(', ')}` : ''}`;
}

/** A PLAN_DEFAULTS value by dotted path (breakpoints are stored in their resolved form). */
function constantDefault(path: string): string | undefined {
  let value: unknown = PLAN_DEFAULTS;
  for (const part of path.split('.')) value = value !== null && typeof value === 'object' ? (value as Record<string, unknown>)[part] : undefined;
  return value === undefined || typeof value === 'object' ? undefined : `\`${JSON.stringify(value)}\``;
}

interface FieldRow {
  readonly path: string;
  readonly node: SchemaNode;
}

/** A node that groups fields: an object, or a oneOf of objects (the breakpoints). */
const isGroup = (node: SchemaNode): boolean => node.properties !== undefined || (node.oneOf?.every((branch) => branch.properties !== undefined) ?? false);

/** Every leaf field of the schema by dotted path (the object branches of a oneOf flattened into their parent). */
function leafFields(properties: Readonly<Record<string, SchemaNode>>, prefix = ''): FieldRow[] {
  return Object.entries(properties).flatMap(([name, node]) => {
    const path = `${prefix}${name}`;
    if (!isGroup(node)) return [{ path, node }];
    const branches = node.properties !== undefined ? [node] : (node.oneOf ?? []);
    return branches.flatMap((branch) => leafFields(branch.properties ?? {}, `${path}.`));
  });
}

function fieldLine({ path, node }: FieldRow): string {
  const name = path.split('.').pop() ?? path;
  const fallback = DERIVED_DEFAULTS[path];
  const constant = constantDefault(path);
  const defaultText = fallback ?? constant;
  const source = DEFAULT_SOURCES[path];
  if (defaultText === undefined || source === undefined)
    throw new Error(`plan reference: no default or source written for ${path} (src/schedule/plan-reference.ts)`);
  const cell = (text: string): string => text.replace(/\|/g, '\\|');
  return `| \`${path}\` | ${cell(node.description ?? '')} | ${cell(allowedValues(node))} | ${unitOf(name)} | ${cell(defaultText)} | ${cell(source)} |`;
}

/** The whole reference as Markdown (deterministic: schema order, then the rules in registry order). */
export function planReferenceMarkdown(): string {
  const lines: string[] = [
    '# Plan reference',
    '',
    '<!-- Generated from the plan schema by `npm run plan-reference` (src/schedule/plan-reference.ts); do not edit. -->',
    '',
    'A plan file (`speedband build --plan plan.json`) says which loop, rule, breakpoints, interpolation, controller and limits a',
    'schedule is built with. Every field is optional: `{}` is the default plan, and `speedband plan --default [--loop KIND]` prints',
    'it in full. Unknown fields are refused with the closest known name. Units are in the field names (SI).',
    '',
  ];
  const sections = Object.entries(PLAN_SCHEMA.properties as unknown as Record<string, SchemaNode>);
  for (const [name, node] of sections) {
    lines.push(`## \`${name}\``, '', node.description ?? '', '');
    lines.push('| field | meaning | allowed values | unit | default | source of the default |', '|---|---|---|---|---|---|');
    for (const field of leafFields({ [name]: node })) lines.push(fieldLine(field));
    lines.push('');
  }
  lines.push('## Rules and the parameters each takes', '');
  lines.push('A parameter the rule does not take is refused, in a plan and on the command line (`speedband tune`).', '');
  lines.push('| rule | method | plant classes | parameters | source |', '|---|---|---|---|---|');
  for (const rule of TUNING_RULES) {
    lines.push(
      `| \`${rule.name}\` | ${rule.title} | ${rule.plantClasses.join(', ')} | ${rule.parameters.map((parameter) => `\`${parameter}\``).join(', ')} | ${rule.citation.replace(/\|/g, '\\|')} |`,
    );
  }
  lines.push('');
  return `${lines.join('\n')}`;
}
