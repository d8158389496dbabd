/** Sun (directional light with shadows) and sky light for the chosen step; a small sun marker. */
import { useEffect, useMemo } from 'react';
import { useThree } from '@react-three/fiber';
import { Object3D } from 'three';
import { useViewer } from '../state/store.ts';
import { heavy } from '../state/heavy.ts';
import { engineGroupRotationRad, sunDirection } from '../compute/frames.ts';
import { viewQuality } from './renderer.ts';

/** The sun (altitude, azimuth) at the step shown: from the results, else from the sun path. */
export function useSunAtStep(): { altitudeDeg: number; azimuthDeg: number; time: string } | null {
  const timeIndex = useViewer((s) => s.timeIndex);
  useViewer((s) => s.resultsVersion);
  useViewer((s) => s.sunPathVersion);
  const r = heavy.results;
  const src = r && !useViewer.getState().resultsStale ? { times: r.times, sun: r.sun } : heavy.sunPath ?? (r ? { times: r.times, sun: r.sun } : null);
  if (!src) return null;
  const sun = src.sun[timeIndex];
  if (!sun) return null;
  return { ...sun, time: src.times[timeIndex] ?? '' };
}

export function SunLight() {
  const modelVersion = useViewer((s) => s.modelVersion);
  const northDeg = useViewer((s) => s.doc?.site.northDeg ?? 0);
  const sun = useSunAtStep();
  const invalidate = useThree((s) => s.invalidate);
  const target = useMemo(() => new Object3D(), []);

  const frame = useMemo(() => {
    const m = heavy.model;
    const b = m?.bounds ?? [0, 0, 0, 10, 10, 10];
    const c: [number, number, number] = [(b[0] + b[3]) / 2, (b[1] + b[4]) / 2, (b[2] + b[5]) / 2];
    const r = Math.max(10, Math.hypot(b[3] - b[0], b[4] - b[1], b[5] - b[2]) / 2);
    return { c, r, quality: viewQuality(m) };
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, [modelVersion]);

  useEffect(() => {
    target.position.set(...frame.c);
    target.updateMatrixWorld();
    invalidate();
  }, [frame, target, invalidate]);

  const up = sun !== null && sun.altitudeDeg > 0;
  // The sun direction is engine frame; the drawn frame is turned by the north rotation.
  const d = sun ? sunDirection(sun.altitudeDeg, sun.azimuthDeg) : [0, 0, 1];
  const rot = engineGroupRotationRad(northDeg);
  const dx = d[0]! * Math.cos(rot) - d[1]! * Math.sin(rot);
  const dy = d[0]! * Math.sin(rot) + d[1]! * Math.cos(rot);
  const dist = frame.r * 2.5;
  const pos: [number, number, number] = [frame.c[0] + dx * dist, frame.c[1] + dy * dist, frame.c[2] + d[2]! * dist];
  const strength = up ? Math.min(1, Math.sin((sun!.altitudeDeg * Math.PI) / 180) * 3) : 0;

  useEffect(() => invalidate(), [pos[0], pos[1], pos[2], strength, invalidate]);

  return (
    <>
      <hemisphereLight args={['#f4f7fb', '#8a8478', up ? 1.1 : 0.55]} />
      <primitive object={target} />
      <directionalLight
        position={pos}
        target={target}
        intensity={2.4 * strength}
        castShadow={up && frame.quality.shadows}
        shadow-mapSize={[frame.quality.shadowMapSizePx, frame.quality.shadowMapSizePx]}
        shadow-bias={-0.0004}
        // Tuned at 2048 px; a coarser map needs a proportionally larger offset against acne.
        shadow-normalBias={(0.03 * 2048) / frame.quality.shadowMapSizePx}
        shadow-camera-left={-frame.r * 1.3}
        shadow-camera-right={frame.r * 1.3}
        shadow-camera-top={frame.r * 1.3}
        shadow-camera-bottom={-frame.r * 1.3}
        shadow-camera-near={0.1}
        shadow-camera-far={dist * 2.5}
      />
      {up && (
        <mesh position={[frame.c[0] + dx * frame.r * 1.6, frame.c[1] + dy * frame.r * 1.6, frame.c[2] + d[2]! * frame.r * 1.6]} name="sun-marker">
          <sphereGeometry args={[frame.r * 0.04, 16, 12]} />
          <meshBasicMaterial color="#ffcc33" />
        </mesh>
      )}
    </>
  );
}
