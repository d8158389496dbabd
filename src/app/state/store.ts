/**
 * The viewer's small reactive state and its actions (zustand). Big arrays live in `heavy.ts`;
 * versions here tell components when to re-read them.
 */
import { create } from 'zustand';
import type { ProjectDoc } from './projectDoc.ts';
import type { ScaleId } from '../colour/scales.ts';
import type { SensorLayerId, SurfaceLayerId } from '../colour/layers.ts';
import type { UnitSystem } from '../colour/units.ts';
import type { UtciCategoryId } from '../../physics/utci.ts';
import type { RangeMode } from '../ui/ranges.ts';

export type Tool = 'look' | 'pickSurface' | 'drawZone' | 'editZone' | 'placeDevice';
export type ViewMode = 'model' | 'materials' | 'results';
export type RunStatus = 'idle' | 'running' | 'done' | 'failed' | 'cancelled';

export interface RunState {
  status: RunStatus;
  stage: string;
  done: number;
  total: number;
  startedMs: number;
  stageStartedMs: number;
  /** Stages finished so far, for the progress list. */
  stagesDone: string[];
  message: string;
  /** Wall time of the last finished run [s]. */
  elapsedS: number;
  /** What the finished run took over from the one before. */
  reused: 'none' | 'geometry' | 'model and geometry';
  /** Trace workers of the finished run (0 = traced inside the audit worker). */
  traceWorkers: number;
  /** What runs: the project as it stands, or every design (baseline and options). */
  kind?: 'single' | 'designs';
  /** With kind 'designs': the design being audited (0-based) and how many there are. */
  design?: number;
  designs?: number;
}

/** Zone colours beyond the per-design layers: a difference between two designs, or glare hours. */
export type ZoneExtra = 'none' | 'mrtChange' | 'glareHours';
/** The difference map: one step (the time slider's) or the mean over the daylight steps. */
export type DiffMode = 'step' | 'daylightMean';

export type Picked = { kind: 'sensor'; zone: number; sensor: number } | { kind: 'patch'; patch: number } | null;

export interface Notice {
  kind: 'error' | 'info';
  text: string;
}

export interface ViewerState {
  doc: ProjectDoc | null;
  /** 'demo' when the model comes from the demo folder. */
  modelSource: 'demo' | 'user';
  modelFileName: string;
  modelVersion: number;
  resultsVersion: number;
  /** The document changed since the results were computed. */
  resultsStale: boolean;
  sunPathVersion: number;
  notice: Notice | null;
  busy: string;
  tool: Tool;
  draftZone: [number, number, number][];
  selectedSurface: number | null;
  viewMode: ViewMode;
  surfaceLayer: SurfaceLayerId | 'none';
  sensorLayer: SensorLayerId | 'none';
  category: UtciCategoryId;
  /** Scale of the surface layer. */
  scale: ScaleId;
  /** Scale of the zone layer (a different one by default, so the two legends are not confused). */
  sensorScale: ScaleId;
  rangeMode: RangeMode;
  /** Fixed ranges in SI units, per layer id. */
  fixedRanges: Record<string, { min: number; max: number }>;
  units: UnitSystem;
  timeIndex: number;
  playing: boolean;
  picked: Picked;
  run: RunState;
  aboutOpen: boolean;
  /** The sun-path overlay, and the solstice paths with it. */
  showSunPath: boolean;
  showSolstices: boolean;
  /** With the 'editZone' tool: the zone whose corners are edited, and the corner picked (−1: none yet). */
  editCorner: { zone: number; corner: number } | null;
  /** Zone colours from the design or glare views (replaces `sensorLayer` while not 'none'). */
  zoneExtra: ZoneExtra;
  /** Bumped when every design has been run (heavy.designs). */
  designsVersion: number;
  /** The design whose results are shown and whose devices are drawn and edited ('' = the project as run). */
  activeDesign: string;
  /** The difference map: option − reference. */
  compareOption: string;
  compareReference: string;
  /** Bumped when heavy.pair holds the comparison of compareOption against compareReference. */
  pairVersion: number;
  diffMode: DiffMode;
  /** Selected device: index into the active design's own devices. */
  selectedDevice: number | null;
  /** With the 'placeDevice' tool: the type and main sizes of the device to place [m]. */
  placeDevice: { type: import('../../geometry/devices.ts').DeviceType; sizes: Record<string, number> } | null;
  /** Reflection paths at the shown step, and viewpoint markers. */
  showPaths: boolean;
  set: (patch: Partial<ViewerState>) => void;
  setDoc: (doc: ProjectDoc, opts?: { keepResults?: boolean }) => void;
}

export const initialRun: RunState = { status: 'idle', stage: '', done: 0, total: 0, startedMs: 0, stageStartedMs: 0, stagesDone: [], message: '', elapsedS: 0, reused: 'none', traceWorkers: 0 };

export const useViewer = create<ViewerState>()((set) => ({
  doc: null,
  modelSource: 'demo',
  modelFileName: '',
  modelVersion: 0,
  resultsVersion: 0,
  resultsStale: false,
  sunPathVersion: 0,
  notice: null,
  busy: '',
  tool: 'look',
  draftZone: [],
  selectedSurface: null,
  viewMode: 'model',
  surfaceLayer: 'surfaceTemp',
  sensorLayer: 'utci',
  category: 'strong-heat',
  scale: 'magma',
  sensorScale: 'viridis',
  rangeMode: 'auto',
  fixedRanges: {},
  units: 'SI',
  timeIndex: 12,
  playing: false,
  picked: null,
  run: initialRun,
  aboutOpen: false,
  showSunPath: false,
  showSolstices: true,
  editCorner: null,
  zoneExtra: 'none',
  designsVersion: 0,
  activeDesign: '',
  compareOption: '',
  compareReference: '',
  pairVersion: 0,
  diffMode: 'step',
  selectedDevice: null,
  placeDevice: null,
  showPaths: false,
  set: (patch) => set(patch),
  setDoc: (doc, opts) => set((s) => ({ doc, resultsStale: opts?.keepResults ? s.resultsStale : s.resultsVersion > 0 })),
}));
