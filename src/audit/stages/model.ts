/**
 * Stage 2: import the model, add the ground apron, assign materials, discretise into patches and
 * zones into sensors.
 *
 * The ground apron: where the project has a `ground`, the plane under and around the model (the
 * model's footprint plus a margin) is added as 1 m ground cells, so the floor of a terrace has its
 * own shading-resolved surface temperature; cells under buildings (inside solids) are left out.
 * Beyond the apron the tracer treats the plane analytically as "far ground": unshaded, with its own
 * energy balance.
 */
import type { LoadedProject } from '../load.ts';
import { readOrExplain } from '../load.ts';
import type { MaterialAssignment, ZoneSpec } from '../project.ts';
import { importModel } from '../../geometry/import/index.ts';
import type { SceneArrays } from '../../geometry/sceneArrays.ts';
import { buildPatches, type Patches } from '../../geometry/patches.ts';
import { sensorGridForPolygon, sensorGridOnSurface } from '../../geometry/zones.ts';
import { buildBvh, type BvhData } from '../../trace/bvh/build.ts';
import { canShareMemory } from '../../trace/pool/shareBuffers.ts';
import { intersectClosest, makeClosestHit } from '../../trace/bvh/query.ts';
import { resolveMaterial, materialPresetIds, type Material } from '../../physics/materials.ts';
import { buildDevices, type DeviceBuild } from '../../geometry/devices.ts';
import type { CrownSet } from '../../geometry/generators/tree.ts';

const PRESET_IDS = new Set(materialPresetIds());
import { InputError } from '../../physics/errors.ts';
import { checkModelSize, findPathologies, fixFlippedNormals, DEFAULT_TRIANGLE_LIMIT } from '../pathologies.ts';

export const GROUND_SURFACE_NAME = 'ground';
/** Ground cells farther than NEAR_ZONE_MARGIN_M from every zone: coarser patches (they matter little to a seat). */
export const GROUND_OUTER_SURFACE_NAME = 'ground-outer';
export const NEAR_ZONE_MARGIN_M = 6;
export const GROUND_OUTER_PATCH_M2 = 4;
/** Margin of the ground apron around the model's footprint [m] (at least this, or half the model's height). */
export const APRON_MIN_MARGIN_M = 8;
export const APRON_CELL_M = 1;
export const MAX_APRON_CELLS = 400_000;

export interface SensorSet {
  zone: ZoneSpec;
  positions: Float64Array;
  dropped: number;
}

export interface PreparedModel {
  patches: Patches;
  /** The scene the tracer sees (patches.scene). */
  scene: SceneArrays;
  bvh: BvhData;
  /** Distinct resolved materials; `patchMaterial[i]` indexes this list. */
  materials: Material[];
  /** The project key each material came from, for results ("steel-dark-painted", or "custom"). */
  materialLabels: string[];
  patchMaterial: Uint16Array;
  /** Far ground beyond the apron (or everything below the horizon with no ground): material index. */
  groundMaterial: number;
  groundZ: number;
  hasGroundPlane: boolean;
  sensors: SensorSet[];
  /**
   * Present when devices have fabric sheets or trees: what the sun's beam passes through
   * (per BVH triangle, original index) and the tree crowns.
   */
  transmission: { triangleTransmittance: Float32Array; skipSemiTransparent: Uint8Array; skipOpaque: Uint8Array; crowns: CrownSet } | undefined;
  /** Bytes of the model file, for its hash in the run record. */
  modelBytes: Uint8Array;
  warnings: string[];
}

