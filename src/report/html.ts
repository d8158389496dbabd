/**
 * The review report as one self-contained HTML document (inline CSS and SVG, no scripts, no
 * external resources), laid out as A4 pages for printing to PDF:
 *
 * 1. cover: project, site, period, weather source, model file and hash, software, date run, the
 *    cautions (DESIGN §7) and the figures at a glance;
 * 2. one page per zone: plan view of the sensors coloured by a metric, UTCI chart (hourly for a
 *    day, month × hour calendar for a long period) over the stress bands, hours per category,
 *    peak MRT with when and where, glare;
 * 3. surfaces by material: peak and 95th-percentile temperature and contact-burn screening flags;
 * 4. design options (only when options are given): zones × options table and difference maps;
 * 5. method: models and sources, samples and their uncertainty, assumptions, warnings.
 *
 * Every figure taken from summary.json is written as `<span data-summary="path">text</span>`
 * (path into the Summary object, e.g. `zones.0.peakMrt.valueC`), so a test can check the report
 * against summary.json. Pure apart from the asynchronous chart rendering.
 */
import type { Results } from '../audit/results.ts';
import type { Summary, ZoneSummary } from '../audit/summary.ts';
import type { RunRecord } from '../audit/pipeline.ts';
import { esc, fixed, shortTime, shortDate, parseLocal } from './format.ts';
import { planViewSvg } from './planView.ts';
import { dayUtciChartSvg, calendarUtciChartSvg } from './charts.ts';
import { PLAN_METRICS, sensorMetric, zoneUtciSeries, isLongPeriod, STRONG_HEAT_OR_WORSE, type PlanMetricId } from './zoneData.ts';
import { contactFlags, BRIEF_TOUCH_THRESHOLDS, LONG_CONTACT_THRESHOLD_C } from './contactBurn.ts';
import { CATEGORY_COLOURS, type ScaleId } from './palette.ts';

/** One design option to compare with the base run: the same project with a change. */
export interface DesignOptionInput {
  name: string;
  results: Results;
  summary: Summary;
}

export interface ReportInput {
  results: Results;
  summary: Summary;
  /** run.json of the audit (date run, workers, timings); null when missing. */
  run?: RunRecord | null;
  /** What colours the plan views (default 'heatHours'). */
  planMetric?: PlanMetricId;
  /** Colour scale of the plan views (default 'magma'). */
  scale?: ScaleId;
  /** Design options; the options section appears only when this is non-empty. */
  options?: readonly DesignOptionInput[];
  /** Name of the base design the options are compared with (default "base"). */
  baselineName?: string;
  /** When the report was made (ISO); default now. */
  madeAt?: string;
}

/** The cautions every report carries (DESIGN §7), one sentence each. */
export const CAUTIONS: readonly string[] = [
  'Sunfacet screens designs; it does not certify them.',
  'The results depend on the inputs and on the model assumptions listed on the method page.',
  'Heat stress can harm people: follow local heat guidance for events and for people working outdoors.',
  'Glare that can affect drivers or pilots needs a study by a licensed professional under the local rules.',
  'Defer to local codes and licensed practice.',
];

const str = (v: unknown, fallback = '—'): string => (typeof v === 'string' && v !== '' ? v : v === undefined || v === null ? fallback : String(v));

/** A figure from summary.json, tagged with its path. */
function sv(path: string, value: number | null | undefined, decimals = 1): string {
  return `<span class="num" data-summary="${esc(path)}">${esc(fixed(value, decimals))}</span>`;
}

/** Builds the report's HTML. */
export async function buildReportHtml(input: ReportInput): Promise<string> {
  const { results, summary } = input;
  const metric = PLAN_METRICS[input.planMetric ?? 'heatHours'];
  const scale = input.scale ?? 'magma';
  const run = results.run as Record<string, unknown>;
  const stepHours = summary.period.stepHours;
  const pages: string[] = [];
  pages.push(coverPage(input, run));
  for (let zi = 0; zi < results.zones.length; zi++) pages.push(await zonePage(input, zi, metric.id, scale));
  pages.push(materialsPage(results, summary, stepHours));
  if (input.options && input.options.length > 0) pages.push(optionsPage(input, metric.id, stepHours));
  pages.push(methodPage(results, run, input.run ?? null));
  return [
    '<!doctype html>',
    '<html lang="en"><head><meta charset="utf-8">',
    `<title>${esc(results.project)} — Sunfacet screening report</title>`,
    `<meta name="generator" content="${esc(str(run.software, 'sunfacet'))}">`,
    `<style>${CSS}</style></head><body>`,
    pages.map((p, i) => `<section class="page" data-page="${i + 1}">${p}</section>`).join('\n'),
    '</body></html>',
    '',
  ].join('\n');
}

