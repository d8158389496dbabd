/** A ground plane under the model (at the project's ground level) that takes shadows and clicks. */
import { useMemo } from 'react';
import type { ThreeEvent } from '@react-three/fiber';
import { useViewer } from '../state/store.ts';
import { heavy } from '../state/heavy.ts';
import { addDraftPoint } from './pick.ts';
import { viewQuality } from './renderer.ts';

/** Drawn this far below the ground level so the audit's ground cells show on top [m]. */
const SINK_M = 0.05;

export function GroundPlane() {
  const modelVersion = useViewer((s) => s.modelVersion);
  const groundZ = useViewer((s) => s.doc?.ground?.z);
  const box = useMemo(() => {
    const b = heavy.model?.bounds ?? [-10, -10, 0, 10, 10, 0];
    const cx = (b[0] + b[3]) / 2, cy = (b[1] + b[4]) / 2;
    const size = Math.max(40, Math.max(b[3] - b[0], b[4] - b[1]) * 3);
    return { cx, cy, size, minZ: b[2] };
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, [modelVersion]);
  const z = (groundZ ?? box.minZ) - SINK_M;
  // The ground fills much of the view: on a software renderer it takes the model's cheaper shading.
  const lambert = viewQuality(heavy.model).material === 'lambert';
  const onClick = (e: ThreeEvent<MouseEvent>) => {
    if (addDraftPoint(e, groundZ ?? box.minZ)) return;
  };
  return (
    <mesh position={[box.cx, box.cy, z]} receiveShadow onClick={onClick} name="ground-plane">
      <planeGeometry args={[box.size, box.size]} />
      {lambert ? (
        <meshLambertMaterial key="lambert" color="#c9c6bd" polygonOffset polygonOffsetFactor={4} polygonOffsetUnits={4} />
      ) : (
        <meshStandardMaterial key="standard" color="#c9c6bd" roughness={1} metalness={0} polygonOffset polygonOffsetFactor={4} polygonOffsetUnits={4} />
      )}
    </mesh>
  );
}
