/**
 * What the buttons do: open the demo, files and saved work; run and cancel the audit; keep the
 * sun path and the autosave up to date. Called by UI components; holds no React state itself.
 */
import { AuditClient, type RunHandle } from './auditClient.ts';
import type { AuditJob } from './auditApi.ts';
import { heavy } from '../state/heavy.ts';
import { whenModelShown } from '../scene/framesShown.ts';
import { initialRun, useViewer } from '../state/store.ts';
import { checkDoc, parseProjectDoc, setWeatherFile, type ProjectDoc } from '../state/projectDoc.ts';
import { designNames } from '../state/designDoc.ts';
import { base64ToBytes, makeSavedState, readAutosave, writeAutosave } from '../state/persist.ts';

const DEMO_FOLDER = 'demo/';
/** Trace workers when the page is cross-origin isolated. */
const TRACE_WORKERS = 2;
const client = new AuditClient();
let current: RunHandle<unknown> | null = null;

function demoUrl(rel: string): string {
  return new URL(DEMO_FOLDER + rel, document.baseURI).href;
}

function errorText(e: unknown): string {
  return e instanceof Error ? e.message : String(e);
}

function notify(kind: 'error' | 'info', text: string): void {
  useViewer.getState().set({ notice: { kind, text } });
}

async function fetchBytes(url: string): Promise<Uint8Array> {
  const res = await fetch(url);
  if (!res.ok) throw new Error(`${url}: HTTP ${res.status}`);
  return new Uint8Array(await res.arrayBuffer());
}

function job(doc: ProjectDoc): AuditJob {
  const s = useViewer.getState();
  const files: Record<string, Uint8Array> = {};
  if (heavy.modelBytes) files[doc.model.file] = heavy.modelBytes;
  if (heavy.weatherFile && doc.weather.source === 'file') files[doc.weather.file] = heavy.weatherFile.bytes;
  return {
    projectText: JSON.stringify(doc),
    projectFile: 'project.json',
    files,
    ...(s.modelSource === 'demo' ? { baseUrl: new URL(DEMO_FOLDER, document.baseURI).href } : {}),
    // A cross-origin isolated page has shared memory: trace on two Web Workers (the machine's
    // cores); otherwise inside the audit worker.
    workers: typeof crossOriginIsolated !== 'undefined' && crossOriginIsolated ? TRACE_WORKERS : 0,
  };
}

/** Imports a model for display; the previous model stays if this throws. */
async function showModel(bytes: Uint8Array, fileName: string, doc: ProjectDoc, source: 'demo' | 'user'): Promise<void> {
  const view = await client.openModel(bytes, fileName, {
    ...(doc.model.upAxis ? { upAxis: doc.model.upAxis } : {}),
    ...(doc.model.unitsPerMeter ? { unitsPerMeter: doc.model.unitsPerMeter } : {}),
  });
  cancelRun();
  heavy.model = view;
  heavy.modelBytes = bytes;
  heavy.results = null;
  heavy.patches = null;
  heavy.designs = null;
  heavy.pair = null;
  const s = useViewer.getState();
  s.set({
    doc,
    modelSource: source,
    modelFileName: fileName,
    modelVersion: s.modelVersion + 1,
    resultsVersion: 0,
    resultsStale: false,
    selectedSurface: null,
    picked: null,
    draftZone: [],
    tool: 'look',
    viewMode: 'model',
    run: initialRun,
    designsVersion: 0,
    activeDesign: '',
    compareOption: '',
    compareReference: '',
    pairVersion: 0,
    zoneExtra: 'none',
    selectedDevice: null,
  });
  if (view.warnings.length > 0) notify('info', `${fileName}: ${view.warnings.slice(0, 3).join('; ')}${view.warnings.length > 3 ? ` (+${view.warnings.length - 3} more)` : ''}`);
  refreshSunPath();
}

/** Longest wait for the model's first frame before a session's first audit starts anyway [ms]. */
const FIRST_FRAME_WAIT_MS = 3000;

export async function loadDemo(autoRun = true): Promise<void> {
  const s = useViewer.getState();
  s.set({ busy: 'Opening the demo…' });
  try {
    const text = await (await fetch(demoUrl('project.json'))).text();
    const doc = parseProjectDoc(text, 'demo/project.json');
    const bytes = await fetchBytes(demoUrl(doc.model.file));
    await showModel(bytes, doc.model.file, doc, 'demo');
    useViewer.getState().set({ notice: null });
    if (autoRun) startRun();
  } catch (e) {
    notify('error', `The demo could not be opened: ${errorText(e)}`);
  } finally {
    useViewer.getState().set({ busy: '' });
  }
}

