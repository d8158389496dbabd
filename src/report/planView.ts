/**
 * Top-down plan of a zone as SVG: each sensor a square cell coloured by a value on a perceptually
 * uniform scale, the model's nearby walls and higher roofs in grey for orientation, a north arrow,
 * a scale bar, an optional marked sensor (e.g. where the peak MRT occurred) and a labelled legend
 * bar. Plan coordinates are engine x east, y north [m] (true north up). Pure: returns a string.
 */
import type { ZoneResult, SurfaceResult } from '../audit/results.ts';
import { niceTicks, niceStep, tickDecimals } from '../app/colour/legend.ts';
import { scaleCss, type ScaleId } from './palette.ts';
import { sampleCoolWarm } from '../app/colour/diverging.ts';
import { esc, fixed } from './format.ts';
import { sensorSpacingM } from './zoneData.ts';

export interface PlanViewInput {
  zone: ZoneResult;
  /** One value per sensor (NaN = no value, drawn grey). */
  values: readonly number[];
  /** Legend title and unit. */
  label: string;
  unit: string;
  decimals: number;
  scale: ScaleId | 'cool-warm';
  /** Labels under the two ends of a diverging legend (e.g. "cooler", "hotter"). */
  endLabels?: [string, string];
  /** Colour range; default: the values' finite min and max. */
  range?: { min: number; max: number };
  /** Start the colour range at 0 (counts of hours), not at the smallest value. */
  fromZero?: boolean;
  /** Sensor index to ring (peak location). */
  markSensor?: number;
  /** Surfaces drawn as context (walls as lines, roofs above the zone as grey cells). */
  surfaces?: readonly SurfaceResult[];
  widthPx?: number;
}

const MISSING = '#9a9a9a';

/** CSS colour at t ∈ [0, 1] of a sequential scale, or of the diverging cool-warm map (Moreland 2009). */
function colourAt(scale: PlanViewInput['scale'], t: number): string {
  if (scale !== 'cool-warm') return scaleCss(scale, t);
  const c = [0, 0, 0];
  sampleCoolWarm(t, c);
  return `rgb(${c.map((v) => Math.round(v * 255)).join(',')})`;
}