/** "15 Jul 2026, 00:00 to 23:00" for one day, else "1 Jan 2026 00:00 to 31 Dec 2026 23:00". */
function periodText(first: string | null, last: string | null): string {
  if (!first || !last) return '—';
  const a = parseLocal(first), b = parseLocal(last);
  const hm = (t: typeof a) => `${String(t.hour).padStart(2, '0')}:${String(t.minute).padStart(2, '0')}`;
  if (a.year === b.year && a.month === b.month && a.day === b.day) return `${shortDate(first)}, ${hm(a)} to ${hm(b)}`;
  return `${shortDate(first)} ${hm(a)} to ${shortDate(last)} ${hm(b)}`;
}

function coverPage(input: ReportInput, run: Record<string, unknown>): string {
  const { results, summary } = input;
  const site = (run.site ?? {}) as Record<string, unknown>;
  const lat = Number(site.latitudeDeg), lon = Number(site.longitudeDeg);
  const p = summary.period;
  const offset = parseLocal(p.first ?? '').offset;
  const rows: [string, string][] = [
    ['Site', `${fixed(Math.abs(lat), 4)}° ${lat >= 0 ? 'N' : 'S'}, ${fixed(Math.abs(lon), 4)}° ${lon >= 0 ? 'E' : 'W'}; elevation ${fixed(Number(site.elevationM), 0)} m; clock time UTC${esc(str(site.timeZone, offset))}; model north rotated ${fixed(Number(site.northDeg ?? 0), 1)}° to true north`],
    ['Period', `${esc(periodText(p.first, p.last))}: <span class="num" data-summary="period.steps">${p.steps}</span> steps of <span class="num" data-summary="period.stepHours">${esc(String(p.stepHours))}</span> h`],
    ['Weather', esc(str(run.weatherSource))],
    ['Model file', `${esc(str(run.modelFile))} (FNV-1a 32-bit hash <code>${esc(str(run.modelHashFnv1a32))}</code>); ${esc(str(run.triangles))} triangles, ${esc(str(run.patches))} surface patches, ${esc(str(run.sensors))} sensors`],
    ['Software', esc(str(run.software))],
    ['Audit run', input.run ? `${esc(input.run.date.replace('T', ' ').replace(/\.\d+Z$/, ' UTC'))} (${input.run.workers} tracer worker${input.run.workers === 1 ? '' : 's'})` : 'run.json not found'],
    ['Report made', esc((input.madeAt ?? new Date().toISOString()).replace('T', ' ').replace(/\.\d+Z$/, ' UTC'))],
  ];
  const glance = summary.zones.map((z, i) => {
    const heat = STRONG_HEAT_OR_WORSE.map((id) => z.categoryHours.find((c) => c.id === id)?.meanHours ?? 0).reduce((a, b) => a + b, 0);
    return `<tr><td>${esc(z.name)}</td><td class="r">${z.sensors}</td><td class="r">${sv(`zones.${i}.peakMrt.valueC`, z.peakMrt?.valueC)} °C <span class="muted">${esc(shortTime(z.peakMrt?.time))}</span></td><td class="r">${sv(`zones.${i}.peakUtci.valueC`, z.peakUtci?.valueC)} °C <span class="muted">${esc(shortTime(z.peakUtci?.time))}</span></td><td class="r">${esc(fixed(heat, 1))} h</td></tr>`;
  });
  return `
<header class="cover-head"><div class="brand">Sunfacet · screening report</div>
<h1>${esc(results.project)}</h1>
<p class="lede">Radiant heat on the outdoor spaces of the scheme: mean radiant temperature (MRT) and UTCI at sensor points, and façade and ground surface temperatures, from the massing model.</p></header>
<table class="facts">${rows.map(([k, v]) => `<tr><th>${k}</th><td>${v}</td></tr>`).join('')}</table>
<h2>At a glance</h2>
<table class="grid"><thead><tr><th>zone</th><th class="r">sensors</th><th class="r">peak MRT</th><th class="r">peak UTCI</th><th class="r">strong heat stress or worse*</th></tr></thead><tbody>${glance.join('')}</tbody></table>
<p class="note">* Hours with UTCI above 32 °C per sensor, averaged over the zone's sensors (sum of the three hottest categories on the zone pages). Times are local clock time as written in the period.</p>
<div class="caution"><h2>Read this first</h2><ul>${CAUTIONS.map((c) => `<li>${esc(c)}</li>`).join('')}</ul></div>
${results.warnings.length ? `<p class="note">The audit recorded <span class="num" data-summary="warnings">${summary.warnings}</span> warning(s); they are listed on the method page.</p>` : `<p class="note">The audit recorded <span class="num" data-summary="warnings">${summary.warnings}</span> warnings.</p>`}`;
}