/** First visit: the demo; later visits: the autosaved work. Both start an audit. */
export async function startup(): Promise<void> {
  const saved = readAutosave(localStorage);
  if (!saved) return loadDemo(true);
  const s = useViewer.getState();
  s.set({ busy: 'Restoring your last session…' });
  try {
    if (saved.model.kind === 'missing') {
      s.set({ doc: saved.doc, modelSource: 'user', modelFileName: saved.model.fileName });
      notify('info', `Your project was restored, but its model ${saved.model.fileName} was too large to keep in the browser: open it again.`);
      return;
    }
    const bytes = saved.model.kind === 'demo' ? await fetchBytes(demoUrl(saved.doc.model.file)) : base64ToBytes(saved.model.base64);
    if (saved.weather) heavy.weatherFile = { name: saved.weather.fileName, bytes: base64ToBytes(saved.weather.base64) };
    await showModel(bytes, saved.doc.model.file, saved.doc, saved.model.kind === 'demo' ? 'demo' : 'user');
    notify('info', `Restored your project from ${new Date(saved.savedAt).toLocaleString()}.`);
    startRun();
  } catch (e) {
    notify('error', `Your saved session could not be restored (${errorText(e)}); opening the demo instead.`);
    await loadDemo(true);
  } finally {
    useViewer.getState().set({ busy: '' });
  }
}

const MODEL_RE = /\.(glb|gltf|obj)$/i;
const WEATHER_RE = /\.(epw|csv)$/i;

/**
 * Opens an hourly weather file for the project (weather.source "file"); it is read and checked in
 * the worker (the sun path), so a bad file shows its message without blocking the page.
 */
export async function openWeatherFile(file: File): Promise<void> {
  const s = useViewer.getState();
  if (!s.doc) {
    notify('error', 'Open a model or the demo before a weather file.');
    return;
  }
  const bytes = new Uint8Array(await file.arrayBuffer());
  heavy.weatherFile = { name: file.name, bytes };
  s.setDoc(setWeatherFile(s.doc, file.name));
  notify('info', `Weather from ${file.name}. Choose the period: a day, a range of days, or the whole year.`);
}

/** Opens picked or dropped files: a project .json (with its model), or a model alone. */
export async function openFiles(files: File[]): Promise<void> {
  const projectFile = files.find((f) => /\.json$/i.test(f.name));
  const modelFile = files.find((f) => MODEL_RE.test(f.name));
  const weatherFile = files.find((f) => WEATHER_RE.test(f.name));
  const s = useViewer.getState();
  if (weatherFile) heavy.weatherFile = { name: weatherFile.name, bytes: new Uint8Array(await weatherFile.arrayBuffer()) };
  if (weatherFile && !projectFile && !modelFile) return openWeatherFile(weatherFile);
  if (!projectFile && !modelFile) {
    notify('error', `${files.map((f) => f.name).join(', ') || 'nothing'}: not a model, project or weather file; expected a .glb, .gltf or .obj model, a project .json, or an .epw / .csv weather file`);
    return;
  }
  s.set({ busy: `Opening ${(projectFile ?? modelFile)!.name}…` });
  try {
    if (projectFile) {
      const doc = parseProjectDoc(await projectFile.text(), projectFile.name);
      let bytes: Uint8Array;
      let source: 'demo' | 'user' = 'user';
      const wanted = doc.model.file.split('/').pop() ?? doc.model.file;
      if (modelFile) bytes = new Uint8Array(await modelFile.arrayBuffer());
      else if (heavy.modelBytes && s.modelFileName === doc.model.file) {
        bytes = heavy.modelBytes;
        source = s.modelSource;
      } else {
        throw new Error(`${projectFile.name}: model.file: ${wanted} was not opened with the project; choose the project and its model together`);
      }
      const fileName = modelFile ? modelFile.name : doc.model.file;
      await showModel(bytes, fileName, modelFile ? { ...doc, model: { ...doc.model, file: modelFile.name } } : doc, source);
      notify('info', `Opened ${projectFile.name}.`);
    } else if (modelFile) {
      const bytes = new Uint8Array(await modelFile.arrayBuffer());
      const base = s.doc ?? defaultDoc();
      const isObj = /\.obj$/i.test(modelFile.name);
      const doc: ProjectDoc = {
        ...base,
        name: modelFile.name.replace(MODEL_RE, ''),
        model: { file: modelFile.name, upAxis: isObj ? 'z' : 'y' },
        materials: {},
        zones: [],
      };
      await showModel(bytes, modelFile.name, doc, 'user');
      notify('info', `Opened ${modelFile.name}. Check the up axis and units under Model, assign surfaces, draw a zone, then run.`);
    }
  } catch (e) {
    notify('error', errorText(e));
  } finally {
    useViewer.getState().set({ busy: '' });
  }
}

