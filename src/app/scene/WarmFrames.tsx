/**
 * Draws the view's frames, and keeps the page responsive when a frame needs shader programs it
 * has not used yet. The browser makes the page wait for the whole of a drawn frame when it copies
 * the canvas (software compositing) and when three.js first reads a new program's uniforms; a
 * software renderer also builds its drawing routines for each new program at the first draw, which
 * can take the better part of a second. So before such a frame the view compiles the programs
 * without waiting (KHR_parallel_shader_compile), lets three read them one per task, draws the scene once into a small
 * off-screen target that takes the same programs and pixel formats as the canvas, and shows the
 * frame only when a fence says the renderer has finished; meanwhile the page keeps the previous frame.
 */
import { useEffect, useRef } from 'react';
import { useFrame, useThree } from '@react-three/fiber';
import { frameShown } from './framesShown.ts';
import { useViewer } from '../state/store.ts';
import { SRGBColorSpace, WebGLRenderTarget, type Camera, type Scene, type WebGLRenderer } from 'three';

/** Side of the off-screen target [px]: only its formats matter. */
const WARM_TARGET_PX = 32;
/** Longest wait for the renderer before the frame is shown anyway [ms]. */
const WARM_TIMEOUT_MS = 5000;
/** Poll interval of the fence [ms]. */
const POLL_MS = 15;

interface Gate {
  pending: boolean;
  seen: WeakSet<object>;
  /** `shadowSignature` of the last shadow map drawn. */
  shadowKey: number;
  target: WebGLRenderTarget | null;
}

/**
 * A number that changes when anything the sun's shadow map depends on changes: the lights that
 * cast shadows (position, target, shadow camera) and the shadow casters (geometry, placement,
 * visibility). Equal numbers mean the last shadow map is still right.
 */
export function shadowSignature(scene: Scene): number {
  let h = 17;
  const mix = (x: number) => {
    h = (Math.imul(h ^ Math.round(x * 4096), 0x01000193) + 0x9e3779b9) | 0;
  };
  scene.traverseVisible((o) => {
    const light = o as unknown as { isDirectionalLight?: boolean; castShadow: boolean; target?: { matrixWorld: { elements: number[] } }; shadow?: { camera: { projectionMatrix: { elements: number[] } }; mapSize: { x: number } } };
    const mesh = o as unknown as { isMesh?: boolean; castShadow: boolean; geometry?: { id: number; attributes: { position?: { version: number } } }; count?: number };
    if (light.isDirectionalLight) {
      if (!light.castShadow) return;
      mix(o.id);
      for (const e of o.matrixWorld.elements) mix(e);
      for (const e of light.target?.matrixWorld.elements ?? []) mix(e);
      for (const e of light.shadow?.camera.projectionMatrix.elements ?? []) mix(e);
      mix(light.shadow?.mapSize.x ?? 0);
    } else if (mesh.isMesh && mesh.castShadow) {
      mix(o.id);
      mix(mesh.geometry?.id ?? -1);
      mix(mesh.geometry?.attributes.position?.version ?? -1);
      mix(mesh.count ?? 1);
      for (const e of o.matrixWorld.elements) mix(e);
    }
  });
  return h;
}

/** True when `compile` made programs the view has not drawn with yet (it only creates them, it does not wait). */
function needsNewPrograms(gl: WebGLRenderer, scene: Scene, camera: Camera, seen: WeakSet<object>): boolean {
  gl.compile(scene, camera);
  return (gl.info.programs ?? []).some((p) => !seen.has(p));
}