async function zonePage(input: ReportInput, zi: number, metricId: PlanMetricId, scale: ScaleId): Promise<string> {
  const { results, summary } = input;
  const zone = results.zones[zi]!;
  const zs = summary.zones[zi] as ZoneSummary;
  const metric = PLAN_METRICS[metricId];
  const values = sensorMetric(zone, metricId, summary.period.stepHours);
  const plan = planViewSvg({
    zone, values, label: metric.label, unit: metric.unit, decimals: metric.decimals, scale,
    ...(zs.peakMrt ? { markSensor: zs.peakMrt.sensor } : {}), surfaces: results.surfaces, widthPx: 340, fromZero: metricId === 'heatHours',
  });
  const series = zoneUtciSeries(zone, results.times.length);
  const long = isLongPeriod(results);
  const chart = long
    ? await calendarUtciChartSvg(results.times, series, summary.categories, 10)
    : await dayUtciChartSvg(results.times, series, summary.categories, results.weather.airTempC, 500, 190);
  const path = `zones.${zi}`;
  const pm = zs.peakMrt, pu = zs.peakUtci;
  const where = (p: typeof pm) => (p ? `sensor ${p.sensor} at x ${fixed(p.position[0], 2)} m, y ${fixed(p.position[1], 2)} m, ${fixed(p.position[2], 2)} m above datum` : '—');
  const catRows = zs.categoryHours.map((c, ci) => {
    const zero = c.meanHours === 0 && c.maxHours === 0;
    return `<tr class="${zero ? 'zero' : ''}"><td><span class="swatch" style="background:${CATEGORY_COLOURS[c.id]}"></span>${esc(c.label)}</td><td class="r">${sv(`${path}.categoryHours.${ci}.meanHours`, c.meanHours)}</td><td class="r">${sv(`${path}.categoryHours.${ci}.maxHours`, c.maxHours)}</td></tr>`;
  });
  const g = zs.glare;
  const glareCell = g === undefined
    ? 'not assessed in this run'
    : `${sv(`${path}.glare.glareHours.meanHours`, g.glareHours.meanHours)} h</div><div class="w">mean per sensor (after-image or worse); ${sv(`${path}.glare.glareHours.maxHours`, g.glareHours.maxHours)} h at the worst` +
      (g.peakReflected ? `; strongest ${sv(`${path}.glare.peakReflected.valueWm2`, g.peakReflected.valueWm2)} W/m², ${esc(shortTime(g.peakReflected.time))}` : '; no reflected sun arrives');
  return `
<h1 class="zone-title">Zone: ${esc(zone.name)}</h1>
<p class="sub">${esc(zone.posture)} · sensors <span class="num" data-summary="${path}.sensors">${zs.sensors}</span> at <span class="num" data-summary="${path}.sensorHeightM">${esc(String(zs.sensorHeightM))}</span> m above the floor${zs.droppedSensors ? ` · <span class="num" data-summary="${path}.droppedSensors">${zs.droppedSensors}</span> inside solids dropped` : ''} · median sky view factor ${sv(`${path}.medianSkyViewFactor`, zs.medianSkyViewFactor, 2)}</p>
<div class="two">
  <figure class="planfig">${plan}<figcaption>Plan, north up: sensors coloured by ${esc(metric.label)}; the blue ring marks where the peak MRT occurred. Grey: walls and higher roofs of the model nearby.</figcaption></figure>
  <div class="keys">
    <div class="key"><div class="k">Peak MRT</div><div class="v">${sv(`${path}.peakMrt.valueC`, pm?.valueC)} °C</div><div class="w">${esc(shortTime(pm?.time))}; ${esc(where(pm))}</div></div>
    <div class="key"><div class="k">Peak UTCI</div><div class="v">${sv(`${path}.peakUtci.valueC`, pu?.valueC)} °C</div><div class="w">${esc(shortTime(pu?.time))}; ${esc(where(pu))}</div></div>
    <div class="key"><div class="k">Hours with MRT above ${sv(`${path}.mrtAbove.thresholdC`, zs.mrtAbove.thresholdC, 0)} °C</div><div class="v">${sv(`${path}.mrtAbove.meanHours`, zs.mrtAbove.meanHours)} h</div><div class="w">mean per sensor; ${sv(`${path}.mrtAbove.maxHours`, zs.mrtAbove.maxHours)} h at the worst sensor</div></div>
    <div class="key"><div class="k">Glare hours</div><div class="v${g === undefined ? ' small' : ''}">${glareCell}</div></div>
  </div>
</div>
<figure class="chart">${chart}<figcaption>${long ? 'Mean UTCI at each clock hour over each month, for the median sensor and the hottest sensor of each step; cells coloured by the stress category of the mean.' : 'UTCI of the median sensor and of the hottest sensor at each step, with the air temperature, over the UTCI stress categories.'}</figcaption></figure>
<table class="grid cats"><thead><tr><th>UTCI stress category</th><th class="r">hours per sensor (mean)</th><th class="r">hours at the sensor with most</th></tr></thead><tbody>${catRows.join('')}</tbody></table>`;
}