/** Re-imports the current model after an up-axis or units change. */
export async function reimportModel(doc: ProjectDoc): Promise<void> {
  const s = useViewer.getState();
  if (!heavy.modelBytes) return;
  try {
    await showModel(heavy.modelBytes, s.modelFileName, doc, s.modelSource);
  } catch (e) {
    notify('error', errorText(e));
  }
}

export function defaultDoc(): ProjectDoc {
  const year = new Date().getFullYear();
  return {
    sunfacet: 1,
    name: 'Untitled project',
    site: { latitudeDeg: 48, longitudeDeg: 11, elevationM: 0, timeZone: '+02:00', northDeg: 0 },
    model: { file: 'model.glb' },
    materials: {},
    defaultMaterial: 'concrete-light',
    ground: { material: 'stone-paving', z: 0 },
    zones: [],
    period: { start: `${year}-07-21T00:00:00+02:00`, end: `${year}-07-21T23:00:00+02:00`, stepMinutes: 60 },
    weather: { source: 'clear-sky', airTempC: { min: 18, max: 30 }, relativeHumidityPct: 50, windMs: 2 },
  };
}

/** The document to run, after the checks a run needs (a model, a valid project); cancels a running audit. */
function runnableDoc(): { s: ReturnType<typeof useViewer.getState>; doc: NonNullable<ReturnType<typeof useViewer.getState>['doc']> } | null {
  const s = useViewer.getState();
  const doc = s.doc;
  if (!doc || !heavy.modelBytes) {
    notify('error', 'Open a model first.');
    return null;
  }
  const check = checkDoc(doc);
  if (!check.ok) {
    notify('error', check.message);
    return null;
  }
  cancelRun();
  return { s, doc };
}

export function startRun(): void {
  const ready = runnableDoc();
  if (!ready) return;
  const { s, doc } = ready;
  const now = Date.now();
  s.set({ run: { ...initialRun, status: 'running', stage: 'starting', startedMs: now, stageStartedMs: now, kind: 'single' } });
  // The trace workers take every core: a model just opened is put on screen first (framesShown.ts).
  const token = ++startToken;
  const version = s.modelVersion;
  void whenModelShown(version, FIRST_FRAME_WAIT_MS).then(() => {
    const st = useViewer.getState();
    if (token !== startToken || st.run.status !== 'running' || st.run.kind !== 'single' || st.modelVersion !== version || current) return;
    beginRun(doc);
  });
}

/** Increased by every start (and cancel), so a start that waited for the first frame knows it is still wanted. */
let startToken = 0;

function beginRun(doc: ProjectDoc): void {
  const handle = client.run(job(doc), (p) => {
    const r = useViewer.getState().run;
    if (r.status !== 'running' || current !== handle) return;
    const changed = p.stage !== r.stage;
    useViewer.getState().set({
      run: {
        ...r,
        stage: p.stage,
        done: p.done,
        total: p.total,
        stageStartedMs: changed ? Date.now() : r.stageStartedMs,
        stagesDone: changed && r.stage !== 'starting' ? [...r.stagesDone, r.stage] : r.stagesDone,
      },
    });
  });
  current = handle;
  const docAtStart = doc;
  handle.promise.then(
    (out) => {
      if (current !== handle) return;
      current = null;
      heavy.results = out.results;
      heavy.patches = out.patches;
      heavy.designs = null;
      heavy.pair = null;
      const st = useViewer.getState();
      const n = out.results.times.length;
      st.set({
        resultsVersion: st.resultsVersion + 1,
        resultsStale: st.doc !== docAtStart,
        viewMode: 'results',
        timeIndex: Math.min(Math.max(0, st.timeIndex), n - 1),
        picked: null,
        run: { ...st.run, status: 'done', stagesDone: [...st.run.stagesDone, st.run.stage], elapsedS: (Date.now() - st.run.startedMs) / 1000, reused: out.reused, traceWorkers: out.traceWorkers },
        designsVersion: 0,
        pairVersion: 0,
        activeDesign: '',
        zoneExtra: st.zoneExtra === 'mrtChange' ? 'none' : st.zoneExtra,
      });
      if (out.results.warnings.length > 0) notify('info', `The audit finished with ${out.results.warnings.length} note(s): ${out.results.warnings[0]}`);
    },
    (e: unknown) => {
      if (current !== handle) return;
      current = null;
      const st = useViewer.getState();
      const aborted = e instanceof Error && (e.name === 'AbortError' || /cancel/i.test(e.message));
      st.set({ run: { ...st.run, status: aborted ? 'cancelled' : 'failed', message: aborted ? 'Cancelled.' : errorText(e) } });
      if (!aborted) notify('error', `The audit failed: ${errorText(e)}`);
    },
  );
}

