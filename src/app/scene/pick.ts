/**
 * Clicks in the 3-D view, shared by every pickable mesh: choose a surface, add a zone corner, or
 * show a patch's values. Display-side picking on what is drawn (three's raycaster via R3F).
 */
import type { ThreeEvent } from '@react-three/fiber';
import { useViewer } from '../state/store.ts';
import { engineFromDisplay } from '../compute/frames.ts';
import { moveZoneCorner } from '../state/projectDoc.ts';
import { placeDeviceAt } from './placeDevice.ts';

/**
 * Takes a click for the zone tools and the device placing tool (placeDevice.ts): adds a corner to the zone being drawn, or moves the picked
 * corner of the zone being edited to the clicked point (engine coordinates). True when used.
 * @param floorZM height to use instead of the hit's (the ground plane is drawn a little low)
 */
export function addDraftPoint(e: ThreeEvent<MouseEvent>, floorZM?: number): boolean {
  const s = useViewer.getState();
  if (!s.doc) return false;
  if (s.tool === 'placeDevice') return placeDeviceAt(e, floorZM);
  if (s.tool === 'editZone') {
    e.stopPropagation();
    const c = s.editCorner;
    if (!c || c.corner < 0) return true;
    const [x, y] = engineFromDisplay(e.point.x, e.point.y, s.doc.site.northDeg ?? 0);
    s.setDoc(moveZoneCorner(s.doc, c.zone, c.corner, round(x), round(y)));
    s.set({ editCorner: { zone: c.zone, corner: -1 } });
    return true;
  }
  if (s.tool !== 'drawZone') return false;
  e.stopPropagation();
  const [x, y] = engineFromDisplay(e.point.x, e.point.y, s.doc.site.northDeg ?? 0);
  s.set({ draftZone: [...s.draftZone, [round(x), round(y), round(floorZM ?? e.point.z)]] });
  return true;
}

function round(v: number): number {
  return Math.round(v * 100) / 100;
}
