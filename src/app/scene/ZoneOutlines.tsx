/** Zone polygons (and the one being drawn) as outlines just above their floors, engine frame. */
import { useMemo } from 'react';
import { BufferGeometry, Float32BufferAttribute, Line, LineBasicMaterial } from 'three';
import { useViewer } from '../state/store.ts';

const LIFT_M = 0.08;

const ZONE_LINE = new LineBasicMaterial({ color: '#0b3c6b' });
const DRAFT_LINE = new LineBasicMaterial({ color: '#c0392b' });

function loopGeometry(points: [number, number, number][], closed: boolean): BufferGeometry {
  const arr: number[] = [];
  for (const p of points) arr.push(p[0], p[1], p[2]);
  if (closed && points.length > 2) arr.push(points[0]![0], points[0]![1], points[0]![2]);
  const g = new BufferGeometry();
  g.setAttribute('position', new Float32BufferAttribute(arr, 3));
  return g;
}

export function ZoneOutlines() {
  const zones = useViewer((s) => s.doc?.zones);
  const draft = useViewer((s) => s.draftZone);
  const groundZ = useViewer((s) => s.doc?.ground?.z ?? 0);
  const loops = useMemo(
    () =>
      (zones ?? [])
        .filter((z) => z.polygon)
        .map((z) => new Line(loopGeometry(z.polygon!.map(([x, y]) => [x, y, (z.floorZ ?? groundZ) + LIFT_M]), true), ZONE_LINE)),
    [zones, groundZ],
  );
  const edit = useViewer((s) => (s.tool === 'editZone' ? s.editCorner : null));
  const editZone = edit ? zones?.[edit.zone] : undefined;
  const draftLine = useMemo(() => (draft.length > 0 ? new Line(loopGeometry(draft.map(([x, y, z]) => [x, y, z + LIFT_M]), false), DRAFT_LINE) : null), [draft]);
  return (
    <group name="zones">
      {loops.map((l, i) => (
        <primitive key={i} object={l} />
      ))}
      {draftLine && <primitive object={draftLine} />}
      {draft.map((p, i) => (
        <mesh key={`p${i}`} position={[p[0], p[1], p[2] + LIFT_M]}>
          <sphereGeometry args={[0.18, 12, 8]} />
          <meshBasicMaterial color={i === 0 ? '#c0392b' : '#7a1f14'} />
        </mesh>
      ))}
      {editZone?.polygon?.map(([x, y], i) => (
        <mesh
          key={`h${i}`}
          position={[x, y, (editZone.floorZ ?? groundZ) + LIFT_M]}
          name={`corner-handle-${i}`}
          onClick={(e) => {
            e.stopPropagation();
            useViewer.getState().set({ editCorner: { zone: edit!.zone, corner: i } });
          }}
        >
          <boxGeometry args={[0.45, 0.45, 0.45]} />
          <meshBasicMaterial color={edit!.corner === i ? '#e8590c' : '#0b3c6b'} />
        </mesh>
      ))}
    </group>
  );
}