/**
 * Audits the baseline and every option (the worker's runDesigns); afterwards the baseline is shown
 * and the first option is compared with it.
 */
export function startDesignsRun(): void {
  const ready = runnableDoc();
  if (!ready) return;
  const { s, doc } = ready;
  const now = Date.now();
  const names = designNames(doc);
  s.set({ run: { ...initialRun, status: 'running', stage: 'starting', startedMs: now, stageStartedMs: now, kind: 'designs', design: 0, designs: names.length } });
  const handle = client.runDesigns(job(doc), (p) => {
    const r = useViewer.getState().run;
    if (r.status !== 'running' || current !== handle) return;
    const changed = p.stage !== r.stage;
    useViewer.getState().set({
      run: { ...r, stage: p.stage, done: p.done, total: p.total, design: p.design, designs: p.designs, stageStartedMs: changed ? Date.now() : r.stageStartedMs },
    });
  });
  current = handle;
  const docAtStart = doc;
  handle.promise.then(
    (out) => {
      if (current !== handle) return;
      current = null;
      heavy.designs = { runs: out.designs, comparison: out.comparison, baselineName: out.baselineName };
      heavy.pair = null;
      const base = out.designs.find((d) => d.name === out.baselineName) ?? out.designs[0]!;
      heavy.results = base.results;
      heavy.patches = base.patches;
      const st = useViewer.getState();
      const n = base.results.times.length;
      const option = out.designs.find((d) => d.name !== out.baselineName)?.name ?? '';
      st.set({
        resultsVersion: st.resultsVersion + 1,
        designsVersion: st.designsVersion + 1,
        resultsStale: st.doc !== docAtStart,
        viewMode: 'results',
        activeDesign: base.name,
        compareOption: option,
        compareReference: out.baselineName,
        pairVersion: 0,
        timeIndex: Math.min(Math.max(0, st.timeIndex), n - 1),
        picked: null,
        selectedDevice: null,
        run: { ...st.run, status: 'done', design: out.designs.length, elapsedS: (Date.now() - st.run.startedMs) / 1000, reused: 'none', traceWorkers: 0 },
      });
      if (option) void comparePair(option, out.baselineName);
    },
    (e: unknown) => {
      if (current !== handle) return;
      current = null;
      const st = useViewer.getState();
      const aborted = e instanceof Error && (e.name === 'AbortError' || /cancel/i.test(e.message));
      st.set({ run: { ...st.run, status: aborted ? 'cancelled' : 'failed', message: aborted ? 'Cancelled.' : errorText(e) } });
      if (!aborted) notify('error', `The designs could not be run: ${errorText(e)}`);
    },
  );
}

/** Shows one design's results (after "run all designs") and draws its devices. */
export function showDesign(name: string): void {
  const s = useViewer.getState();
  const run = heavy.designs?.runs.find((d) => d.name === name);
  if (run) {
    heavy.results = run.results;
    heavy.patches = run.patches;
    s.set({ activeDesign: name, resultsVersion: s.resultsVersion + 1, picked: null, selectedDevice: null, zoneExtra: s.zoneExtra === 'mrtChange' ? 'none' : s.zoneExtra });
  } else s.set({ activeDesign: name, selectedDevice: null });
}

/**
 * Compares `option` against `reference` and shows the difference map: the zone tiles sit on the
 * reference's sensors (the comparison is per reference sensor), the option's devices are drawn.
 */