/** Resolves when the GPU has run every command issued so far (or after the timeout). */
function gpuFinished(gl: WebGLRenderer): Promise<void> {
  const ctx = gl.getContext();
  if (!('fenceSync' in ctx)) return new Promise((ok) => setTimeout(ok, POLL_MS));
  const sync = ctx.fenceSync(ctx.SYNC_GPU_COMMANDS_COMPLETE, 0);
  ctx.flush();
  const t0 = performance.now();
  return new Promise((ok) => {
    const poll = () => {
      if (!sync || ctx.isContextLost() || ctx.getSyncParameter(sync, ctx.SYNC_STATUS) === ctx.SIGNALED || performance.now() - t0 > WARM_TIMEOUT_MS) {
        if (sync && !ctx.isContextLost()) ctx.deleteSync(sync);
        ok();
      } else setTimeout(poll, POLL_MS);
    };
    setTimeout(poll, POLL_MS);
  });
}

/** A target that three treats like the canvas: same output colour space and tone mapping, so the same programs. */
function canvasLikeTarget(): WebGLRenderTarget {
  const t = new WebGLRenderTarget(WARM_TARGET_PX, WARM_TARGET_PX, { depthBuffer: true, stencilBuffer: true });
  t.texture.colorSpace = SRGBColorSpace;
  // three picks the on-screen programs (output colour space, tone mapping) and a linear RGBA8
  // store for targets marked like this (WebGLPrograms, WebGLTextures).
  (t as unknown as { isXRRenderTarget: boolean }).isXRRenderTarget = true;
  return t;
}

/** The parts of three's WebGLProgram used here (`info.programs` holds them). */
interface ProgramLike {
  isReady(): boolean;
  getUniforms(): unknown;
}

const nextTask = () => new Promise<void>((ok) => setTimeout(ok, 0));

/**
 * Compiles the scene's new programs without waiting for them, then, one program per task (each
 * query waits for the GPU process), waits until each is linked and lets three read its uniforms;
 * then draws once off screen and waits on a fence for the renderer.
 */
async function warm(gl: WebGLRenderer, scene: Scene, camera: Camera, gate: Gate): Promise<void> {
  const t0 = performance.now();
  const fresh = ((gl.info.programs ?? []) as unknown as ProgramLike[]).filter((p) => !gate.seen.has(p));
  for (const p of fresh) {
    // isReady polls KHR_parallel_shader_compile's completion status (true at once without it).
    while (!p.isReady() && performance.now() - t0 < WARM_TIMEOUT_MS) await new Promise((ok) => setTimeout(ok, POLL_MS));
    p.getUniforms();
    await nextTask();
  }
  gate.target ??= canvasLikeTarget();
  const previous = gl.getRenderTarget();
  gl.setRenderTarget(gate.target);
  gl.render(scene, camera);
  gl.setRenderTarget(previous);
  await gpuFinished(gl);
  for (const p of gl.info.programs ?? []) gate.seen.add(p);
}

/** Takes over R3F's drawing (a frame subscriber with priority 1) and gates frames with new programs. */
export function WarmFrames() {
  const invalidate = useThree((s) => s.invalidate);
  const gate = useRef<Gate>({ pending: false, seen: new WeakSet(), target: null, shadowKey: 0 });
  useEffect(() => {
    const g = gate.current;
    return () => {
      g.target?.dispose();
      g.target = null;
    };
  }, []);
  const gl = useThree((s) => s.gl);
  useEffect(() => {
    // The shadow map is drawn again only when the sun or a shadow caster changed, not on every
    // orbit frame (see shadowSignature).
    gl.shadowMap.autoUpdate = false;
    gl.shadowMap.needsUpdate = true;
  }, [gl]);
  useFrame(({ gl, scene, camera }) => {
    const g = gate.current;
    if (g.pending) return;
    scene.updateMatrixWorld();
    const key = shadowSignature(scene);
    if (key !== g.shadowKey) {
      g.shadowKey = key;
      gl.shadowMap.needsUpdate = true;
    }
    if (needsNewPrograms(gl, scene, camera, g.seen)) {
      g.pending = true;
      warm(gl, scene, camera, g)
        .catch(() => undefined)
        .finally(() => {
          g.pending = false;
          invalidate();
        });
      return;
    }
    gl.render(scene, camera);
    frameShown(useViewer.getState().modelVersion);
  }, 1);
  return null;
}
