/** The imported model in neutral tones (or coloured by assigned preset); click to pick a surface or a zone corner. */
import { useEffect, useMemo } from 'react';
import { useThree, type ThreeEvent } from '@react-three/fiber';
import { BufferAttribute, BufferGeometry, DoubleSide } from 'three';
import { useViewer } from '../state/store.ts';
import { heavy } from '../state/heavy.ts';
import { flatNormals, modelColours, presetPerSurface, unindexedPositions } from './surfaceTones.ts';
import { addDraftPoint } from './pick.ts';
import { viewQuality } from './renderer.ts';

export function SiteModel() {
  const modelVersion = useViewer((s) => s.modelVersion);
  const doc = useViewer((s) => s.doc);
  const viewMode = useViewer((s) => s.viewMode);
  const selected = useViewer((s) => s.selectedSurface);
  const hasHeatmap = useViewer((s) => s.resultsVersion > 0 && s.viewMode === 'results' && s.surfaceLayer !== 'none');
  const invalidate = useThree((s) => s.invalidate);

  const geometry = useMemo(() => {
    const m = heavy.model;
    if (!m || modelVersion === 0) return null;
    const g = new BufferGeometry();
    const positions = unindexedPositions(m);
    g.setAttribute('position', new BufferAttribute(positions, 3));
    g.setAttribute('color', new BufferAttribute(new Float32Array((m.indices.length / 3) * 9), 3));
    // The same flat normals as computeVertexNormals on non-indexed triangles, in one tight loop.
    g.setAttribute('normal', new BufferAttribute(flatNormals(positions), 3));
    g.computeBoundingSphere();
    return g;
  }, [modelVersion]);

  useEffect(() => () => geometry?.dispose(), [geometry]);

  useEffect(() => {
    const m = heavy.model;
    if (!geometry || !m || !doc) return;
    const per = presetPerSurface(doc, m);
    const colours = modelColours(m, per, viewMode === 'materials' ? 'materials' : 'model', selected, true);
    const attr = geometry.getAttribute('color') as BufferAttribute;
    (attr.array as Float32Array).set(colours);
    attr.needsUpdate = true;
    invalidate();
  }, [geometry, doc, viewMode, selected, invalidate]);

  if (!geometry) return null;
  const q = viewQuality(heavy.model);

  const onClick = (e: ThreeEvent<MouseEvent>) => {
    if (addDraftPoint(e)) return;
    const s = useViewer.getState();
    const m = heavy.model;
    if (!m || e.faceIndex === undefined || e.faceIndex === null) return;
    if (s.tool === 'pickSurface' || s.viewMode !== 'results') {
      e.stopPropagation();
      s.set({ selectedSurface: m.surfaceIds[e.faceIndex] ?? null });
    }
  };

  return (
    <mesh geometry={geometry} castShadow={q.shadows} receiveShadow={q.shadows} visible={!hasHeatmap} onClick={onClick} name="site-model">
      {q.material === 'lambert' ? (
        <meshLambertMaterial key="lambert" vertexColors side={DoubleSide} polygonOffset polygonOffsetFactor={1} polygonOffsetUnits={1} />
      ) : (
        <meshStandardMaterial key="standard" vertexColors side={DoubleSide} roughness={0.9} metalness={0} polygonOffset polygonOffsetFactor={1} polygonOffsetUnits={1} />
      )}
    </mesh>
  );
}
