/** The devices of the shown design (buildDevices' triangles; tree crowns as translucent ellipsoids); click one to select it. */
import { useEffect, useMemo } from 'react';
import { useThree, type ThreeEvent } from '@react-three/fiber';
import { BufferAttribute, BufferGeometry, DoubleSide } from 'three';
import { useViewer } from '../state/store.ts';
import { designDevices, ownDevices } from '../state/designDoc.ts';
import { buildDeviceView } from '../compute/deviceView.ts';
import { addDraftPoint } from './pick.ts';

/** The design whose devices are drawn: the option of the difference map, else the active design. */
export function drawnDesign(s: { zoneExtra: string; pairVersion: number; compareOption: string; activeDesign: string }, baseline: string): string {
  if (s.zoneExtra === 'mrtChange' && s.pairVersion > 0 && s.compareOption) return s.compareOption;
  return s.activeDesign || baseline;
}

export function DeviceModels() {
  const doc = useViewer((s) => s.doc);
  const design = useViewer((s) => (s.doc ? drawnDesign(s, (s.doc as { baselineName?: string }).baselineName ?? 'baseline') : ''));
  const selected = useViewer((s) => s.selectedDevice);
  const invalidate = useThree((s) => s.invalidate);
  const built = useMemo(() => {
    if (!doc) return null;
    const devices = designDevices(doc, design);
    if (devices.length === 0) return null;
    const r = buildDeviceView(devices, doc.site.latitudeDeg);
    if (!r.ok) return null;
    const own = ownDevices(doc, design);
    const firstOwn = devices.length - own.length;
    const v = r.view;
    const tri = v.positions.length / 9;
    const colours = new Float32Array(tri * 9);
    for (let t = 0; t < tri; t++) {
      const d = v.triangleDevice[t]!;
      const isSel = selected !== null && d === firstOwn + selected;
      // warm timber-brown for devices, fabric lighter, the selected device in the accent orange
      const c = isSel ? [0.95, 0.45, 0.1] : v.triangleSheer[t] ? [0.93, 0.9, 0.82] : [0.55, 0.42, 0.3];
      for (let k = 0; k < 3; k++) colours.set(c, t * 9 + k * 3);
    }
    const g = new BufferGeometry();
    g.setAttribute('position', new BufferAttribute(v.positions, 3));
    g.setAttribute('color', new BufferAttribute(colours, 3));
    g.computeVertexNormals();
    g.computeBoundingSphere();
    return { g, v, firstOwn };
  }, [doc, design, selected]);
  useEffect(() => () => built?.g.dispose(), [built]);
  useEffect(() => invalidate(), [built, invalidate]);
  if (!built) return null;

  const select = (deviceIndex: number, e: ThreeEvent<MouseEvent>) => {
    const s = useViewer.getState();
    if (s.tool !== 'look') return;
    const own = deviceIndex - built.firstOwn;
    e.stopPropagation();
    s.set({ selectedDevice: own >= 0 ? own : null });
  };
  const onClick = (e: ThreeEvent<MouseEvent>) => {
    if (addDraftPoint(e)) return;
    if (e.faceIndex === undefined || e.faceIndex === null) return;
    select(built.v.triangleDevice[e.faceIndex] ?? -1, e);
  };
  const crowns = built.v.crowns;
  const n = crowns.length / 6;
  return (
    <group name="devices">
      <mesh geometry={built.g} castShadow receiveShadow onClick={onClick} name="device-mesh">
        <meshStandardMaterial vertexColors side={DoubleSide} roughness={0.85} />
      </mesh>
      {Array.from({ length: n }, (_, i) => {
        const d = built.v.crownDevice[i]!;
        const isSel = selected !== null && d === built.firstOwn + selected;
        return (
          <mesh
            key={i}
            name="tree-crown"
            position={[crowns[i * 6]!, crowns[i * 6 + 1]!, crowns[i * 6 + 2]!]}
            scale={[crowns[i * 6 + 3]!, crowns[i * 6 + 4]!, crowns[i * 6 + 5]!]}
            onClick={(e) => {
              if (addDraftPoint(e)) return;
              select(d, e);
            }}
          >
            <sphereGeometry args={[1, 24, 16]} />
            <meshStandardMaterial color={isSel ? '#f07a1a' : '#4f8a3c'} transparent opacity={0.45} depthWrite={false} roughness={1} />
          </mesh>
        );
      })}
    </group>
  );
}
