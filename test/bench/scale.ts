/**
 * `npm run bench -- scale [--triangles N] [--workers W] [--keep]`: a large model end to end
 * (issue 9, "Scale"). Generates an invented ~2 M-triangle scene — a 4 × 4 grid of 12 × 12 × 18 m
 * blocks whose walls and roofs are finely tessellated (shared-vertex grids), so the triangle count
 * is large while the surface area, and so the number of ~1 m² patches, stays moderate — writes it
 * as a GLB (z up) with a design-day project (24 steps, one small zone) to a temp folder, and runs
 *
 *   1. import + BVH build alone (a child process), and
 *   2. the full design-day audit through the CLI (`sunfacet audit --workers W`),
 *
 * each under `/usr/bin/time -v`, reporting wall time and peak RSS (limit: 4 GB). One JSON line per
 * step on stdout: {"bench":"scale","step":"import+bvh"|"audit","triangles":n,"wallS":x,"peakRssMB":x,...}.
 */
import { spawnSync } from 'node:child_process';
import { mkdtempSync, readFileSync, rmSync, writeFileSync, existsSync } from 'node:fs';
import { tmpdir } from 'node:os';
import path from 'node:path';
import { fileURLToPath } from 'node:url';

const root = fileURLToPath(new URL('../../', import.meta.url));
const PEAK_RSS_LIMIT_MB = 4096;

function arg(args: string[], name: string): string | undefined {
  const i = args.indexOf(name);
  return i >= 0 ? args[i + 1] : undefined;
}

/** The tessellated blocks: indexed float32 positions (z up) and uint32 indices. */
export function tessellatedBlocks(targetTriangles: number): { positions: Float32Array; indices: Uint32Array } {
  const W = 12, H = 18, PITCH = 20, N = 4;
  const areaPerBlock = 4 * W * H + W * W;
  const side = Math.sqrt((2 * N * N * areaPerBlock) / targetTriangles); // quad side [m]
  const faces: { o: number[]; u: number[]; v: number[]; nu: number; nv: number }[] = [];
  for (let j = 0; j < N; j++) {
    for (let i = 0; i < N; i++) {
      const x0 = i * PITCH, y0 = j * PITCH, x1 = x0 + W, y1 = y0 + W;
      const q = (o: number[], u: number[], v: number[]) => {
        const lu = Math.hypot(u[0]!, u[1]!, u[2]!), lv = Math.hypot(v[0]!, v[1]!, v[2]!);
        faces.push({ o, u, v, nu: Math.max(1, Math.round(lu / side)), nv: Math.max(1, Math.round(lv / side)) });
      };
      // Outward, counter-clockwise (u × v = outward normal).
      q([x0, y0, 0], [W, 0, 0], [0, 0, H]); // south
      q([x1, y1, 0], [-W, 0, 0], [0, 0, H]); // north
      q([x1, y0, 0], [0, W, 0], [0, 0, H]); // east
      q([x0, y1, 0], [0, -W, 0], [0, 0, H]); // west
      q([x0, y0, H], [W, 0, 0], [0, W, 0]); // roof
    }
  }
  let nv = 0, nt = 0;
  for (const f of faces) {
    nv += (f.nu + 1) * (f.nv + 1);
    nt += 2 * f.nu * f.nv;
  }
  const positions = new Float32Array(nv * 3);
  const indices = new Uint32Array(nt * 3);
  let v = 0, t = 0;
  for (const f of faces) {
    const base = v;
    for (let b = 0; b <= f.nv; b++) {
      for (let a = 0; a <= f.nu; a++) {
        const s = a / f.nu, r = b / f.nv;
        positions[3 * v] = f.o[0]! + s * f.u[0]! + r * f.v[0]!;
        positions[3 * v + 1] = f.o[1]! + s * f.u[1]! + r * f.v[1]!;
        positions[3 * v + 2] = f.o[2]! + s * f.u[2]! + r * f.v[2]!;
        v++;
      }
    }
    const row = f.nu + 1;
    for (let b = 0; b < f.nv; b++) {
      for (let a = 0; a < f.nu; a++) {
        const p00 = base + b * row + a, p10 = p00 + 1, p01 = p00 + row, p11 = p01 + 1;
        indices.set([p00, p10, p11, p00, p11, p01], 6 * t / 2);
        t += 2;
      }
    }
  }
  return { positions, indices };
}

