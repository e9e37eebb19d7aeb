/**
 * One plot as an SVG string, drawn with d3: scales, ticks and tick labels by d3-scale, line, area and
 * marker paths by d3-shape, extents by d3-array — no scale or path arithmetic of our own. Data marks
 * (lines, points, error bars, bands) carry class "mark"; reference marks (limit regions, rules, rings)
 * class "guide"; the plotting area is the rect of class "plot-area". Every plot has a <title> and a
 * <desc> (role="img", aria-labelledby) that says what it shows and the range of each series.
 */
import { extent } from 'd3-array';
import { scaleLinear, scaleLog, type ScaleContinuousNumeric } from 'd3-scale';
import { area, line, symbol, symbolDiamond2, symbolPlus, symbolSquare2, symbolTimes } from 'd3-shape';
import { escapeHtml, shownNumber } from './html.js';
import { colourValue, DASH_PATTERNS, GREYS } from './palette.js';
import type { AxisSpec, Mark, PlotSpec, SeriesStyle } from './plot-types.js';
import type { IdSource } from './ids.js';

const PAD = { left: 70, right: 14, top: 10, bottom: 44 } as const;

type Scale = ScaleContinuousNumeric<number, number>;

const colourOf = colourValue;
const DASHES = DASH_PATTERNS;
const strokeOf = (style: SeriesStyle): string =>
  `stroke="${colourOf(style.colour)}" stroke-width="${style.width ?? 1.8}"${(style.dash ?? 'solid') === 'solid' ? '' : ` stroke-dasharray="${DASHES[style.dash ?? 'solid']}"`}${style.opacity === undefined ? '' : ` stroke-opacity="${style.opacity}"`}`;
const usable = (value: number | null | undefined, log: boolean): value is number =>
  value !== null && value !== undefined && Number.isFinite(value) && (!log || value > 0);

/** The values a mark puts on each axis (data marks, and rules/rings so that they stay in view). */
function valuesOf(mark: Mark, axis: 'x' | 'y'): readonly (number | null)[] {
  switch (mark.kind) {
    case 'line':
    case 'points':
      return axis === 'x' ? mark.x : mark.y;
    case 'error-bars':
    case 'band':
      return axis === 'x' ? mark.x : [...mark.low, ...mark.high];
    case 'rule':
      return mark.axis === axis ? [mark.at] : [];
    default:
      return [];
  }
}

/** Room added beyond the data at each end of a free axis, as a fraction of the span (markers at the extremes stay whole). */
const PADDING = 0.03;

/**
 * A scale for one axis: the spec's domain, or the data's extent with the values it must include, padded and made
 * nice. The padding stops at an included value it reaches (a gain plot including 0 does not go below 0).
 */
function makeScale(spec: AxisSpec, marks: readonly Mark[], axis: 'x' | 'y', range: [number, number]): Scale {
  const log = spec.scale === 'log';
  const data = marks.flatMap((mark) => valuesOf(mark, axis)).filter((value) => usable(value, log));
  const include = (spec.include ?? []).filter((value) => usable(value, log));
  let [low, high] = spec.domain ?? (extent([...data, ...include]) as [number | undefined, number | undefined]).map((value) => value ?? (log ? 1 : 0));
  if (spec.domain === undefined && !log && high > low && data.length > 0) {
    const [dataLow, dataHigh] = extent(data) as [number, number];
    const pad = PADDING * (high - low);
    const stop = (from: number, to: number): number => include.find((value) => (value - to) * (value - from) <= 0) ?? to;
    low = Math.min(low, stop(dataLow, dataLow - pad));
    high = Math.max(high, stop(dataHigh, dataHigh + pad));
  }
  if (!(high > low)) {
    const room = log ? 10 : Math.abs(low) > 0 ? Math.abs(low) * 0.1 : 1;
    [low, high] = log ? [low / room, high * room] : [low - room, high + room];
  }
  const scale: Scale = log ? scaleLog().domain([low, high]).range(range) : scaleLinear().domain([low, high]).range(range);
  return spec.domain === undefined ? scale.nice() : scale;
}

