/** The 3-D view: a demand-rendered canvas (z up) with orbit controls and the scene layers. */
import { Canvas, useFrame, useThree } from '@react-three/fiber';
import { OrbitControls } from '@react-three/drei';
import { useEffect, useRef } from 'react';
import type { OrbitControls as OrbitControlsImpl } from 'three-stdlib';
import { Vector3 } from 'three';
import { useViewer } from '../state/store.ts';
import { heavy } from '../state/heavy.ts';
import { SiteModel } from './SiteModel.tsx';
import { SurfaceHeatmap } from './SurfaceHeatmap.tsx';
import { SensorTiles } from './SensorTiles.tsx';
import { ZoneOutlines } from './ZoneOutlines.tsx';
import { SunLight } from './SunLight.tsx';
import { GroundPlane } from './GroundPlane.tsx';
import { NorthArrow } from './NorthArrow.tsx';
import { PersonFigure } from './PersonFigure.tsx';
import { EngineFrame } from './EngineFrame.tsx';
import { SunPathDome } from './SunPathDome.tsx';
import { DeviceModels } from './DeviceModels.tsx';
import { ReflectionPaths } from './ReflectionPaths.tsx';
import { viewQuality } from './renderer.ts';
import { WarmFrames } from './WarmFrames.tsx';

/** Frames the camera on the model whenever a new model is shown. */
function CameraFit({ controls }: { controls: React.RefObject<OrbitControlsImpl | null> }) {
  const modelVersion = useViewer((s) => s.modelVersion);
  const { camera, invalidate } = useThree();
  useEffect(() => {
    const m = heavy.model;
    if (!m) return;
    const [x0, y0, z0, x1, y1, z1] = m.bounds;
    const cx = (x0 + x1) / 2, cy = (y0 + y1) / 2, cz = (z0 + z1) / 3;
    const r = Math.max(5, Math.hypot(x1 - x0, y1 - y0, z1 - z0) / 2);
    // From the south-south-west and above, the usual way to look at a sun-facing façade.
    camera.position.set(cx - r * 0.9, cy - r * 2.5, cz + r * 1.5);
    camera.near = Math.max(0.05, r / 500);
    camera.far = r * 40;
    camera.updateProjectionMatrix();
    controls.current?.target.set(cx, cy, cz);
    controls.current?.update();
    invalidate();
  }, [modelVersion, camera, controls, invalidate]);
  return null;
}

/** Keyboard on the focused canvas: arrows pan (orbit with Shift), + / − zoom. */
function KeyboardZoom({ controls }: { controls: React.RefObject<OrbitControlsImpl | null> }) {
  const { gl, camera, invalidate } = useThree();
  useEffect(() => {
    const el = gl.domElement;
    el.tabIndex = 0;
    el.setAttribute('role', 'application');
    el.setAttribute('aria-label', '3-D view: drag or arrow keys to pan, Shift+arrows to orbit, mouse wheel or + and − to zoom');
    const c = controls.current;
    c?.listenToKeyEvents(el);
    const onKey = (e: KeyboardEvent) => {
      if (!controls.current) return;
      const t = controls.current.target;
      const f = e.key === '+' || e.key === '=' ? 0.8 : e.key === '-' || e.key === '_' ? 1.25 : 0;
      if (f === 0) return;
      const d = new Vector3().subVectors(camera.position, t).multiplyScalar(f);
      camera.position.copy(t).add(d);
      controls.current.update();
      invalidate();
      e.preventDefault();
    };
    el.addEventListener('keydown', onKey);
    return () => el.removeEventListener('keydown', onKey);
  }, [gl, camera, controls, invalidate]);
  return null;
}

/**
 * Pixel ratio by model size: capped for large models, and lowered while the camera moves (the
 * full ratio comes back, with one more frame, when the drag ends).
 */
function PixelRatio({ controls }: { controls: React.RefObject<OrbitControlsImpl | null> }) {
  const modelVersion = useViewer((s) => s.modelVersion);
  const setDpr = useThree((s) => s.setDpr);
  const invalidate = useThree((s) => s.invalidate);
  useEffect(() => {
    const q = viewQuality(heavy.model);
    const device = typeof window !== 'undefined' ? window.devicePixelRatio || 1 : 1;
    const still = Math.min(device, q.maxDpr);
    const moving = Math.min(still, q.movingDpr);
    setDpr(still);
    invalidate();
    const c = controls.current;
    if (!c || moving === still) return;
    const start = () => setDpr(moving);
    const end = () => {
      setDpr(still);
      invalidate();
    };
    c.addEventListener('start', start);
    c.addEventListener('end', end);
    return () => {
      c.removeEventListener('start', start);
      c.removeEventListener('end', end);
    };
  }, [modelVersion, controls, setDpr, invalidate]);
  return null;
}

/** Counts drawn frames on `window.sunfacetFramesDrawn` (the frame rate check of the end-to-end test reads it). */
function FrameCounter() {
  useFrame(() => {
    const w = window as { sunfacetFramesDrawn?: number };
    w.sunfacetFramesDrawn = (w.sunfacetFramesDrawn ?? 0) + 1;
  });
  return null;
}

export function Viewport() {
  const controls = useRef<OrbitControlsImpl | null>(null);
  const set = useViewer((s) => s.set);
  useViewer((s) => s.modelVersion);
  // Multisampling is decided when the WebGL context is made: a large model (or a software
  // renderer from the start) gets a canvas without it (on a software renderer that roughly halves
  // the frame time, which the page waits for).
  const { antialias } = viewQuality(heavy.model);
  return (
    <Canvas
      key={antialias ? 'multisampled' : 'plain'}
      frameloop="demand"
      shadows="percentage"
      dpr={[1, 2]}
      camera={{ up: [0, 0, 1], position: [-30, -60, 40], fov: 40, near: 0.1, far: 3000 }}
      onPointerMissed={() => set({ picked: null })}
      gl={{ antialias }}
    >
      <color attach="background" args={['#e6e9ec']} />
      <OrbitControls ref={controls} makeDefault enableDamping={false} maxPolarAngle={Math.PI * 0.495} />
      <CameraFit controls={controls} />
      <PixelRatio controls={controls} />
      <FrameCounter />
      <WarmFrames />
      <KeyboardZoom controls={controls} />
      <SunLight />
      <GroundPlane />
      <SiteModel />
      <PersonFigure />
      <NorthArrow />
      <EngineFrame>
        <SurfaceHeatmap />
        <SensorTiles />
        <ZoneOutlines />
        <SunPathDome />
        <DeviceModels />
        <ReflectionPaths />
      </EngineFrame>
    </Canvas>
  );
}