/** The plan view SVG of one zone. */
export function planViewSvg(p: PlanViewInput): string {
  const W = p.widthPx ?? 330;
  const sensors = p.zone.sensors;
  const spacing = sensorSpacingM(p.zone);
  let x0 = Infinity, x1 = -Infinity, y0 = Infinity, y1 = -Infinity;
  for (const s of sensors) {
    x0 = Math.min(x0, s.position[0]); x1 = Math.max(x1, s.position[0]);
    y0 = Math.min(y0, s.position[1]); y1 = Math.max(y1, s.position[1]);
  }
  if (!Number.isFinite(x0)) { x0 = 0; x1 = 1; y0 = 0; y1 = 1; }
  const margin = Math.max(5, spacing * 3);
  x0 -= margin; x1 += margin; y0 -= margin; y1 += margin;
  const plotW = W - 20;
  const k = plotW / (x1 - x0); // px per m
  const plotH = Math.min(360, (y1 - y0) * k);
  // If the zone is deep, shrink the scale to fit the height.
  const kk = Math.min(k, plotH / (y1 - y0));
  const offX = 10 + (plotW - (x1 - x0) * kk) / 2;
  const top = 10;
  const px = (x: number) => offX + (x - x0) * kk;
  const py = (y: number) => top + (y1 - y) * kk;
  const finite = p.values.filter((v) => Number.isFinite(v));
  let min = p.range?.min ?? (p.fromZero ? Math.min(0, ...finite) : Math.min(...finite));
  let max = p.range?.max ?? Math.max(...finite);
  if (!Number.isFinite(min)) { min = 0; max = 1; }
  if (max - min < 1e-9) { min -= 0.5; max += 0.5; }
  const frac = (v: number) => Math.min(1, Math.max(0, (v - min) / (max - min)));
  const parts: string[] = [];
  const H = top + (y1 - y0) * kk;
  parts.push(`<rect x="${offX.toFixed(1)}" y="${top}" width="${((x1 - x0) * kk).toFixed(1)}" height="${((y1 - y0) * kk).toFixed(1)}" fill="#fafaf7" stroke="#bbb"/>`);
  // Context: walls as lines across their patch width, roofs above the zone floor as grey cells.
  const floorZ = Math.min(...sensors.map((s) => s.position[2])) - p.zone.sensorHeightM;
  for (const s of p.surfaces ?? []) {
    const [cx, cy, cz] = s.centroid;
    if (cx < x0 || cx > x1 || cy < y0 || cy > y1 || s.surface === 'ground') continue;
    const side = Math.sqrt(s.areaM2);
    const nz = s.normal[2];
    if (nz > 0.9 && cz > floorZ + 0.3) {
      parts.push(`<rect x="${px(cx - side / 2).toFixed(1)}" y="${py(cy + side / 2).toFixed(1)}" width="${(side * kk).toFixed(1)}" height="${(side * kk).toFixed(1)}" fill="#d6d6d6"/>`);
    } else if (Math.abs(nz) < 0.2 && cz > floorZ - 0.5) {
      const tx = -s.normal[1], ty = s.normal[0];
      const tl = Math.hypot(tx, ty) || 1;
      // A wall patch's plan width: its area divided by its height is unknown; a 1 m² patch is ~1 m wide.
      const half = Math.min(side, 1.5) / 2;
      parts.push(`<line x1="${px(cx - (tx / tl) * half).toFixed(1)}" y1="${py(cy - (ty / tl) * half).toFixed(1)}" x2="${px(cx + (tx / tl) * half).toFixed(1)}" y2="${py(cy + (ty / tl) * half).toFixed(1)}" stroke="#555" stroke-width="1.6"/>`);
    }
  }
  const cell = spacing * kk;
  sensors.forEach((s, i) => {
    const v = p.values[i] ?? NaN;
    const fill = Number.isFinite(v) ? colourAt(p.scale, frac(v)) : MISSING;
    parts.push(`<rect class="sensor" data-sensor="${i}" data-value="${Number.isFinite(v) ? v : ''}" x="${(px(s.position[0]) - cell / 2).toFixed(1)}" y="${(py(s.position[1]) - cell / 2).toFixed(1)}" width="${cell.toFixed(1)}" height="${cell.toFixed(1)}" fill="${fill}" stroke="#fff" stroke-width="0.5"/>`);
  });
  if (p.markSensor !== undefined && sensors[p.markSensor]) {
    const s = sensors[p.markSensor]!;
    parts.push(`<circle cx="${px(s.position[0]).toFixed(1)}" cy="${py(s.position[1]).toFixed(1)}" r="${(cell * 0.7 + 2).toFixed(1)}" fill="none" stroke="#00a0ff" stroke-width="2.2"/>`);
  }
  // North arrow (true north is +y in the engine frame).
  const nx = offX + (x1 - x0) * kk - 18, ny = top + 8;
  parts.push(`<g transform="translate(${nx.toFixed(1)},${ny.toFixed(1)})"><path d="M0,0 L6,16 L0,12 L-6,16 Z" fill="#222"/><text x="0" y="28" font-size="10" text-anchor="middle">N</text></g>`);
  // Scale bar.
  const barM = niceStep((x1 - x0) / 3, 1);
  parts.push(`<g transform="translate(${(offX + 8).toFixed(1)},${(H - 10).toFixed(1)})"><rect x="0" y="-4" width="${(barM * kk).toFixed(1)}" height="4" fill="#222"/><text x="${(barM * kk + 4).toFixed(1)}" y="0" font-size="10">${esc(fixed(barM, barM < 1 ? 1 : 0))} m</text></g>`);
  // Legend bar.
  const lgTop = H + 16, lgW = plotW - 20, lgX = 20;
  const stops: string[] = [];
  for (let i = 0; i <= 16; i++) stops.push(`<stop offset="${(i / 16).toFixed(3)}" stop-color="${colourAt(p.scale, i / 16)}"/>`);
  const gid = `g${Math.abs(hashString(p.zone.name + p.label + p.scale))}`;
  parts.push(`<defs><linearGradient id="${gid}">${stops.join('')}</linearGradient></defs>`);
  parts.push(`<text x="${lgX}" y="${lgTop}" font-size="10">${esc(p.label)}${p.unit ? ` [${esc(p.unit)}]` : ''}</text>`);
  parts.push(`<rect x="${lgX}" y="${lgTop + 5}" width="${lgW}" height="10" fill="url(#${gid})" stroke="#888" stroke-width="0.5"/>`);
  const ticks = niceTicks(min, max, 5);
  const dec = Math.max(tickDecimals(ticks.length > 1 ? ticks[1]! - ticks[0]! : 1), 0);
  for (const t of ticks) {
    const x = lgX + frac(t) * lgW;
    parts.push(`<line x1="${x.toFixed(1)}" y1="${lgTop + 15}" x2="${x.toFixed(1)}" y2="${lgTop + 19}" stroke="#333"/><text x="${x.toFixed(1)}" y="${lgTop + 29}" font-size="9" text-anchor="middle">${esc(fixed(t, dec))}</text>`);
  }
  if (p.endLabels) {
    parts.push(`<text x="${lgX}" y="${lgTop + 40}" font-size="9">◀ ${esc(p.endLabels[0])}</text><text x="${lgX + lgW}" y="${lgTop + 40}" font-size="9" text-anchor="end">${esc(p.endLabels[1])} ▶</text>`);
  }
  const total = lgTop + (p.endLabels ? 44 : 34);
  return `<svg xmlns="http://www.w3.org/2000/svg" class="plan" width="${W}" height="${total.toFixed(0)}" viewBox="0 0 ${W} ${total.toFixed(0)}" font-family="Helvetica, Arial, sans-serif" role="img" aria-label="plan of ${esc(p.zone.name)}">${parts.join('')}</svg>`;
}

function hashString(s: string): number {
  let h = 0;
  for (let i = 0; i < s.length; i++) h = (Math.imul(h, 31) + s.charCodeAt(i)) | 0;
  return h;
}