export async function prepareModel(loaded: LoadedProject): Promise<PreparedModel> {
  const { project, projectFile } = loaded;
  const warnings: string[] = [];
  const bytes = await readOrExplain(loaded.readRelative, project.model.file, projectFile, 'model.file');
  const dir = project.model.file.includes('/') ? project.model.file.slice(0, project.model.file.lastIndexOf('/') + 1) : '';
  const imported = await importModel(bytes, project.model.file, {
    upAxis: project.model.upAxis,
    unitsPerMeter: project.model.unitsPerMeter,
    northDeg: project.site.northDeg,
    readExternal: (uri) => readOrExplain(loaded.readRelative, dir + uri, projectFile, `model.file (${uri})`),
  });
  warnings.push(...imported.warnings);
  if (imported.indices.length === 0) {
    throw new InputError({ file: project.model.file, problem: 'the model has no triangles', expected: 'a model with at least one surface' });
  }
  checkModelSize(imported, loaded.triangleLimit ?? DEFAULT_TRIANGLE_LIMIT, project.model.file, 'simplify the model, or raise the limit (sunfacet audit --max-triangles N)');
  let scene: SceneArrays = imported;
  const groundZ = project.ground?.z ?? 0;
  // Geometry pathologies (open or non-manifold edges, duplicated faces, flipped normals, zones off
  // the model) are reported; flipped triangles are turned back so their normals point outside.
  const modelBvh = buildBvh(imported.positions, imported.indices);
  const patho = findPathologies(imported, { zones: project.zones, bvh: modelBvh, ...(project.ground ? { groundZ } : {}) });
  warnings.push(...patho.warnings);
  if (patho.flippedTriangles.length > 0) scene = fixFlippedNormals(imported, patho.flippedTriangles);
  // Shading devices and trees: generated triangles (fins, slats, canopies, umbrellas, trunks) join
  // the scene as surfaces of their own; fabric sheets and crowns only attenuate the beam.
  let devices: DeviceBuild | undefined;
  if (project.devices.length > 0) {
    const before = scene.warnings.length;
    devices = buildDevices(project.devices, scene);
    scene = devices.scene;
    warnings.push(...scene.warnings.slice(before));
  }
  if (project.ground) {
    const near = project.zones.filter((z) => z.polygon).map((z) => {
      const xs = z.polygon!.map((p) => p[0]), ys = z.polygon!.map((p) => p[1]);
      return [Math.min(...xs) - NEAR_ZONE_MARGIN_M, Math.min(...ys) - NEAR_ZONE_MARGIN_M, Math.max(...xs) + NEAR_ZONE_MARGIN_M, Math.max(...ys) + NEAR_ZONE_MARGIN_M] as const;
    });
    // The apron's extent comes from the imported model alone, so adding a device (an option) never
    // moves the ground cells — the baseline's geometry can then be reused for the rest.
    scene = withGroundApron(scene, modelBvh, groundZ, warnings, near, imported.positions);
  } else {
    warnings.push('no "ground" in the project: rays that leave the model below the horizon see a far ground of stone paving at its own temperature');
  }

  // Materials: node (surface) name first, then the model's material name, then defaultMaterial.
  const resolved = new Map<string, number>();
  const materials: Material[] = [];
  const materialLabels: string[] = [];
  const resolveKey = (key: string, spec: MaterialAssignment, place: string): number => {
    const hit = resolved.get(key);
    if (hit !== undefined) return hit;
    const m = resolveMaterial(spec, place, projectFile);
    materials.push(m);
    materialLabels.push(typeof spec === 'string' ? spec : m.id);
    resolved.set(key, materials.length - 1);
    return materials.length - 1;
  };
  const groundSpec = project.ground?.material ?? 'stone-paving';
  const groundMaterial = resolveKey('ground', groundSpec, 'ground.material');
  const defaultIdx = resolveKey('default', project.defaultMaterial, 'defaultMaterial');
  const usedKeys = new Set<string>();
  const surfaceMaterial = scene.surfaceNames.map((name) => {
    if ((name === GROUND_SURFACE_NAME || name === GROUND_OUTER_SURFACE_NAME) && project.ground) return groundMaterial;
    if (project.materials[name] !== undefined) {
      usedKeys.add(name);
      return resolveKey('m:' + name, project.materials[name]!, `materials[${JSON.stringify(name)}]`);
    }
    return -1;
  });
  const triMaterial = new Uint16Array(scene.indices.length / 3);
  for (let t = 0; t < triMaterial.length; t++) {
    const bySurface = surfaceMaterial[scene.surfaceIds[t]!]!;
    if (bySurface >= 0) {
      triMaterial[t] = bySurface;
      continue;
    }
    const matName = scene.materialNames[scene.materialIds[t]!] ?? '';
    if (matName !== '' && project.materials[matName] !== undefined) {
      usedKeys.add(matName);
      triMaterial[t] = resolveKey('m:' + matName, project.materials[matName]!, `materials[${JSON.stringify(matName)}]`);
    } else if (matName !== '' && PRESET_IDS.has(matName)) {
      // A material named like a preset (devices name theirs so) takes that preset.
      triMaterial[t] = resolveKey('p:' + matName, matName, `material "${matName}"`);
    } else triMaterial[t] = defaultIdx;
  }
  for (const key of Object.keys(project.materials)) {
    if (!usedKeys.has(key)) warnings.push(`materials["${key}"] matches no surface or material name in ${project.model.file}`);
  }
  // Patches carry material ids per triangle: give the scene our resolved ids.
  const sceneForPatches: SceneArrays = { ...scene, materialIds: Uint32Array.from(triMaterial), materialNames: materialLabels.slice() };
  const outer = scene.surfaceNames.indexOf(GROUND_OUTER_SURFACE_NAME);
  const patches = buildPatches(sceneForPatches, { targetAreaM2: 1, ...(outer >= 0 && project.ground ? { targetAreaBySurface: new Map([[outer, GROUND_OUTER_PATCH_M2]]) } : {}) });
  const patchMaterial = Uint16Array.from(patches.materialIds);
  const bvh = buildBvh(patches.scene.positions, patches.scene.indices, { shared: canShareMemory() });
  let transmission: PreparedModel['transmission'];
  if (devices && (devices.hasSemiTransparent || devices.crowns.count > 0)) {
    const nt = patches.scene.indices.length / 3;
    const triangleTransmittance = new Float32Array(nt);
    const skipSemiTransparent = new Uint8Array(nt), skipOpaque = new Uint8Array(nt);
    for (let t = 0; t < nt; t++) {
      const tau = devices.surfaceTransmittance[patches.scene.surfaceIds[t]!] ?? 0;
      triangleTransmittance[t] = tau;
      if (tau > 0) skipSemiTransparent[t] = 1;
      else skipOpaque[t] = 1;
    }
    transmission = { triangleTransmittance, skipSemiTransparent, skipOpaque, crowns: devices.crowns };
  }

  const insideSolid = (x: number, y: number, z: number) => insideByRayParity(bvh, x, y, z);
  const sensors: SensorSet[] = project.zones.map((zone, i) => {
    const grid = zone.polygon
      ? sensorGridForPolygon({ name: zone.name, polygon: zone.polygon, floorZ: zone.floorZ, sensorHeightM: zone.sensorHeightM, spacingM: zone.spacingM }, { isInsideSolid: insideSolid, place: `zones[${i}]`, file: projectFile })
      : sensorGridOnSurface(patches.scene, { name: zone.name, surfaceName: zone.mesh!, sensorHeightM: zone.sensorHeightM, spacingM: zone.spacingM }, { isInsideSolid: insideSolid, place: `zones[${i}]`, file: projectFile });
    if (grid.droppedInsideSolid > 0) warnings.push(`zone "${zone.name}": ${grid.droppedInsideSolid} sensors inside solid geometry dropped`);
    if (grid.count === 0) {
      throw new InputError({ file: projectFile, place: `zones[${i}]`, problem: `zone "${zone.name}" has no sensors outside solid geometry`, expected: 'a polygon over open floor or roof' });
    }
    return { zone, positions: grid.positions, dropped: grid.droppedInsideSolid };
  });
  return {
    patches, scene: patches.scene, bvh, materials, materialLabels, patchMaterial, groundMaterial, groundZ,
    hasGroundPlane: project.ground !== undefined, sensors, transmission, modelBytes: bytes, warnings,
  };
}