/** Ticks with labels: every tick of a linear axis; the labelled ones of a log axis (d3's own choice). */
function ticksOf(scale: Scale, spec: AxisSpec, count: number): { value: number; label: string }[] {
  const format = spec.scale === 'log' ? scale.tickFormat(count, '~g') : scale.tickFormat(count);
  return scale
    .ticks(count)
    .map((value) => ({ value, label: format(value).replace('-', '−') }))
    .filter((tick) => tick.label !== '');
}

function markerPath(shape: 'diamond' | 'cross' | 'plus' | 'square', size: number): string {
  const type = shape === 'diamond' ? symbolDiamond2 : shape === 'cross' ? symbolTimes : shape === 'plus' ? symbolPlus : symbolSquare2;
  return symbol(type, size * size * 1.4).digits(2)() ?? '';
}

function drawMark(mark: Mark, x: Scale, y: Scale, xLog: boolean, yLog: boolean): string {
  const title = `<title>${escapeHtml(mark.label)}</title>`;
  switch (mark.kind) {
    case 'line': {
      const indices = mark.x.map((_, i) => i);
      const path = line<number>()
        .defined((i) => usable(mark.x[i], xLog) && usable(mark.y[i], yLog))
        .x((i) => x(mark.x[i]))
        .y((i) => y(mark.y[i] as number))
        .digits(1)(indices);
      return path === null ? '' : `<path class="mark" d="${path}" fill="none" ${strokeOf(mark.style)} stroke-linejoin="round">${title}</path>`;
    }
    case 'band': {
      const indices = mark.x.map((_, i) => i).filter((i) => usable(mark.x[i], xLog) && usable(mark.low[i], yLog) && usable(mark.high[i], yLog));
      const path = area<number>()
        .x((i) => x(mark.x[i]))
        .y0((i) => y(mark.low[i] as number))
        .y1((i) => y(mark.high[i] as number))
        .digits(1)(indices);
      return path === null
        ? ''
        : `<path class="mark" d="${path}" fill="${colourOf(mark.style.colour)}" fill-opacity="${mark.style.opacity ?? 0.25}" stroke="none">${title}</path>`;
    }
    case 'points': {
      const size = mark.size ?? 4;
      const shown = mark.x.map((_, i) => i).filter((i) => usable(mark.x[i], xLog) && usable(mark.y[i], yLog));
      const colour = colourOf(mark.style.colour);
      const items = shown.map((i) => {
        const [px, py] = [x(mark.x[i]).toFixed(1), y(mark.y[i] as number).toFixed(1)];
        if (mark.shape === 'circle' || mark.shape === 'open-circle') {
          const fill = mark.shape === 'circle' ? colour : '#ffffff';
          return `<circle class="mark" cx="${px}" cy="${py}" r="${size}" fill="${fill}" stroke="${colour}" stroke-width="1.4"/>`;
        }
        const filled = mark.shape === 'diamond' || mark.shape === 'square';
        return `<path class="mark" transform="translate(${px},${py})" d="${markerPath(mark.shape, size)}" fill="${filled ? colour : 'none'}" stroke="${colour}" stroke-width="1.8"/>`;
      });
      return items.length === 0 ? '' : `<g>${title}${items.join('')}</g>`;
    }
    case 'error-bars': {
      const parts = mark.x
        .map((value, i) => {
          if (!usable(value, xLog) || !usable(mark.low[i], yLog) || !usable(mark.high[i], yLog)) return '';
          const [px, low, high] = [x(value), y(mark.low[i] as number), y(mark.high[i] as number)];
          return `M${px.toFixed(1)},${low.toFixed(1)}V${high.toFixed(1)}M${(px - 4).toFixed(1)},${low.toFixed(1)}H${(px + 4).toFixed(1)}M${(px - 4).toFixed(1)},${high.toFixed(1)}H${(px + 4).toFixed(1)}`;
        })
        .join('');
      return parts === '' ? '' : `<path class="mark" d="${parts}" fill="none" ${strokeOf(mark.style)}>${title}</path>`;
    }
    case 'region': {
      const scale = mark.axis === 'y' ? y : x;
      const [d0, d1] = scale.domain();
      const clampTo = (value: number | 'min' | 'max'): number => (value === 'min' ? Math.min(d0, d1) : value === 'max' ? Math.max(d0, d1) : value);
      const [a, b] = [scale(clampTo(mark.from)), scale(clampTo(mark.to))];
      const [r0, r1] = (mark.axis === 'y' ? x : y).range();
      const rect =
        mark.axis === 'y'
          ? [Math.min(r0, r1), Math.min(a, b), Math.abs(r1 - r0), Math.abs(b - a)]
          : [Math.min(a, b), Math.min(r0, r1), Math.abs(b - a), Math.abs(r1 - r0)];
      return `<rect class="guide" x="${rect[0].toFixed(1)}" y="${rect[1].toFixed(1)}" width="${rect[2].toFixed(1)}" height="${rect[3].toFixed(1)}" fill="${colourOf(mark.colour)}" fill-opacity="0.13">${title}</rect>`;
    }
    case 'rule': {
      const [r0, r1] = (mark.axis === 'y' ? x : y).range();
      const at = (mark.axis === 'y' ? y : x)(mark.at).toFixed(1);
      const d = mark.axis === 'y' ? `M${r0},${at}H${r1}` : `M${at},${r0}V${r1}`;
      return `<path class="guide" d="${d}" fill="none" ${strokeOf(mark.style)}>${title}</path>`;
    }
    case 'ring': {
      const radius = Math.abs(x(mark.cx + mark.r) - x(mark.cx));
      const fill = mark.fill === undefined ? 'none' : colourOf(mark.fill);
      return `<circle class="guide" cx="${x(mark.cx).toFixed(1)}" cy="${y(mark.cy).toFixed(1)}" r="${radius.toFixed(1)}" fill="${fill}"${mark.fill === undefined ? '' : ' fill-opacity="0.13"'} ${strokeOf(mark.style)}>${title}</circle>`;
    }
  }
}

