/** At the shown step: lines from the reflecting patches to the sensors and viewpoints the sun's image reaches; viewpoints as eye markers. */
import { useEffect, useMemo } from 'react';
import { useThree } from '@react-three/fiber';
import { BufferAttribute, BufferGeometry } from 'three';
import { useViewer } from '../state/store.ts';
import { heavy } from '../state/heavy.ts';
import { pathsAtStep } from '../compute/designView.ts';

/** An eye: white ball with a dark pupil looking along the line of sight (azimuth clockwise from north). */
function EyeMarker({ position, viewDirectionDeg }: { position: [number, number, number]; viewDirectionDeg: number | null }) {
  const az = ((viewDirectionDeg ?? 0) * Math.PI) / 180;
  // three's rotation about z is counter-clockwise from +x; the pupil sits on +y before turning
  return (
    <group position={position} rotation={[0, 0, -az]} name="viewpoint-eye">
      <mesh>
        <sphereGeometry args={[0.35, 20, 14]} />
        <meshBasicMaterial color="#ffffff" />
      </mesh>
      {viewDirectionDeg !== null && (
        <mesh position={[0, 0.3, 0]} rotation={[Math.PI / 2, 0, 0]}>
          <cylinderGeometry args={[0.16, 0.16, 0.1, 20]} />
          <meshBasicMaterial color="#1d2a3a" />
        </mesh>
      )}
      <mesh position={[0, 0, -0.6]}>
        <cylinderGeometry args={[0.04, 0.04, 1.2, 6]} />
        <meshBasicMaterial color="#1d2a3a" />
      </mesh>
    </group>
  );
}

export function ReflectionPaths() {
  const resultsVersion = useViewer((s) => s.resultsVersion);
  const timeIndex = useViewer((s) => s.timeIndex);
  const show = useViewer((s) => s.showPaths && s.viewMode === 'results' && s.resultsVersion > 0);
  const invalidate = useThree((s) => s.invalidate);
  const geometry = useMemo(() => {
    const r = heavy.results;
    if (!r || !show || resultsVersion === 0) return null;
    const p = pathsAtStep(r, timeIndex);
    if (p.segments.length === 0) return null;
    const g = new BufferGeometry();
    g.setAttribute('position', new BufferAttribute(p.segments, 3));
    const colours = new Float32Array(p.segments.length);
    for (let i = 0; i < p.toViewpoint.length; i++) {
      // patch end bright yellow, receiver end orange (magenta toward a viewpoint)
      colours.set([1, 0.92, 0.2], i * 6);
      colours.set(p.toViewpoint[i] ? [0.85, 0.1, 0.75] : [1, 0.45, 0], i * 6 + 3);
    }
    g.setAttribute('color', new BufferAttribute(colours, 3));
    g.computeBoundingSphere();
    return g;
  }, [resultsVersion, timeIndex, show]);
  useEffect(() => () => geometry?.dispose(), [geometry]);
  useEffect(() => invalidate(), [geometry, show, invalidate]);
  const viewpoints = show ? (heavy.results?.viewpoints ?? []) : [];
  return (
    <group name="reflection-paths">
      {geometry && (
        <lineSegments geometry={geometry} renderOrder={5}>
          <lineBasicMaterial vertexColors transparent opacity={0.85} depthTest={false} />
        </lineSegments>
      )}
      {viewpoints.map((v) => <EyeMarker key={v.name} position={v.position} viewDirectionDeg={v.viewDirectionDeg} />)}
    </group>
  );
}