const _hit = makeClosestHit();
/** Directions for the parity vote: up, and two oblique ones (not axis-aligned, to avoid edge hits). */
const PARITY_DIRS = [
  [0.0123, 0.0231, 0.9997],
  [0.8017, 0.5962, 0.0421],
  [-0.5731, 0.8123, -0.1087],
];

/**
 * True when a point is inside a closed solid: the majority of three rays cross the surfaces an odd
 * number of times (Jordan curve theorem in 3-D; the vote tolerates one ray grazing an edge). A ray
 * that goes down and meets no triangle is counted as leaving through the ground (models without
 * bottom faces stand on the ground).
 */
export function insideByRayParity(bvh: BvhData, x: number, y: number, z: number): boolean {
  let votes = 0;
  for (const d of PARITY_DIRS) {
    let crossings = 0;
    let t0 = 0;
    for (let guard = 0; guard < 10000; guard++) {
      if (!intersectClosest(bvh, x, y, z, d[0]!, d[1]!, d[2]!, t0, Infinity, _hit)) break;
      crossings++;
      t0 = _hit.t + 1e-5;
    }
    if (crossings % 2 === 1) votes++;
  }
  return votes >= 2;
}

/**
 * Adds 1 m ground cells under and around the model, leaving out cells inside solids. Cells near a
 * zone (inside one of `near`, boxes [x0, y0, x1, y1]) form the surface "ground", the rest
 * "ground-outer" (patched more coarsely).
 */