/** One data series in words for the description: its name, points and ranges. */
function seriesWords(mark: Mark, spec: PlotSpec): string | null {
  if (mark.kind === 'region' || mark.kind === 'rule' || mark.kind === 'ring' || mark.legend === false) return null;
  const ys = (mark.kind === 'line' || mark.kind === 'points' ? mark.y : [...mark.low, ...mark.high]).filter((value): value is number => usable(value, false));
  const xs = mark.x.filter((value) => usable(value, false));
  if (ys.length === 0) return `${mark.label}: no values`;
  const [x0, x1] = extent(xs) as [number, number];
  const [y0, y1] = extent(ys) as [number, number];
  return `${mark.label}: ${mark.x.length} points, ${spec.x.label} ${shownNumber(x0, 3)} to ${shownNumber(x1, 3)}, ${spec.y.label} ${shownNumber(y0, 3)} to ${shownNumber(y1, 3)}`;
}

/** The plot as an SVG element. */
export function renderPlot(spec: PlotSpec, ids: IdSource): string {
  const width = spec.width ?? 560;
  const height = spec.height ?? 300;
  const xRange: [number, number] = [PAD.left, width - PAD.right];
  const yRange: [number, number] = [height - PAD.bottom, PAD.top];
  const x = makeScale(spec.x, spec.marks, 'x', xRange);
  let y = makeScale(spec.y, spec.marks, 'y', yRange);
  if (spec.equalAspect === true) {
    // Same data units per pixel on both axes: widen the y domain about its centre to the x scale's.
    const perPixel = Math.abs((x.domain()[1] - x.domain()[0]) / (xRange[1] - xRange[0]));
    const [y0, y1] = y.domain();
    const half = (perPixel * Math.abs(yRange[0] - yRange[1])) / 2;
    y = scaleLinear()
      .domain([(y0 + y1) / 2 - half, (y0 + y1) / 2 + half])
      .range(yRange);
  }
  const xLog = spec.x.scale === 'log';
  const yLog = spec.y.scale === 'log';
  const [titleId, descId, clipId] = [ids.next('plot-title'), ids.next('plot-desc'), ids.next('plot-clip')];
  const description = [spec.description, ...spec.marks.map((mark) => seriesWords(mark, spec)).filter((words): words is string => words !== null)].join('. ');
  // About one tick per 80 units across and per 45 units up (d3 rounds to 1, 2, 5 × 10ⁿ).
  const xTicks = ticksOf(x, spec.x, Math.max(3, Math.round((xRange[1] - xRange[0]) / 80)));
  const yTicks = ticksOf(y, spec.y, Math.max(3, Math.round((yRange[0] - yRange[1]) / 45)));
  const [left, right] = xRange;
  const [bottom, top] = yRange;
  const grid = [
    ...xTicks.map((tick) => `M${x(tick.value).toFixed(1)},${bottom}V${top}`),
    ...yTicks.map((tick) => `M${left},${y(tick.value).toFixed(1)}H${right}`),
  ].join('');
  const guides = spec.marks.filter((mark) => mark.kind === 'region').map((mark) => drawMark(mark, x, y, xLog, yLog));
  const overlays = spec.marks.filter((mark) => mark.kind === 'rule' || mark.kind === 'ring').map((mark) => drawMark(mark, x, y, xLog, yLog));
  const isGuide = (mark: Mark): boolean => mark.kind === 'region' || mark.kind === 'rule' || mark.kind === 'ring';
  const curves = spec.marks.filter((mark) => !isGuide(mark) && mark.kind !== 'points').map((mark) => drawMark(mark, x, y, xLog, yLog));
  const points = spec.marks.filter((mark) => mark.kind === 'points').map((mark) => drawMark(mark, x, y, xLog, yLog));
  // Markers are clipped a marker's size outside the area, so that one at the edge of the domain shows whole.
  const [pointsClipId, out] = [ids.next('plot-clip'), 8];
  const text = (px: number, py: number, anchor: string, content: string, extra = ''): string =>
    `<text x="${px.toFixed(1)}" y="${py.toFixed(1)}" text-anchor="${anchor}" font-size="12"${extra}>${escapeHtml(content)}</text>`;
  return [
    `<svg class="plot" xmlns="http://www.w3.org/2000/svg" viewBox="0 0 ${width} ${height}" role="img" aria-labelledby="${titleId} ${descId}">`,
    `<title id="${titleId}">${escapeHtml(spec.title)}</title>`,
    `<desc id="${descId}">${escapeHtml(description)}.</desc>`,
    `<defs><clipPath id="${clipId}"><rect x="${left}" y="${top}" width="${right - left}" height="${bottom - top}"/></clipPath>` +
      `<clipPath id="${pointsClipId}"><rect x="${left - out}" y="${top - out}" width="${right - left + 2 * out}" height="${bottom - top + 2 * out}"/></clipPath></defs>`,
    `<rect class="plot-area" x="${left}" y="${top}" width="${right - left}" height="${bottom - top}" fill="#ffffff"/>`,
    `<g clip-path="url(#${clipId})">`,
    ...guides,
    `<path d="${grid}" fill="none" stroke="${GREYS.grid}" stroke-width="1"/>`,
    ...overlays,
    `</g>`,
    `<path d="M${left},${top}V${bottom}H${right}" fill="none" stroke="${GREYS.axis}" stroke-width="1.2"/>`,
    `<g class="marks"><g clip-path="url(#${clipId})">`,
    ...curves,
    `</g><g clip-path="url(#${pointsClipId})">`,
    ...points,
    `</g></g>`,
    `<g aria-hidden="true">`,
    ...xTicks.map((tick) => text(x(tick.value), bottom + 16, 'middle', tick.label)),
    ...yTicks.map((tick) => text(left - 6, y(tick.value) + 4, 'end', tick.label)),
    text((left + right) / 2, height - 6, 'middle', spec.x.label),
    text(13, (top + bottom) / 2, 'middle', spec.y.label, ` transform="rotate(-90 13 ${((top + bottom) / 2).toFixed(1)})"`),
    `</g></svg>`,
  ].join('\n');
}