function materialsPage(results: Results, summary: Summary, stepHours: number): string {
  const flags = contactFlags(results, stepHours);
  const rows = summary.materials.map((m, mi) => {
    const f = flags.find((x) => x.material === m.material);
    const thr = f?.briefTouchC;
    const brief = thr === null || thr === undefined ? '<span class="muted">not assessed</span>' : f!.briefTouchPatches > 0 ? `<b>${f!.briefTouchPatches}</b> patches, ${fixed(f!.briefTouchHours, 1)} patch-h above ${thr} °C` : `none above ${thr} °C`;
    const longC = f?.longContactPatches === null || f === undefined ? '<span class="muted">—</span>' : f.longContactPatches > 0 ? `<b>${f.longContactPatches}</b> patches` : 'none';
    return `<tr><td>${esc(m.material)}</td><td class="r"><span class="num" data-summary="materials.${mi}.patches">${m.patches}</span></td><td class="r">${sv(`materials.${mi}.peakSurfaceTemp.valueC`, m.peakSurfaceTemp?.valueC)}</td><td class="nw">${esc(shortTime(m.peakSurfaceTemp?.time))}<br><span class="muted">${esc(m.peakSurfaceTemp?.patch ?? '')}</span></td><td class="r">${sv(`materials.${mi}.p95SurfaceTempC`, m.p95SurfaceTempC)}</td><td>${brief}</td><td>${longC}</td></tr>`;
  });
  const examples = flags.filter((f) => f.examples.length > 0).map((f) => `<li><b>${esc(f.material)}</b>: ${f.examples.map(esc).join(', ')}</li>`);
  return `
<h1>Surfaces by material</h1>
<p class="sub">Exterior surface temperatures of the model's patches (about 1 m² each) over the period. The 95th percentile is over all patch-steps of the material.</p>
<table class="grid mats"><thead><tr><th>material</th><th class="r">patches</th><th class="r">peak [°C]</th><th>when, where</th><th class="r">95th pct [°C]</th><th>brief touch (a few seconds)</th><th>long contact (&gt; ${LONG_CONTACT_THRESHOLD_C} °C)</th></tr></thead><tbody>${rows.join('')}</tbody></table>
<h2>Touch-burn screening</h2>
<p>Surfaces that people can reach — handrails, cladding at hand height, benches, paving under bare feet — may burn skin when hot. We compare patch temperatures with contact-burn thresholds of the kind EN ISO 13732-1 gives per material group and contact time. <b>The threshold values used here were taken from memory and not checked against the standard</b>; they are a screening flag that points at surfaces worth a closer look, not a finding of risk or compliance, and the model does not know which patches are within reach.</p>
<table class="grid"><thead><tr><th>material group</th><th class="r">brief touch, a few seconds</th><th class="r">long contact, 10 min or more</th></tr></thead><tbody>${Object.values(BRIEF_TOUCH_THRESHOLDS).map((t) => `<tr><td>${esc(t.label)}</td><td class="r">${t.briefTouchC === null ? '—' : `~${t.briefTouchC} °C`}</td><td class="r">${t.briefTouchC === null ? '—' : `~${LONG_CONTACT_THRESHOLD_C} °C`}</td></tr>`).join('')}</tbody></table>
<p class="note">Material groups are read from the preset names (metal: steel, aluminium and unknown presets; glass and mineral: glass, concrete, stone, brick, paving; wood: timber). Vegetation and water are not assessed.</p>
${examples.length ? `<h2>Hottest patches above the long-contact value</h2><ul class="small">${examples.join('')}</ul>` : ''}`;
}

