/** A group holding engine-frame objects (patches, sensors, zones, sun), turned into the drawn model frame. */
import type { ReactNode } from 'react';
import { useViewer } from '../state/store.ts';
import { engineGroupRotationRad } from '../compute/frames.ts';

export function EngineFrame({ children }: { children: ReactNode }) {
  const northDeg = useViewer((s) => s.doc?.site.northDeg ?? 0);
  return <group rotation={[0, 0, engineGroupRotationRad(northDeg)]}>{children}</group>;
}