function withGroundApron(scene: SceneArrays, modelBvh: BvhData, groundZ: number, warnings: string[], near: readonly (readonly [number, number, number, number])[], extent: Float32Array): SceneArrays {
  const p = scene.positions;
  let x0 = Infinity, y0 = Infinity, x1 = -Infinity, y1 = -Infinity, z1 = -Infinity;
  for (let i = 0; i < extent.length; i += 3) {
    x0 = Math.min(x0, extent[i]!); x1 = Math.max(x1, extent[i]!);
    y0 = Math.min(y0, extent[i + 1]!); y1 = Math.max(y1, extent[i + 1]!);
    z1 = Math.max(z1, extent[i + 2]!);
  }
  const margin = Math.max(APRON_MIN_MARGIN_M, 0.5 * (z1 - groundZ));
  const c = APRON_CELL_M;
  const gx0 = Math.floor((x0 - margin) / c) * c, gy0 = Math.floor((y0 - margin) / c) * c;
  const nx = Math.ceil((x1 + margin - gx0) / c), ny = Math.ceil((y1 + margin - gy0) / c);
  if (nx * ny > MAX_APRON_CELLS) {
    // A district-sized model: no apron (the analytic far ground stands in everywhere) rather than
    // millions of cells.
    warnings.push(`no ground apron: the model spans ${(x1 - x0).toFixed(0)} × ${(y1 - y0).toFixed(0)} m, ${nx * ny} cells of ${c} m would exceed ${MAX_APRON_CELLS}; the ground is the unshaded far ground everywhere`);
    return scene;
  }
  const keep: number[] = [];
  for (let j = 0; j < ny; j++) {
    for (let i = 0; i < nx; i++) {
      const cx = gx0 + (i + 0.5) * c, cy = gy0 + (j + 0.5) * c;
      if (!insideByRayParity(modelBvh, cx, cy, groundZ + 0.02)) keep.push(i, j);
    }
  }
  const cells = keep.length / 2;
  const vBase = p.length / 3;
  const positions = new Float32Array(p.length + cells * 12);
  positions.set(p);
  const indices = new Uint32Array(scene.indices.length + cells * 6);
  indices.set(scene.indices);
  const surfaceIds = new Uint32Array(scene.surfaceIds.length + cells * 2);
  surfaceIds.set(scene.surfaceIds);
  const materialIds = new Uint32Array(scene.materialIds.length + cells * 2);
  materialIds.set(scene.materialIds);
  let surfaceNames = scene.surfaceNames;
  const surfaceFor = (name: string): number => {
    let id = surfaceNames.indexOf(name);
    if (id < 0) {
      surfaceNames = [...surfaceNames, name];
      id = surfaceNames.length - 1;
    } else {
      warnings.push(`the model has a surface named "${name}"; the ground apron joins it`);
    }
    return id;
  };
  const groundSurface = surfaceFor(GROUND_SURFACE_NAME);
  const outerSurface = surfaceFor(GROUND_OUTER_SURFACE_NAME);
  const materialNames = [...scene.materialNames, GROUND_SURFACE_NAME];
  const groundMat = materialNames.length - 1;
  for (let k = 0; k < cells; k++) {
    const i = keep[2 * k]!, j = keep[2 * k + 1]!;
    const ax = gx0 + i * c, ay = gy0 + j * c;
    const v = vBase + 4 * k;
    positions.set([ax, ay, groundZ, ax + c, ay, groundZ, ax + c, ay + c, groundZ, ax, ay + c, groundZ], 3 * v);
    indices.set([v, v + 1, v + 2, v, v + 2, v + 3], scene.indices.length + 6 * k);
    const cx = ax + c / 2, cy = ay + c / 2;
    const isNear = near.some((b) => cx >= b[0] && cx <= b[2] && cy >= b[1] && cy <= b[3]);
    surfaceIds[scene.surfaceIds.length + 2 * k] = isNear ? groundSurface : outerSurface;
    surfaceIds[scene.surfaceIds.length + 2 * k + 1] = isNear ? groundSurface : outerSurface;
    materialIds[scene.materialIds.length + 2 * k] = groundMat;
    materialIds[scene.materialIds.length + 2 * k + 1] = groundMat;
  }
  return { positions, indices, surfaceIds, materialIds, surfaceNames, materialNames, warnings: scene.warnings };
}
