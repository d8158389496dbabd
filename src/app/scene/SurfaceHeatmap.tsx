/** The audit's patches coloured by the chosen surface layer at the chosen step (display only). */
import { useEffect, useMemo } from 'react';
import { useThree, type ThreeEvent } from '@react-three/fiber';
import { BufferAttribute, BufferGeometry, DoubleSide } from 'three';
import { useViewer } from '../state/store.ts';
import { heavy } from '../state/heavy.ts';
import { colourValues, stepRange, surfaceLayerRange, surfaceValues, MISSING_RGB } from '../colour/layers.ts';
import { srgbToLinearInPlace } from './colourAttr.ts';
import { addDraftPoint } from './pick.ts';
import { effectiveRange } from '../ui/ranges.ts';

export function SurfaceHeatmap() {
  const resultsVersion = useViewer((s) => s.resultsVersion);
  const layer = useViewer((s) => s.surfaceLayer);
  const show = useViewer((s) => s.viewMode === 'results' && s.surfaceLayer !== 'none' && s.resultsVersion > 0);
  const timeIndex = useViewer((s) => s.timeIndex);
  const scale = useViewer((s) => s.scale);
  const rangeMode = useViewer((s) => s.rangeMode);
  const fixedRanges = useViewer((s) => s.fixedRanges);
  const invalidate = useThree((s) => s.invalidate);

  const geometry = useMemo(() => {
    const p = heavy.patches;
    if (!p || resultsVersion === 0) return null;
    const g = new BufferGeometry();
    g.setAttribute('position', new BufferAttribute(p.positions, 3));
    g.setAttribute('color', new BufferAttribute(new Float32Array(p.positions.length), 3));
    g.computeBoundingSphere();
    return g;
  }, [resultsVersion]);

  useEffect(() => () => geometry?.dispose(), [geometry]);

  useEffect(() => {
    const p = heavy.patches;
    const r = heavy.results;
    if (!geometry || !p || !r || layer === 'none') return;
    const values = surfaceValues(r, layer, timeIndex);
    const range = effectiveRange(rangeMode, fixedRanges[layer], surfaceLayerRange(r, layer), rangeMode === 'step' ? stepRange(values) : null);
    const perResult = colourValues(values, range, scale);
    const attr = geometry.getAttribute('color') as BufferAttribute;
    const out = attr.array as Float32Array;
    const tri = p.patchOfTriangle.length;
    for (let t = 0; t < tri; t++) {
      const ri = p.resultIndex[p.patchOfTriangle[t]!]!;
      for (let k = 0; k < 3; k++) {
        for (let c = 0; c < 3; c++) out[t * 9 + k * 3 + c] = ri >= 0 ? perResult[ri * 3 + c]! : MISSING_RGB[c]!;
      }
    }
    srgbToLinearInPlace(out);
    attr.needsUpdate = true;
    invalidate();
  }, [geometry, layer, timeIndex, scale, rangeMode, fixedRanges, invalidate]);

  if (!geometry || !show) return null;

  const onClick = (e: ThreeEvent<MouseEvent>) => {
    if (addDraftPoint(e)) return;
    const p = heavy.patches;
    if (!p || e.faceIndex === undefined || e.faceIndex === null) return;
    e.stopPropagation();
    const ri = p.resultIndex[p.patchOfTriangle[e.faceIndex]!]!;
    if (ri >= 0) useViewer.getState().set({ picked: { kind: 'patch', patch: ri } });
  };

  return (
    <mesh geometry={geometry} onClick={onClick} name="surface-heatmap">
      <meshBasicMaterial vertexColors side={DoubleSide} />
    </mesh>
  );
}