/** A one-mesh GLB of the scene (float32 VEC3 positions, uint32 indices). */
export function writeGlb(positions: Float32Array, indices: Uint32Array): Uint8Array {
  let min = [Infinity, Infinity, Infinity], max = [-Infinity, -Infinity, -Infinity];
  for (let i = 0; i < positions.length; i++) {
    min[i % 3] = Math.min(min[i % 3]!, positions[i]!);
    max[i % 3] = Math.max(max[i % 3]!, positions[i]!);
  }
  const pb = positions.byteLength, ib = indices.byteLength;
  const json = JSON.stringify({
    asset: { version: '2.0', generator: 'sunfacet scale bench (invented scene)' },
    scene: 0,
    scenes: [{ nodes: [0] }],
    nodes: [{ name: 'blocks', mesh: 0 }],
    meshes: [{ name: 'blocks', primitives: [{ attributes: { POSITION: 0 }, indices: 1, mode: 4 }] }],
    accessors: [
      { bufferView: 0, componentType: 5126, count: positions.length / 3, type: 'VEC3', min, max },
      { bufferView: 1, componentType: 5125, count: indices.length, type: 'SCALAR' },
    ],
    bufferViews: [{ buffer: 0, byteOffset: 0, byteLength: pb }, { buffer: 0, byteOffset: pb, byteLength: ib }],
    buffers: [{ byteLength: pb + ib }],
  });
  const jb = new TextEncoder().encode(json);
  const jl = (jb.length + 3) & ~3, bl = pb + ib;
  const total = 12 + 8 + jl + 8 + bl;
  const out = new Uint8Array(total);
  const dv = new DataView(out.buffer);
  dv.setUint32(0, 0x46546c67, true); dv.setUint32(4, 2, true); dv.setUint32(8, total, true);
  dv.setUint32(12, jl, true); dv.setUint32(16, 0x4e4f534a, true);
  out.set(jb, 20); out.fill(0x20, 20 + jb.length, 20 + jl);
  dv.setUint32(20 + jl, bl, true); dv.setUint32(24 + jl, 0x004e4942, true);
  out.set(new Uint8Array(positions.buffer, positions.byteOffset, pb), 28 + jl);
  out.set(new Uint8Array(indices.buffer, indices.byteOffset, ib), 28 + jl + pb);
  return out;
}

function project(): unknown {
  return {
    sunfacet: 1,
    name: 'scale bench: tessellated blocks (invented)',
    site: { latitudeDeg: 45, longitudeDeg: 8, elevationM: 250, timeZone: '+02:00', northDeg: 0 },
    model: { file: 'blocks.glb', upAxis: 'z' },
    defaultMaterial: 'concrete-light',
    ground: { material: 'stone-paving', z: 0 },
    zones: [{ name: 'lane', polygon: [[13, 2], [19, 2], [19, 10], [13, 10]], spacingM: 2, sensorHeightM: 1.1, posture: 'standing' }],
    period: { start: '2026-07-21T00:00:00+02:00', end: '2026-07-21T23:00:00+02:00', stepMinutes: 60 },
    weather: { source: 'clear-sky', airTempC: { min: 19, max: 31 }, relativeHumidityPct: 45, windMs: 2 },
    sampling: { seed: 1, skyRaysPerPatch: 1, viewRays: 16 },
  };
}

/** Parses GNU time -v output. */
function parseTime(stderr: string): { wallS: number; peakRssMB: number } {
  const rss = /Maximum resident set size \(kbytes\): (\d+)/.exec(stderr);
  const wall = /Elapsed \(wall clock\) time \(h:mm:ss or m:ss\): (?:(\d+):)?(\d+):([\d.]+)/.exec(stderr);
  const wallS = wall ? Number(wall[1] ?? 0) * 3600 + Number(wall[2]) * 60 + Number(wall[3]) : NaN;
  return { wallS, peakRssMB: rss ? Math.round(Number(rss[1]) / 1024) : NaN };
}

function timed(cmd: string[], cwd: string): { wallS: number; peakRssMB: number; status: number | null; stdout: string; stderr: string } {
  const r = spawnSync('/usr/bin/time', ['-v', ...cmd], { cwd, encoding: 'utf8', maxBuffer: 64 * 1024 * 1024 });
  return { ...parseTime(r.stderr), status: r.status, stdout: r.stdout, stderr: r.stderr };
}

