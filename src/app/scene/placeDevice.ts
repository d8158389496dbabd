/** Clicks with the 'placeDevice' tool: a new device at the clicked floor point or wall. */
import type { ThreeEvent } from '@react-three/fiber';
import { Vector3 } from 'three';
import { useViewer } from '../state/store.ts';
import { engineFromDisplay } from '../compute/frames.ts';
import { makeDevice, nextDeviceName, ownDevices, setOwnDevices, WALL_TYPES, type Placement } from '../state/designDoc.ts';

/** Faces steeper than this from horizontal count as walls [deg]. */
const WALL_TILT_DEG = 60;

/** Adds the device being placed at the click (engine frame), selects it and ends the tool. True when used. */
export function placeDeviceAt(e: ThreeEvent<MouseEvent>, floorZM?: number): boolean {
  const s = useViewer.getState();
  if (s.tool !== 'placeDevice' || !s.placeDevice || !s.doc) return false;
  e.stopPropagation();
  const north = s.doc.site.northDeg ?? 0;
  const [x, y] = engineFromDisplay(e.point.x, e.point.y, north);
  let placement: Placement = { kind: 'floor', point: [x, y, floorZM ?? e.point.z] };
  const n = e.face?.normal ? new Vector3().copy(e.face.normal).transformDirection(e.object.matrixWorld) : null;
  if (n && Math.abs(n.z) < Math.cos((WALL_TILT_DEG * Math.PI) / 180)) {
    // toward the camera's side of a double-sided face
    const toCam = new Vector3().subVectors(e.camera.position, e.point);
    if (toCam.dot(n) < 0) n.negate();
    const [nx, ny] = engineFromDisplay(n.x, n.y, north);
    placement = { kind: 'wall', point: [x, y, e.point.z], normal: [nx, ny] };
  } else if (WALL_TYPES.includes(s.placeDevice.type)) {
    s.set({ notice: { kind: 'info', text: `Click a wall to place ${s.placeDevice.type}: they run along the wall you click.` } });
    return true;
  }
  const design = s.activeDesign || ((s.doc as { baselineName?: string }).baselineName ?? 'baseline');
  const device = makeDevice(s.placeDevice.type, nextDeviceName(s.doc, s.placeDevice.type), placement, s.placeDevice.sizes);
  const list = [...ownDevices(s.doc, design), device];
  s.setDoc(setOwnDevices(s.doc, design, list));
  s.set({ tool: 'look', placeDevice: null, selectedDevice: list.length - 1 });
  return true;
}
