import type { Command, CliIo } from '../command.ts';
import { readProjectFile } from '../files.ts';
import { loadProject } from '../../audit/load.ts';
import { dayTable, type DayTableRow } from '../../audit/dayTable.ts';
import { UTCI_CATEGORIES } from '../../physics/utci.ts';

export const dayCommand: Command = {
  name: 'day',
  summary: "Design-day table from the physics core: sun, DNI/DHI, a wall's sol-air temperature, UTCI in sun and shade",
  usage: 'sunfacet day <project.json> [--facing <deg>] [--material <preset>] [--posture standing|seated] [--json]',
  options: {
    facing: { type: 'number', min: 0, max: 360, unit: '° clockwise from north', value: '<deg>', help: 'azimuth the wall faces (default: the equator)' },
    material: { type: 'string', value: '<preset>', help: 'wall material preset (default steel-dark-painted)' },
    posture: { type: 'string', value: 'standing|seated', help: 'posture of the person (default standing)' },
    json: { type: 'boolean', help: 'print the rows as JSON' },
  },
  details:
    'No geometry: the person stands on an open, flat site (sky above, the project ground below);\n' +
    '"shade" removes the direct beam only, as an umbrella would. For the real terrace run `sunfacet audit`.',
  async run({ positional, options }, io) {
    const file = positional[0];
    if (!file) {
      io.err('sunfacet day: missing the project file; usage: ' + this.usage + '\n');
      return 2;
    }
    return printDayTable(file, io, options);
  },
};

export async function printDayTable(file: string, io: CliIo, options: Record<string, unknown>): Promise<number> {
  const { text, readRelative } = await readProjectFile(file, io.cwd);
  const loaded = await loadProject(text, file, readRelative);
  const posture = options.posture === undefined ? undefined : options.posture === 'seated' ? 'seated' : options.posture === 'standing' ? 'standing' : undefined;
  if (options.posture !== undefined && posture === undefined) {
    io.err(`sunfacet day: --posture: not an accepted value (got ${JSON.stringify(options.posture)}); expected standing or seated\n`);
    return 2;
  }
  const t = dayTable(loaded.project, {
    ...(options.facing === undefined ? {} : { wallAzimuthDeg: options.facing as number }),
    ...(options.material === undefined ? {} : { wallMaterial: String(options.material) }),
    ...(posture ? { posture } : {}),
  }, loaded.weather);
  if (options.json) {
    io.out(JSON.stringify({ project: loaded.project.name, wall: t.wall, rows: t.rows }, null, 1) + '\n');
    return 0;
  }
  io.out(formatDayTable(loaded.project.name, t.wall, t.rows));
  for (const w of t.warnings) io.err(`warning: ${w}\n`);
  return 0;
}

function label(id: string): string {
  return UTCI_CATEGORIES.find((c) => c.id === id)?.label ?? id;
}

export function formatDayTable(name: string, wall: { azimuthDeg: number; material: string }, rows: DayTableRow[]): string {
  const head = ['time', 'sun alt°', 'sun az°', 'DNI W/m²', 'DHI W/m²', 'air °C', `wall sol-air °C`, 'UTCI sun °C', 'UTCI shade °C'];
  const lines = rows.map((r) => [
    r.time.slice(11, 16),
    r.sunAltitudeDeg.toFixed(1),
    r.sunAzimuthDeg.toFixed(1),
    r.dniWm2.toFixed(0),
    r.dhiWm2.toFixed(0),
    r.airTempC.toFixed(1),
    r.wallSolAirC.toFixed(1),
    r.sunlitUtciC.toFixed(1),
    r.shadedUtciC.toFixed(1),
  ]);
  const widths = head.map((h, i) => Math.max(h.length, ...lines.map((l) => l[i]!.length)));
  const fmt = (cells: string[]) => cells.map((c, i) => (i === 0 ? c.padEnd(widths[i]!) : c.padStart(widths[i]!))).join('  ');
  const peak = rows.reduce((a, r) => (r.sunlitUtciC > a.sunlitUtciC ? r : a), rows[0]!);
  const hottestWall = rows.reduce((a, r) => (r.wallSolAirC > a.wallSolAirC ? r : a), rows[0]!);
  return [
    `${name} — design day ${rows[0]?.time.slice(0, 10) ?? ''} (times ${rows[0]?.time.slice(19) ?? ''})`,
    `wall: facing ${wall.azimuthDeg}° (clockwise from north), ${wall.material}; person: open flat site`,
    '',
    fmt(head),
    ...lines.map(fmt),
    '',
    `hottest wall: sol-air ${hottestWall.wallSolAirC.toFixed(1)} °C at ${hottestWall.time.slice(11, 16)}`,
    `peak UTCI in the sun: ${peak.sunlitUtciC.toFixed(1)} °C (${label(peak.sunlitCategory)}) at ${peak.time.slice(11, 16)}; in the shade ${peak.shadedUtciC.toFixed(1)} °C (${label(peak.shadedCategory)})`,
    '',
  ].join('\n');
}
