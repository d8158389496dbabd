/**
 * The report's charts as SVG, drawn with Vega-Lite 6 compiled to Vega 6 and rendered headless
 * (`renderer: 'none'` + `toSVG()`): a well-kept declarative grammar of graphics whose SVG output
 * needs no DOM or canvas, so the CLI, the tests and the viewer get the same picture.
 *
 * - `dayUtciChartSvg`: hourly (or multi-day) lines of the zone's median and hottest-sensor UTCI
 *   over the UTCI stress bands.
 * - `calendarUtciChartSvg`: month × hour grids (mean over the month's days at each clock hour) of
 *   the same two series, coloured by the category of the mean.
 */
import * as vega from 'vega';
import * as vegaLite from 'vega-lite';
import type { TopLevelSpec } from 'vega-lite';
import type { SummaryCategory } from '../audit/summary.ts';
import { CATEGORY_COLOURS } from './palette.ts';
import { parseLocal, monthName } from './format.ts';
import type { ZoneSeries } from './zoneData.ts';

const FONT = 'Helvetica, Arial, sans-serif';
const CONFIG = {
  font: FONT,
  view: { stroke: '#999' },
  axis: { labelFontSize: 10, titleFontSize: 10, titleFontWeight: 'normal' as const, gridColor: '#ddd' },
  legend: { labelFontSize: 10, titleFontSize: 10, titleFontWeight: 'normal' as const, labelLimit: 240 },
};

/** Renders a Vega-Lite spec to an SVG string (no DOM). */
export async function renderSvg(spec: TopLevelSpec): Promise<string> {
  const view = new vega.View(vega.parse(vegaLite.compile(spec).spec), { renderer: 'none' });
  try {
    return await view.toSVG();
  } finally {
    view.finalize();
  }
}

const LABEL_MEDIAN = 'median sensor';
const LABEL_WORST = 'hottest sensor';

/**
 * Lines of the zone's median and hottest-sensor UTCI per step over the stress bands.
 * @param times Results.times (ISO labels, local clock time as written).
 * @param widthPx Plot width [px].
 */
export async function dayUtciChartSvg(times: readonly string[], series: ZoneSeries, categories: readonly SummaryCategory[], airTempC: readonly number[], widthPx = 600, heightPx = 220): Promise<string> {
  const t0 = parseLocal(times[0] ?? '');
  const dayStart = Date.UTC(t0.year, t0.month - 1, t0.day);
  const multiDay = times.length > 0 && localHours(times[times.length - 1]!, dayStart) >= 24;
  const rows: { x: number; value: number; series: string }[] = [];
  let lo = Infinity, hi = -Infinity;
  times.forEach((label, i) => {
    const hx = localHours(label, dayStart);
    const x = multiDay ? hx / 24 : hx;
    for (const [name, arr] of [[LABEL_MEDIAN, series.medianUtciC], [LABEL_WORST, series.worstUtciC], ['air temperature', airTempC]] as const) {
      const v = arr[i];
      if (v === undefined || !Number.isFinite(v)) continue;
      rows.push({ x, value: Math.round(v * 100) / 100, series: name });
      if (v < lo) lo = v;
      if (v > hi) hi = v;
    }
  });
  if (!Number.isFinite(lo)) { lo = 0; hi = 30; }
  const yMin = Math.floor((lo - 2) / 2) * 2;
  const yMax = Math.ceil((hi + 2) / 2) * 2;
  const bands = categories
    .map((c) => ({ label: c.label, id: c.id, lo: Math.max(yMin, c.lowerC ?? -1e9), hi: Math.min(yMax, c.upperC ?? 1e9) }))
    .filter((b) => b.hi > b.lo);
  const xs = rows.map((r) => r.x);
  const xMin = Math.min(...xs), xMax = Math.max(...xs);
  const spec: TopLevelSpec = {
    $schema: 'https://vega.github.io/schema/vega-lite/v6.json',
    width: widthPx,
    height: heightPx,
    config: CONFIG,
    layer: [
      {
        data: { values: bands },
        mark: { type: 'rect', opacity: 0.55 },
        encoding: {
          y: { field: 'lo', type: 'quantitative', scale: { domain: [yMin, yMax], nice: false, zero: false }, title: 'UTCI [°C]' },
          y2: { field: 'hi' },
          color: {
            field: 'label', type: 'nominal', title: 'UTCI stress category',
            scale: { domain: bands.map((b) => b.label), range: bands.map((b) => CATEGORY_COLOURS[b.id]) },
            legend: { orient: 'right', symbolType: 'square' },
          },
        },
      },
      {
        data: { values: rows },
        mark: { type: 'line', strokeWidth: 2, point: { size: 14 } },
        encoding: {
          x: {
            field: 'x', type: 'quantitative', scale: { domain: [xMin, xMax], nice: false },
            title: multiDay ? 'day of the period (from the first day, local time)' : 'local clock time [h]',
            axis: multiDay ? { tickMinStep: 1 } : { values: Array.from({ length: 25 }, (_, h) => h).filter((h) => h % 3 === 0 && h >= xMin - 0.01 && h <= xMax + 0.01) },
          },
          y: { field: 'value', type: 'quantitative' },
          strokeDash: {
            field: 'series', type: 'nominal', title: 'series',
            scale: { domain: [LABEL_WORST, LABEL_MEDIAN, 'air temperature'], range: [[1, 0], [6, 3], [2, 2]] },
          },
          stroke: {
            field: 'series', type: 'nominal', title: 'series',
            scale: { domain: [LABEL_WORST, LABEL_MEDIAN, 'air temperature'], range: ['#1b1b1b', '#3a3a8c', '#777777'] },
          },
        },
      },
    ],
    resolve: { scale: { color: 'independent' } },
  };
  return renderSvg(spec);
}