function optionsPage(input: ReportInput, metricId: PlanMetricId, stepHours: number): string {
  const { results, summary } = input;
  const options = input.options ?? [];
  const metric = PLAN_METRICS[metricId];
  const heat = (z: ZoneSummary | undefined) => (z ? STRONG_HEAT_OR_WORSE.map((id) => z.categoryHours.find((c) => c.id === id)?.meanHours ?? 0).reduce((a, b) => a + b, 0) : NaN);
  const baseName = input.baselineName ?? 'base';
  const head = `<tr><th>zone</th><th class="r">${esc(baseName)}</th>${options.map((o) => `<th class="r">${esc(o.name)}</th>`).join('')}</tr>`;
  const body = summary.zones.map((z) => {
    const cells = options.map((o) => {
      const oz = o.summary.zones.find((x) => x.name === z.name);
      return `<td class="r">${esc(fixed(heat(oz), 1))} h<br><span class="muted">${esc(fixed(oz?.peakMrt?.valueC, 1))} °C</span></td>`;
    });
    return `<tr><td>${esc(z.name)}</td><td class="r">${esc(fixed(heat(z), 1))} h<br><span class="muted">${esc(fixed(z.peakMrt?.valueC, 1))} °C</span></td>${cells.join('')}</tr>`;
  });
  const maps: string[] = [];
  for (const o of options) {
    for (const zone of results.zones) {
      const oz = o.results.zones.find((x) => x.name === zone.name);
      if (!oz || oz.sensors.length !== zone.sensors.length) {
        maps.push(`<p class="note">${esc(o.name)} · ${esc(zone.name)}: the sensor grid differs from the base run, so no difference map.</p>`);
        continue;
      }
      const base = sensorMetric(zone, metricId, stepHours);
      const alt = sensorMetric(oz, metricId, o.summary.period.stepHours);
      const diff = base.map((b, i) => (alt[i] ?? NaN) - b);
      if (diff.every((d) => !Number.isFinite(d) || Math.abs(d) < 0.05)) {
        maps.push(`<p class="note">${esc(o.name)} · ${esc(zone.name)}: no change against ${esc(baseName)}.</p>`);
        continue;
      }
      const span = Math.max(1e-6, ...diff.filter(Number.isFinite).map(Math.abs));
      maps.push(`<figure class="diff">${planViewSvg({ zone, values: diff, label: `${o.name} − ${baseName}: ${metric.label}`, unit: metric.unit, decimals: metric.decimals, scale: 'cool-warm', endLabels: metric.id === 'skyView' ? ['less sky', 'more sky'] : ['cooler', 'hotter'], range: { min: -span, max: span }, widthPx: 320 })}<figcaption>${esc(o.name)} · ${esc(zone.name)}</figcaption></figure>`);
    }
  }
  return `
<h1>Design options</h1>
<p class="sub">Hours of strong heat stress or worse per sensor (mean over the zone) and, below each, the peak MRT.</p>
<table class="grid"><thead>${head}</thead><tbody>${body.join('')}</tbody></table>
<h2>Difference maps</h2><div class="maps">${maps.join('')}</div>`;
}

