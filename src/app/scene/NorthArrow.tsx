/** A flat north arrow with an "N" beside the model, turned by the project's north rotation. */
import { useMemo } from 'react';
import { BufferGeometry, DoubleSide, Float32BufferAttribute, Line, LineBasicMaterial, Shape } from 'three';
import { useViewer } from '../state/store.ts';
import { heavy } from '../state/heavy.ts';
import { engineGroupRotationRad } from '../compute/frames.ts';

const LETTER = new LineBasicMaterial({ color: '#1d2733' });

export function NorthArrow() {
  const modelVersion = useViewer((s) => s.modelVersion);
  const northDeg = useViewer((s) => s.doc?.site.northDeg ?? 0);
  const groundZ = useViewer((s) => s.doc?.ground?.z);
  const { at, len } = useMemo(() => {
    const b = heavy.model?.bounds ?? [0, 0, 0, 10, 10, 0];
    const span = Math.max(b[3] - b[0], b[4] - b[1]);
    const len = Math.max(1.5, span * 0.12);
    // South-west of the model, beside the scale figure: the corner the first view looks from.
    return { at: [b[0] - len * 1.1, b[1] + len * 0.6, b[2]] as [number, number, number], len };
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, [modelVersion]);
  const shape = useMemo(() => {
    const s = new Shape();
    const w = len * 0.22;
    s.moveTo(0, len * 0.5);
    s.lineTo(w, -len * 0.5);
    s.lineTo(0, -len * 0.3);
    s.lineTo(-w, -len * 0.5);
    s.closePath();
    return s;
  }, [len]);
  const letter = useMemo(() => {
    const h = len * 0.35, w = len * 0.24, y0 = len * 0.62;
    const g = new BufferGeometry();
    g.setAttribute('position', new Float32BufferAttribute([-w / 2, y0, 0, -w / 2, y0 + h, 0, w / 2, y0, 0, w / 2, y0 + h, 0], 3));
    return new Line(g, LETTER);
  }, [len]);
  const z = (groundZ ?? at[2]) + 0.03;
  return (
    <group position={[at[0], at[1], z]} rotation={[0, 0, engineGroupRotationRad(northDeg)]} name="north-arrow">
      <mesh>
        <shapeGeometry args={[shape]} />
        <meshBasicMaterial color="#1d2733" side={DoubleSide} />
      </mesh>
      <primitive object={letter} />
    </group>
  );
}