/** Hours since `dayStartUtcMs` (midnight of the first day) in local clock time of the label. */
function localHours(label: string, dayStartUtcMs: number): number {
  const t = parseLocal(label);
  return (Date.UTC(t.year, t.month - 1, t.day, t.hour, t.minute) - dayStartUtcMs) / 3600e3;
}

/**
 * Month × hour grids of the zone's median and hottest-sensor UTCI: each cell is the mean over the
 * month's days of the values at that clock hour, coloured by the category of the mean.
 */
export async function calendarUtciChartSvg(times: readonly string[], series: ZoneSeries, categories: readonly SummaryCategory[], cellPx = 12): Promise<string> {
  const cells: { panel: string; month: string; m: number; hour: number; value: number; label: string; id: string }[] = [];
  for (const [panel, arr] of [[LABEL_MEDIAN, series.medianUtciC], [LABEL_WORST, series.worstUtciC]] as const) {
    const sum = new Float64Array(12 * 24), n = new Float64Array(12 * 24);
    times.forEach((label, i) => {
      const t = parseLocal(label);
      const v = arr[i];
      if (!Number.isFinite(t.month) || v === undefined || !Number.isFinite(v)) return;
      const k = (t.month - 1) * 24 + t.hour;
      sum[k]! += v;
      n[k]! += 1;
    });
    for (let k = 0; k < 12 * 24; k++) {
      if (n[k] === 0) continue;
      const value = sum[k]! / n[k]!;
      const c = categories.find((cat) => cat.lowerC === null || value > cat.lowerC) ?? categories[categories.length - 1]!;
      const m = Math.floor(k / 24) + 1;
      cells.push({ panel, month: monthName(m), m, hour: k % 24, value: Math.round(value * 10) / 10, label: c.label, id: c.id });
    }
  }
  const present = categories.filter((c) => cells.some((x) => x.id === c.id));
  const grid = (panel: string) => ({
    title: { text: `${panel}: mean UTCI by month and clock hour`, fontSize: 11, fontWeight: 'normal' as const },
    transform: [{ filter: { field: 'panel', equal: panel } }],
    width: 24 * cellPx,
    height: 12 * cellPx,
    mark: { type: 'rect' as const },
    encoding: {
      x: { field: 'hour', type: 'ordinal' as const, title: 'local clock hour', scale: { domain: Array.from({ length: 24 }, (_, h) => h) }, axis: { labelAngle: 0, values: [0, 3, 6, 9, 12, 15, 18, 21] } },
      y: { field: 'month', type: 'ordinal' as const, title: null, scale: { domain: Array.from({ length: 12 }, (_, i) => monthName(i + 1)) } },
      color: {
        field: 'label', type: 'nominal' as const, title: 'UTCI stress category',
        scale: { domain: present.map((c) => c.label), range: present.map((c) => CATEGORY_COLOURS[c.id]) },
        legend: { orient: 'bottom' as const, columns: 4, symbolType: 'square' },
      },
    },
  });
  const spec: TopLevelSpec = {
    $schema: 'https://vega.github.io/schema/vega-lite/v6.json',
    config: CONFIG,
    data: { values: cells },
    hconcat: [grid(LABEL_MEDIAN), grid(LABEL_WORST)],
  };
  return renderSvg(spec);
}