function methodPage(results: Results, run: Record<string, unknown>, record: RunRecord | null): string {
  const models = (run.models ?? {}) as Record<string, unknown>;
  const sampling = (run.sampling ?? {}) as Record<string, unknown>;
  const modelNames: Record<string, string> = {
    sun: 'Sun position', clearSky: 'Clear-sky irradiance', sky: 'Sky diffuse radiance', convection: 'Convection', skyLongwave: 'Sky longwave',
    mrt: 'Mean radiant temperature', utci: 'UTCI', reflection: 'Reflection between surfaces', glare: 'Glare',
  };
  const modelRows = Object.entries(models).map(([k, v]) => `<tr><th>${esc(modelNames[k] ?? k)}</th><td>${esc(str(v))}</td></tr>`);
  modelRows.push(
    '<tr><th>Surface heat balance</th><td>absorbed shortwave (two solar bands) and longwave − emitted εσT⁴ − convection − conduction, with transient 1-D finite-difference conduction through each layered construction; ' +
      `${esc(str(run.spinUpSteps))} spin-up steps before the period; largest energy-balance residual ${esc(str(run.energyBalanceMaxResidualPct))} %</td></tr>`,
    ...(models.glare !== undefined ? [] : [results.glare === undefined ? '<tr><th>Glare</th><td>not assessed in this run</td></tr>' : `<tr><th>Glare</th><td>${esc(results.glare.criterion)}</td></tr>`]),
  );
  const timings = record ? Object.entries(record.timingsMs).map(([k, v]) => `${esc(k)} ${(v / 1000).toFixed(1)} s`).join('; ') : '';
  return `<div class="methodpage">
<h1>Method</h1>
<table class="facts method">${modelRows.join('')}</table>
<h2>Samples and their uncertainty</h2>
<ul>
<li>Sky seen by each surface patch and by each side of a person: ${esc(str(sampling.skyRaysPerPatch))} stratified rays per patch and per sky band (seed ${esc(str(sampling.seed))}); the sky view factor of a sensor is within about ±0.01 of the closed form for a long street canyon at the default sample counts (the tracer's own check).</li>
<li>Surfaces seen by surfaces and by sensors: ${esc(str(sampling.viewRays))} stratified rays per direction; sun visibility is traced exactly for each of the ${esc(str(run.distinctSunDirections))} distinct sun directions.</li>
<li>Sampling is seeded: the same inputs give the same numbers with any number of workers.</li>
<li>Figures are rounded for reading: temperatures and hours to 0.1, sky view factors to 0.01. A step of ${esc(str(run.stepHours))} h counts as ${esc(str(run.stepHours))} h.</li>
</ul>
<h2>Assumptions and what is not modelled</h2>
<ul>
<li>Wind flow around the buildings is not simulated: the wind at each height comes from the 10 m wind by a profile law, the same everywhere on the site.</li>
<li>Evaporative cooling (wet surfaces, irrigated lawns, trees' transpiration, misting, water features) is not modelled.</li>
<li>${results.glare === undefined ? 'Reflection between surfaces is diffuse; specular reflection from glass and metal is not traced in this run, so glare and focused reflections are not assessed.' : 'Reflection between surfaces: the matte part is diffuse; the mirror-like part of glass, metal and water is traced from the solar disc to the sensors and viewpoints (glare, concentration) and enters their MRT as a beam. Reflected sun does not heat the surfaces it lands on.'}</li>
<li>The ground under and around the model is a ground apron with its own shade and heat balance (1 m² cells within 6 m of a zone, 4 m² cells farther out); beyond it an open far ground at its own temperature.</li>
<li>Materials are presets with typical properties; real products vary. People are standard (shortwave absorptance 0.7, emissivity 0.97), not a particular person, posture or clothing beyond the UTCI's own assumptions.</li>
<li>Time stamps: ${esc(results.timeConvention)}.</li>
<li>The weather is what the project gives: ${esc(str(run.weatherSource))}.</li>
</ul>
<h2>Audit warnings</h2>
${results.warnings.length ? `<ul class="small">${results.warnings.map((w) => `<li>${esc(w)}</li>`).join('')}</ul>` : '<p>None.</p>'}
<h2>About this report</h2>
<p class="small">Charts are drawn with Vega-Lite 6 compiled to Vega 6 and rendered to SVG without a browser: a well-kept declarative grammar of graphics whose SVG output needs no DOM. Plan views are drawn directly as SVG; colour scales are the perceptually uniform viridis, magma and cividis tables (matplotlib, CC0). The audit's own files (results.json, summary.json, surfaces.csv, sensors.csv) carry every number at full resolution. ${timings ? `Audit timings: ${timings}.` : ''}</p>
<p class="caution small">${CAUTIONS.map(esc).join(' ')}</p></div>`;
}