export async function comparePair(option: string, reference: string): Promise<void> {
  const s = useViewer.getState();
  const ref = heavy.designs?.runs.find((d) => d.name === reference);
  if (!ref || !heavy.designs?.runs.some((d) => d.name === option)) {
    notify('error', 'Run all designs first.');
    return;
  }
  s.set({ compareOption: option, compareReference: reference });
  if (option === reference) {
    notify('info', 'Pick two different designs to see a difference.');
    return;
  }
  try {
    const pair = await client.compareDesignPair(option, reference);
    const st = useViewer.getState();
    if (st.compareOption !== option || st.compareReference !== reference) return;
    heavy.pair = pair;
    heavy.results = ref.results;
    heavy.patches = ref.patches;
    st.set({ pairVersion: st.pairVersion + 1, resultsVersion: st.resultsVersion + 1, activeDesign: reference, zoneExtra: 'mrtChange', viewMode: 'results', picked: null });
  } catch (e) {
    notify('error', errorText(e));
  }
}

export function cancelRun(): void {
  startToken++;
  if (!current) {
    // A run still waiting for its model's first frame (startRun) is dropped.
    const st = useViewer.getState();
    if (st.run.status === 'running' && st.run.stage === 'starting' && st.run.kind === 'single') st.set({ run: { ...st.run, status: 'cancelled', message: 'Cancelled.' } });
    return;
  }
  const h = current;
  current = null;
  h.cancel();
  const st = useViewer.getState();
  if (st.run.status === 'running') st.set({ run: { ...st.run, status: 'cancelled', message: 'Cancelled.' } });
}

let sunTimer: ReturnType<typeof setTimeout> | null = null;

/** Recomputes the period's sun positions (debounced) so the slider moves the sun before a run. */
export function refreshSunPath(): void {
  if (sunTimer) clearTimeout(sunTimer);
  sunTimer = setTimeout(() => {
    const doc = useViewer.getState().doc;
    if (!doc || !checkDoc(doc).ok) return;
    client.sunPath(job(doc)).then(
      (sp) => {
        heavy.sunPath = sp;
        const st = useViewer.getState();
        st.set({ sunPathVersion: st.sunPathVersion + 1, timeIndex: Math.min(st.timeIndex, Math.max(0, sp.times.length - 1)) });
      },
      (e: unknown) => {
        // The document's own check shows most messages; a weather file is read only here.
        if (doc.weather.source === 'file') notify('error', errorText(e));
      },
    );
  }, 250);
}

let saveTimer: ReturnType<typeof setTimeout> | null = null;

/** Autosave whenever the document or model changes (debounced). */
export function watchAutosave(): () => void {
  return useViewer.subscribe((s, prev) => {
    if (s.doc === prev.doc && s.modelVersion === prev.modelVersion) return;
    if (s.doc !== prev.doc && s.modelVersion === prev.modelVersion) refreshSunPath();
    if (saveTimer) clearTimeout(saveTimer);
    saveTimer = setTimeout(() => {
      const st = useViewer.getState();
      if (!st.doc) return;
      const state = makeSavedState(
        st.doc,
        st.modelSource === 'demo' ? { demo: true } : { demo: false, fileName: st.modelFileName, bytes: heavy.modelBytes },
        new Date(),
        st.doc.weather.source === 'file' && heavy.weatherFile?.name === st.doc.weather.file ? heavy.weatherFile : null,
      );
      if (!writeAutosave(localStorage, state)) notify('info', 'The browser refused to keep an autosave (storage full?). Use Save project.');
    }, 300);
  });
}

function download(data: string | Uint8Array, fileName: string, type: string): void {
  const url = URL.createObjectURL(new Blob([data as BlobPart], { type }));
  const a = document.createElement('a');
  a.href = url;
  a.download = fileName;
  document.body.appendChild(a);
  a.click();
  a.remove();
  setTimeout(() => URL.revokeObjectURL(url), 1000);
}

function slug(name: string | undefined): string {
  return (name ?? 'project').toLowerCase().replace(/[^a-z0-9]+/g, '-').replace(/^-|-$/g, '').slice(0, 40) || 'project';
}

export function saveProject(): void {
  const doc = useViewer.getState().doc;
  if (!doc) return;
  download(JSON.stringify(doc, null, 2) + '\n', `${slug(doc.name)}.json`, 'application/json');
}

export async function exportResults(): Promise<void> {
  if (!heavy.results) {
    notify('error', 'No results yet: run the audit first.');
    return;
  }
  const s = useViewer.getState();
  try {
    // The worker holds the full Results and writes the JSON; the page only saves the bytes.
    const bytes = await client.exportResults(heavy.designs && s.activeDesign ? s.activeDesign : undefined);
    download(bytes, 'results.json', 'application/json');
  } catch (e) {
    notify('error', `The results could not be exported: ${errorText(e)}`);
  }
}