/** Child mode: import + BVH of the GLB, timings as JSON on stdout. */
async function importAndBuild(file: string): Promise<void> {
  const { importModel } = await import('../../src/geometry/import/index.ts');
  const { buildBvh } = await import('../../src/trace/bvh/build.ts');
  const { checkModelSize } = await import('../../src/audit/pathologies.ts');
  const t0 = performance.now();
  const scene = await importModel(new Uint8Array(readFileSync(file)), path.basename(file), { upAxis: 'z' });
  const t1 = performance.now();
  checkModelSize(scene);
  const bvh = buildBvh(scene.positions, scene.indices, { shared: true });
  const t2 = performance.now();
  process.stdout.write(JSON.stringify({ triangles: scene.indices.length / 3, importS: (t1 - t0) / 1000, bvhS: (t2 - t1) / 1000, bvhNodes: bvh.nodeCount }) + '\n');
}

export async function run(args: string[]): Promise<void> {
  if (args[0] === '--child-import') return importAndBuild(args[1]!);
  if (!existsSync('/usr/bin/time')) throw new Error('scale bench needs GNU time at /usr/bin/time (apt-get install -y time)');
  const target = Number(arg(args, '--triangles') ?? 2_000_000);
  const workers = Number(arg(args, '--workers') ?? 2);
  const dir = mkdtempSync(path.join(tmpdir(), 'sunfacet-scale-'));
  try {
    const tg = performance.now();
    const { positions, indices } = tessellatedBlocks(target);
    const glb = writeGlb(positions, indices);
    writeFileSync(path.join(dir, 'blocks.glb'), glb);
    writeFileSync(path.join(dir, 'project.json'), JSON.stringify(project(), null, 2));
    const triangles = indices.length / 3;
    process.stderr.write(`[bench scale] ${triangles} triangles, ${(glb.length / 1e6).toFixed(0)} MB GLB in ${dir} (${((performance.now() - tg) / 1000).toFixed(1)} s)\n`);

    const tsxImport = ['--import', 'tsx'];
    const a = timed([process.execPath, ...tsxImport, path.join(root, 'test/bench/scale.ts'), '--child-import', path.join(dir, 'blocks.glb')], root);
    if (a.status !== 0) throw new Error(`import + BVH child failed:\n${a.stderr.slice(-3000)}`);
    const ia = JSON.parse(a.stdout.trim().split('\n').pop()!) as Record<string, number>;
    process.stdout.write(JSON.stringify({ bench: 'scale', step: 'import+bvh', triangles, ...ia, wallS: a.wallS, peakRssMB: a.peakRssMB, underLimit: a.peakRssMB < PEAK_RSS_LIMIT_MB }) + '\n');

    const out = path.join(dir, 'out');
    const b = timed([process.execPath, path.join(root, 'src/cli/sunfacet.mjs'), 'audit', path.join(dir, 'project.json'), '--out', out, '--workers', String(workers)], root);
    if (b.status !== 0) throw new Error(`audit failed (exit ${b.status}):\n${b.stderr.slice(-3000)}`);
    const results = JSON.parse(readFileSync(path.join(out, 'results.json'), 'utf8')) as { run: Record<string, unknown>; times: unknown[] };
    const runRec = existsSync(path.join(out, 'run.json')) ? (JSON.parse(readFileSync(path.join(out, 'run.json'), 'utf8')) as { timingsMs?: Record<string, number> }) : {};
    process.stdout.write(JSON.stringify({
      bench: 'scale', step: 'audit', workers, triangles: results.run.triangles, patches: results.run.patches, sensors: results.run.sensors,
      steps: results.times.length, wallS: b.wallS, peakRssMB: b.peakRssMB, underLimit: b.peakRssMB < PEAK_RSS_LIMIT_MB, timingsMs: runRec.timingsMs ?? null,
    }) + '\n');
  } finally {
    if (!args.includes('--keep')) rmSync(dir, { recursive: true, force: true });
  }
}

// Started directly as the import child (`node --import tsx test/bench/scale.ts --child-import f`).
if (process.argv[1] !== undefined && path.resolve(process.argv[1]) === fileURLToPath(import.meta.url)) {
  await run(process.argv.slice(2));
}