const CSS = `
@page { size: A4; margin: 13mm 13mm 16mm 13mm; }
* { box-sizing: border-box; }
html { font-family: Helvetica, Arial, sans-serif; font-size: 10.5pt; color: #1d1d1d; }
body { margin: 0; background: #e9e9e6; }
.page { background: #fff; width: 184mm; min-height: 250mm; margin: 8mm auto; padding: 0; break-after: page; page-break-after: always; }
.page:last-child { break-after: auto; page-break-after: auto; }
@media print { body { background: #fff; } .page { margin: 0; width: auto; min-height: 0; } }
h1 { font-size: 19pt; margin: 0 0 2mm; font-weight: 600; }
h2 { font-size: 12pt; margin: 5mm 0 2mm; font-weight: 600; }
.brand { font-size: 9pt; letter-spacing: 0.08em; text-transform: uppercase; color: #7a3b00; margin-bottom: 4mm; }
.cover-head { border-bottom: 2px solid #1d1d1d; padding: 18mm 0 4mm; margin-bottom: 5mm; }
.cover-head h1 { font-size: 24pt; }
.lede { font-size: 11.5pt; color: #333; margin: 2mm 0 0; }
.sub { color: #444; margin: 0 0 3mm; }
table { border-collapse: collapse; width: 100%; }
.facts th { text-align: left; vertical-align: top; width: 30mm; padding: 1.3mm 3mm 1.3mm 0; font-weight: 600; }
.facts td { padding: 1.3mm 0; }
.method th { width: 44mm; }
.grid th, .grid td { border-bottom: 1px solid #ddd; padding: 1.2mm 2mm; text-align: left; vertical-align: top; }
.grid thead th { border-bottom: 1.5px solid #555; font-weight: 600; font-size: 9.5pt; }
.r { text-align: right !important; }
.muted { color: #777; font-size: 9pt; }
.note { color: #555; font-size: 9pt; }
.small { font-size: 9pt; }
.caution { border: 1.5px solid #7a3b00; background: #fff7ef; padding: 2mm 5mm; margin-top: 6mm; }
.caution h2 { margin-top: 1mm; }
.caution li { margin: 1mm 0; }
.zone-title { font-size: 17pt; }
.two { display: flex; gap: 5mm; align-items: flex-start; }
figure { margin: 0; }
figcaption { font-size: 8.5pt; color: #555; margin-top: 1mm; }
.planfig { flex: 0 0 92mm; }
.keys { flex: 1; display: flex; flex-direction: column; gap: 2.5mm; }
.key { border-left: 3px solid #7a3b00; padding-left: 3mm; }
.key .k { font-size: 9pt; color: #555; }
.key .v { font-size: 16pt; font-weight: 600; }
.key .v.small { font-size: 10.5pt; font-weight: normal; }
.key .w { font-size: 8.5pt; color: #444; }
.chart { margin-top: 3mm; }
.chart svg { max-width: 100%; height: auto; }
.cats td, .cats th { padding: 0.7mm 2mm; font-size: 9.5pt; }
tr.zero td { color: #999; }
.swatch { display: inline-block; width: 3.2mm; height: 3.2mm; margin-right: 2mm; vertical-align: -0.4mm; border: 0.5px solid #999; }
.mats td, .mats th { font-size: 8.5pt; padding: 1mm 1.5mm; }
.nw { white-space: nowrap; }
.method th, .method td { font-size: 9.5pt; padding-top: 0.8mm; padding-bottom: 0.8mm; }
.methodpage li { font-size: 9pt; margin-bottom: 1pt; }
.methodpage table.method td, .methodpage table.method th { font-size: 8.5pt; padding-top: 1.5pt; padding-bottom: 1.5pt; }
.maps { display: flex; flex-wrap: wrap; gap: 4mm; }
code { font-size: 9.5pt; }
ul { padding-left: 5mm; margin: 1mm 0; }
li { margin: 0.7mm 0; }
`;
