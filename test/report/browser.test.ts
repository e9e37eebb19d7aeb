/// <reference lib="dom" />
/**
 * The report in a browser: headless Chromium (Debian's package, driven by playwright-core; nothing is
 * downloaded) opens the reports `speedband report` writes for every demo vehicle — the parcel van, the vineyard
 * sprayer, the sidewalk robot, the van's path loop (the default path plan), and the loaded van against the van's
 * schedule as its baseline. No console error,
 * no request beyond the file itself, every plot with data marks that actually paint pixels, the tables equal to
 * schedule.json, and a print layout that fits A4 and Letter. Screenshots are left in the folder named by
 * SCREENSHOTS below for a person to look at.
 */
import { mkdirSync, mkdtempSync, readFileSync, statSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { pathToFileURL } from 'node:url';
import type { Browser, BrowserContext, Page } from 'playwright-core';
import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { recordingIo } from '../../src/cli/io.js';
import { runCli } from '../../src/cli/main.js';
import type { PartialPlan } from '../../src/schedule/plan.js';
import { readSchedule } from '../../src/schedule/schedule-file.js';
import { launchChromium } from '../helpers/browser.js';
import { demoModels, demoSchedule } from '../helpers/demo-builds.js';
import { decodePng, greyVariance, type Image, inkedPixels } from '../helpers/png.js';

const dir = mkdtempSync(join(tmpdir(), 'speedband-report-browser-'));
/** Where the screenshots are left. */
const SCREENSHOTS = join(tmpdir(), 'speedband-report-screenshots');
/**
 * The screenshots left for a person show the first screen of each page; SPEEDBAND_FULL_SCREENSHOTS=1 takes whole pages
 * (about 1.5 s of Chromium each at 1280 px: the checks below read the page itself, not these pictures).
 */
const FULL_PAGE_SCREENSHOTS = process.env.SPEEDBAND_FULL_SCREENSHOTS === '1';
/** The browser's window, CSS px. */
const VIEWPORT = { width: 1280, height: 900 };
/** The printable width of A4 and US Letter with the report's 14 mm margins, CSS px (96 per inch). */
const PRINTABLE_WIDTH_PX = { A4: ((210 - 28) / 25.4) * 96, Letter: ((215.9 - 28) / 25.4) * 96 };

interface Built {
  readonly name: string;
  readonly schedule: string;
  readonly report: string;
}
const reports: Built[] = [];
let browser: Browser;
/** 1280 CSS px wide, one pixel per CSS pixel: the screenshots kept; the pixel checks take theirs at half scale (halfScaleScreenshot). */
let context: BrowserContext;

/**
 * The report of a demo vehicle's schedule (shared with the other tests that read it: test/helpers/demo-builds.ts),
 * written by `speedband report` with the identification and the fits over its logs, as `build --report` writes it.
 */
async function reportOf(name: string, vehicle: string, options: { plan?: PartialPlan; baseline?: string } = {}): Promise<Built> {
  const { path: schedule } = await demoSchedule(vehicle, options.plan);
  const { path: models } = await demoModels(vehicle);
  const report = join(dir, `${name}.html`);
  const io = recordingIo();
  const baseline = options.baseline === undefined ? [] : ['--baseline', options.baseline];
  const code = await runCli(['report', schedule, '--models', models, '--logs', join('vehicles', vehicle, 'logs'), ...baseline, '--out', report], io);
  if (code !== 0) throw new Error(`report of ${vehicle} failed: ${io.err()}${io.out()}`);
  return { name, schedule, report };
}

interface Opened {
  readonly page: Page;
  readonly errors: string[];
  readonly requests: string[];
}

/** Open a report, recording console errors, page errors and every request. */
async function open(report: string): Promise<Opened> {
  const page = await context.newPage();
  const errors: string[] = [];
  const requests: string[] = [];
  page.on('console', (message) => {
    if (message.type() === 'error' || message.type() === 'warning') errors.push(`${message.type()}: ${message.text()}`);
  });
  page.on('pageerror', (error) => errors.push(`page error: ${error.message}`));
  page.on('request', (request) => requests.push(request.url()));
  await page.goto(pathToFileURL(report).href, { waitUntil: 'load' });
  return { page, errors, requests };
}

/**
 * Each report opened once, on first use, and read by every test below (loading a 1 MB report costs Chromium about a
 * second); what a test changes — styles that hide the marks, print emulation, the viewport — it undoes.
 */
const checkedPages = new Map<string, Promise<Opened>>();
function openChecked(report: string): Promise<Opened> {
  const opened = checkedPages.get(report) ?? open(report);
  checkedPages.set(report, opened);
  return opened;
}

/**
 * The whole page at half scale (half the CSS pixel in each direction: the pixel checks need not read 15 million pixels
 * per page), taken through the DevTools protocol, whose capture takes a scale; Playwright's screenshot takes none.
 */
async function halfScaleScreenshot(page: Page): Promise<Image> {
  const size = await page.evaluate(() => ({ width: document.documentElement.scrollWidth, height: document.documentElement.scrollHeight }));
  const session = await context.newCDPSession(page);
  // optimizeForSpeed: Chromium's fastest PNG compression (the same pixels, a larger file that also inflates faster here).
  const { data } = await session.send('Page.captureScreenshot', {
    format: 'png',
    optimizeForSpeed: true,
    captureBeyondViewport: true,
    clip: { x: 0, y: 0, ...size, scale: 0.5 },
  });
  await session.detach();
  return decodePng(Buffer.from(data, 'base64'));
}

beforeAll(async () => {
  mkdirSync(SCREENSHOTS, { recursive: true });
  const van = await reportOf('parcel-van', 'parcel-van');
  reports.push(van, await reportOf('vineyard-sprayer', 'vineyard-sprayer'), await reportOf('sidewalk-robot', 'sidewalk-robot'));
  // The loaded van against the van's schedule: the old gains on the changed vehicle.
  reports.push(await reportOf('parcel-van-loaded', 'parcel-van-loaded', { baseline: van.schedule }));
  // The path loop with the default path plan of the README.
  reports.push(await reportOf('parcel-van-path', 'parcel-van', { plan: { loop: { kind: 'path' } } }));
  browser = await launchChromium();
  context = await browser.newContext({ viewport: VIEWPORT });
}, 120_000);

afterAll(async () => {
  await browser?.close();
});

describe('the report in headless Chromium, for every demo vehicle', () => {
  it('the screenshot reader used below reads a known page back: three blocks of known colour', async () => {
    const page = await context.newPage();
    await page.setContent(
      '<body style="margin:0;background:#fff"><div style="display:flex"><div style="width:40px;height:30px;background:#d55e00"></div><div style="width:40px;height:30px;background:#0072b2"></div><div style="width:40px;height:30px;background:#009e73"></div></div></body>',
    );
    const image = decodePng(await page.screenshot({ clip: { x: 0, y: 0, width: 120, height: 40 } }));
    const at = (x: number, y: number) => [...image.rgba.subarray((y * image.width + x) * 4, (y * image.width + x) * 4 + 3)];
    // Source: the CSS colours written above (Okabe & Ito's vermillion, blue, bluish green) and white.
    expect([at(20, 15), at(60, 15), at(100, 15), at(60, 35)]).toEqual([
      [0xd5, 0x5e, 0x00],
      [0x00, 0x72, 0xb2],
      [0x00, 0x9e, 0x73],
      [255, 255, 255],
    ]);
    expect(greyVariance(image, { x: 0, y: 0, width: 40, height: 30 })).toBeLessThan(1e-6);
    await page.close();
  });

  it('each report loads with no console error and requests nothing but itself; every plot has a title, a description, data marks and a table to fall back on; no plot is blank', async () => {
    for (const built of reports) {
      expect(statSync(built.report).size, built.name).toBeLessThan(3 * 1024 * 1024);
      const { page, errors, requests } = await openChecked(built.report);
      expect(errors, built.name).toEqual([]);
      expect(requests, built.name).toEqual([pathToFileURL(built.report).href]);
      const plots = await page.$$eval('svg.plot', (svgs) =>
        svgs.map((svg) => {
          const [titleId, descId] = (svg.getAttribute('aria-labelledby') ?? '').split(' ');
          const figure = svg.closest('figure');
          return {
            title: document.getElementById(titleId)?.textContent ?? '',
            description: document.getElementById(descId)?.textContent ?? '',
            role: svg.getAttribute('role'),
            marks: svg.querySelectorAll('.marks path, .marks circle').length,
            axisLabels: svg.querySelectorAll('text').length,
            fallbackRows: figure?.querySelectorAll('details table tbody tr').length ?? 0,
          };
        }),
      );
      expect(plots.length, built.name).toBeGreaterThanOrEqual(built.name === 'parcel-van-loaded' ? 30 : 25);
      for (const plot of plots) {
        expect(plot.role).toBe('img');
        expect(plot.title.length, built.name).toBeGreaterThan(5);
        expect(plot.description, plot.title).toMatch(/points/);
        expect(plot.marks, plot.title).toBeGreaterThan(0);
        expect(plot.axisLabels, plot.title).toBeGreaterThanOrEqual(4);
        expect(plot.fallbackRows, plot.title).toBeGreaterThan(0);
      }
      // Blank: the data marks must put ink on the plotting area — its pixels vary, and are darker than on the same page with
      // the marks hidden (a mark drawn in white, or outside the area, or not at all, adds none). Screenshots at half scale,
      // of the plots alone (the text and tables around them taken out of the layout: less than half the pixels to render).
      const plotsOnly = await page.addStyleTag({ content: 'body *:not(:has(svg.plot)):not(svg.plot):not(svg.plot *) { display: none !important; }' });
      const areas = await page.$$eval('svg.plot rect.plot-area', (rects) =>
        rects.map((rect) => {
          const box = rect.getBoundingClientRect();
          return { x: box.x + window.scrollX, y: box.y + window.scrollY, width: box.width, height: box.height };
        }),
      );
      expect(areas).toHaveLength(plots.length);
      const shown = await halfScaleScreenshot(page);
      const hiding = await page.addStyleTag({ content: '.marks { visibility: hidden; }' });
      const hidden = await halfScaleScreenshot(page);
      for (const style of [hiding, plotsOnly]) {
        await style.evaluate((element) => {
          element.parentNode?.removeChild(element);
        });
      }
      for (const [k, plot] of plots.entries()) {
        const area = { x: areas[k].x / 2, y: areas[k].y / 2, width: areas[k].width / 2, height: areas[k].height / 2 };
        expect(greyVariance(shown, area), `${built.name}: ${plot.title}`).toBeGreaterThan(20);
        expect(inkedPixels(shown, hidden, area), `${built.name}: ${plot.title}`).toBeGreaterThan(20);
      }
    }
  }, 120_000);

  it('the numbers in the tables are those of schedule.json, read back from the page (every breakpoint field, the worst figures, the inputs, the checksum)', async () => {
    for (const built of [reports[0], reports[3], reports[4]]) {
      const schedule = readSchedule(built.schedule);
      const { page } = await openChecked(built.report);
      const rows = await page.$$eval('#breakpoints tbody tr', (trs) =>
        trs.map((tr) =>
          Object.fromEntries(
            [...tr.querySelectorAll('td[data-field]')].map((td) => [
              td.getAttribute('data-field'),
              td.querySelector('data')?.getAttribute('value') ?? td.textContent,
            ]),
          ),
        ),
      );
      expect(rows).toHaveLength(schedule.breakpoints.length);
      schedule.breakpoints.forEach((breakpoint, k) => {
        const row = rows[k] as Record<string, string>;
        const number = (field: string) => (row[field] === '—' ? null : Number(row[field]));
        expect([number('speed_mps'), number('kp'), number('ki'), number('kd')]).toEqual([breakpoint.speed_mps, breakpoint.kp, breakpoint.ki, breakpoint.kd]);
        for (const field of [
          'lowerGainMargin_dB',
          'upperGainMargin_dB',
          'phaseMargin_deg',
          'delayMargin_s',
          'sensitivityPeak',
          'complementarySensitivityPeak',
        ] as const) {
          expect(number(field), field).toBe(breakpoint.margins[field]);
        }
        expect(row.verdict).toBe(breakpoint.margins.verdict);
        expect(row.insertedByRefinement).toBe(breakpoint.insertedByRefinement ? 'inserted' : 'planned');
      });
      const worst = await page.$$eval('#worst td[data-field]', (tds) =>
        Object.fromEntries(tds.map((td) => [td.getAttribute('data-field'), td.querySelector('data')?.getAttribute('value') ?? null])),
      );
      for (const [name, value] of Object.entries(schedule.check.worst)) {
        expect(worst[`${name}.value`] === null ? null : Number(worst[`${name}.value`]), name).toBe(value?.value ?? null);
        expect(worst[`${name}.speed_mps`] === null ? null : Number(worst[`${name}.speed_mps`]), name).toBe(value?.speed_mps ?? null);
      }
      expect(Number(worst['phaseMargin_deg.limit'])).toBe(schedule.check.thresholds.minimumPhaseMargin_deg);
      // Set-point weights, feed-forward and every time-domain figure the table shows, as the file holds them.
      const timeDomain = await page.$$eval('#time-domain-table tbody tr', (trs) =>
        trs.map((tr) =>
          Object.fromEntries(
            [...tr.querySelectorAll('td[data-field]')].map((td) => [
              td.getAttribute('data-field'),
              td.querySelector('data')?.getAttribute('value') ?? td.textContent,
            ]),
          ),
        ),
      );
      expect(timeDomain).toHaveLength(schedule.breakpoints.length);
      schedule.breakpoints.forEach((breakpoint, k) => {
        const row = timeDomain[k] as Record<string, string>;
        for (const field of ['speed_mps', 'setpointWeightProportional', 'setpointWeightDerivative', 'feedForward', 'feedForwardLeadTime_s'] as const)
          expect(Number(row[field]), field).toBe(breakpoint[field]);
        const figures = breakpoint.timeDomain as unknown as Record<string, Record<string, number | null> | null>;
        const columns = Object.keys(row).filter((field) => field.includes('.') && field !== 'actuator.limitedBy');
        expect(columns.length).toBeGreaterThanOrEqual(5);
        for (const field of columns) {
          const [part, name] = field.split('.');
          expect(row[field] === '—' ? null : Number(row[field]), `${built.name} ${breakpoint.speed_mps} m/s ${field}`).toBe(figures[part]?.[name] ?? null);
        }
        expect(row['actuator.limitedBy']).toBe(breakpoint.timeDomain!.actuator.limitedBy);
      });
      const inputs = await page.$$eval('#inputs tbody tr', (trs) => trs.map((tr) => [...tr.querySelectorAll('td')].map((td) => td.textContent)));
      expect(inputs).toEqual(schedule.provenance.inputs.map((input) => [input.file, input.role, input.sha256]));
      expect(await page.textContent('#checksum')).toBe(schedule.checksum.value);
    }
  }, 60_000);

  it('after a change it leads with the old gains on the new vehicle, right after the cautions', async () => {
    const { page } = await openChecked(reports[3].report);
    const order = await page.$$eval('h1, h2', (headings) => headings.map((heading) => heading.textContent));
    expect(order.slice(0, 3)).toEqual(['Steering gain schedule — parcel-van-loaded', 'Safety', 'After the change: the old gains on the new vehicle']);
    expect(await page.textContent('#old-gains')).toMatch(
      /The old gains do NOT hold on the new vehicle model: .* at \d+ of \d+ speeds checked .* — at [\d.]+–[\d.]+ m\/s \(phase margin/,
    );
  }, 30_000);

  it('screenshots at 1280 px and in print emulation; the print layout fits the printable width of A4 and of Letter, without navigation or fallback tables; both print as PDF (the loaded van and the path loop)', async () => {
    const van = await openChecked(reports[0].report);
    await van.page.screenshot({ path: join(SCREENSHOTS, `${reports[0].name}-1280.png`), fullPage: FULL_PAGE_SCREENSHOTS });
    // The loaded van (yaw-rate loop, with a baseline) and the path loop (the widest tables).
    for (const built of [reports[3], reports[4]]) {
      const { page } = await openChecked(built.report);
      await page.screenshot({ path: join(SCREENSHOTS, `${built.name}-1280.png`), fullPage: FULL_PAGE_SCREENSHOTS });
      await page.emulateMedia({ media: 'print' });
      for (const [paper, width] of Object.entries(PRINTABLE_WIDTH_PX)) {
        await page.setViewportSize({ width: Math.floor(width), height: 1100 });
        const layout = await page.evaluate(() => ({
          overflow: document.documentElement.scrollWidth - window.innerWidth,
          widestPlot: Math.max(...[...document.querySelectorAll('svg.plot')].map((svg) => svg.getBoundingClientRect().right)),
          widestTable: Math.max(
            ...[...document.querySelectorAll('main table')]
              .filter((table) => table.closest('details') === null)
              .map((table) => table.getBoundingClientRect().right),
          ),
          hidden: [...document.querySelectorAll('nav.contents, details')].every((element) => getComputedStyle(element).display === 'none'),
          cautionsFirst: document.querySelector('.cautions')!.getBoundingClientRect().top < document.querySelector('main')!.getBoundingClientRect().top,
        }));
        expect(layout.overflow, `${built.name} ${paper}`).toBeLessThanOrEqual(0);
        expect(layout.widestPlot, `${built.name} ${paper}`).toBeLessThanOrEqual(width);
        expect(layout.widestTable, `${built.name} ${paper}`).toBeLessThanOrEqual(width);
        expect(layout.hidden, `${built.name} ${paper}`).toBe(true);
        expect(layout.cautionsFirst, `${built.name} ${paper}`).toBe(true);
        if (paper === 'A4') await page.screenshot({ path: join(SCREENSHOTS, `${built.name}-print-A4.png`), fullPage: FULL_PAGE_SCREENSHOTS });
      }
      for (const format of ['A4', 'Letter'] as const) {
        const pdf = await page.pdf({ format, margin: { top: '14mm', bottom: '14mm', left: '14mm', right: '14mm' } });
        expect(pdf.subarray(0, 5).toString('latin1')).toBe('%PDF-');
        expect((pdf.toString('latin1').match(/\/Type\s*\/Page[^s]/g) ?? []).length, format).toBeGreaterThan(5);
      }
      await page.emulateMedia({ media: null });
      await page.setViewportSize(VIEWPORT);
      expect(readFileSync(join(SCREENSHOTS, `${built.name}-1280.png`)).length).toBeGreaterThan(10_000);
    }
  }, 120_000);
});
