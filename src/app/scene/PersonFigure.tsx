/** A plain 1.8 m standing figure beside the model, for scale. */
import { useMemo } from 'react';
import { useViewer } from '../state/store.ts';
import { heavy } from '../state/heavy.ts';

/** Height of the figure [m]. */
export const FIGURE_HEIGHT_M = 1.8;

export function PersonFigure() {
  const modelVersion = useViewer((s) => s.modelVersion);
  const groundZ = useViewer((s) => s.doc?.ground?.z);
  const at = useMemo(() => {
    const b = heavy.model?.bounds ?? [0, 0, 0, 0, 0, 0];
    return [b[0] - 1.5, b[1] - 1.5, b[2]] as [number, number, number];
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, [modelVersion]);
  const z = groundZ ?? at[2];
  // Legs 0–0.85 m, body 0.85–1.55 m, head 1.55–1.8 m.
  return (
    <group position={[at[0], at[1], z]} name="person-1.8m">
      <mesh position={[-0.09, 0, 0.425]} rotation={[Math.PI / 2, 0, 0]} castShadow>
        <cylinderGeometry args={[0.07, 0.06, 0.85, 10]} />
        <meshStandardMaterial color="#39424e" />
      </mesh>
      <mesh position={[0.09, 0, 0.425]} rotation={[Math.PI / 2, 0, 0]} castShadow>
        <cylinderGeometry args={[0.07, 0.06, 0.85, 10]} />
        <meshStandardMaterial color="#39424e" />
      </mesh>
      <mesh position={[0, 0, 1.2]} rotation={[Math.PI / 2, 0, 0]} castShadow>
        <cylinderGeometry args={[0.19, 0.16, 0.7, 12]} />
        <meshStandardMaterial color="#5b6b7d" />
      </mesh>
      <mesh position={[0, 0, 1.675]} castShadow>
        <sphereGeometry args={[0.115, 16, 12]} />
        <meshStandardMaterial color="#b89a80" />
      </mesh>
    </group>
  );
}
