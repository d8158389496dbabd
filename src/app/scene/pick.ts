/**
 * Clicks in the 3-D view, shared by every pickable mesh: choose a surface, add a zone corner, or
 * show a patch's values. Display-side picking on what is drawn (three's raycaster via R3F).
 */
import type { ThreeEvent } from '@react-three/fiber';
import { useViewer } from '../state/store.ts';
import { engineFromDisplay } from '../compute/frames.ts';

/**
 * Adds the clicked point (drawn frame) to the zone being drawn, in engine coordinates.
 * @param floorZM height to use instead of the hit's (the ground plane is drawn a little low)
 */
export function addDraftPoint(e: ThreeEvent<MouseEvent>, floorZM?: number): boolean {
  const s = useViewer.getState();
  if (s.tool !== 'drawZone' || !s.doc) return false;
  e.stopPropagation();
  const [x, y] = engineFromDisplay(e.point.x, e.point.y, s.doc.site.northDeg ?? 0);
  s.set({ draftZone: [...s.draftZone, [round(x), round(y), round(floorZM ?? e.point.z)]] });
  return true;
}

function round(v: number): number {
  return Math.round(v * 100) / 100;
}
