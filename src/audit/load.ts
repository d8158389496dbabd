/**
 * Reads what a project refers to through a caller-supplied file reader (Node's fs in the CLI,
 * fetch/File in the browser), so the audit itself never touches the file system.
 */
import { parseProjectText, type Project } from './project.ts';
import { parseEpw } from '../physics/weather/epw.ts';
import { parseWeatherCsv } from '../physics/weather/csv.ts';
import type { WeatherSeries } from '../physics/weather/types.ts';
import { InputError } from '../physics/errors.ts';

/** Reads a file given by a path relative to the project file (already checked to stay inside its folder). */
export type ReadRelative = (relativePath: string) => Promise<Uint8Array>;

export interface LoadedProject {
  project: Project;
  projectFile: string;
  weather?: WeatherSeries;
  readRelative: ReadRelative;
  /** Largest model accepted [triangles] (default 3 M, `DEFAULT_TRIANGLE_LIMIT`). */
  triangleLimit?: number;
}

export async function loadProject(text: string, projectFile: string, readRelative: ReadRelative): Promise<LoadedProject> {
  const project = parseProjectText(text, projectFile);
  let weather: WeatherSeries | undefined;
  if (project.weather.source === 'file') {
    const rel = project.weather.file;
    const bytes = await readOrExplain(readRelative, rel, projectFile, 'weather.file');
    const body = new TextDecoder('utf-8').decode(bytes);
    const year = project.period.kind === 'range' ? new Date(project.period.startMs).getUTCFullYear() : undefined;
    weather = /\.csv$/i.test(rel) ? parseWeatherCsv(body, rel) : parseEpw(body, rel, year === undefined ? {} : { timestampYear: year });
    if (project.period.kind === 'year') {
      project.period.startMs = weather.midpointTimeMs[0]!;
      project.period.endMs = weather.midpointTimeMs[weather.count - 1]!;
      project.period.stepMinutes = weather.intervalMinutes;
    }
  }
  return { project, projectFile, ...(weather ? { weather } : {}), readRelative };
}

export async function readOrExplain(read: ReadRelative, rel: string, projectFile: string, key: string): Promise<Uint8Array> {
  try {
    return await read(rel);
  } catch (e) {
    if (e instanceof InputError) throw e;
    const code = (e as { code?: string }).code;
    throw new InputError({
      file: projectFile,
      place: key,
      problem: code === 'ENOENT' ? `file not found: ${rel}` : `cannot read ${rel} (${e instanceof Error ? e.message : String(e)})`,
      expected: 'a readable file, path relative to the project file',
    });
  }
}
