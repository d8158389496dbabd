/** Sensor points as small floor tiles coloured by the chosen zone layer; click one for its day. */
import { useEffect, useMemo, useRef } from 'react';
import { useThree, type ThreeEvent } from '@react-three/fiber';
import { Color, InstancedMesh, Matrix4, DoubleSide } from 'three';
import { useViewer } from '../state/store.ts';
import { heavy } from '../state/heavy.ts';
import { colourValues, sensorCount, sensorLayerRange, sensorValues, stepRange } from '../colour/layers.ts';
import { effectiveRange, sensorRangeKey } from '../ui/ranges.ts';
import { addDraftPoint } from './pick.ts';
import { colourDifferences } from '../colour/diverging.ts';
import { zoneExtraColours } from './zoneExtra.ts';

/** Lift of the tiles above the zone floor [m], so they never fight with the floor. */
const TILE_LIFT_M = 0.05;

export function SensorTiles() {
  const resultsVersion = useViewer((s) => s.resultsVersion);
  const layer = useViewer((s) => s.sensorLayer);
  const show = useViewer((s) => s.viewMode === 'results' && (s.sensorLayer !== 'none' || s.zoneExtra !== 'none') && s.resultsVersion > 0);
  const timeIndex = useViewer((s) => s.timeIndex);
  const scale = useViewer((s) => s.sensorScale);
  const category = useViewer((s) => s.category);
  const rangeMode = useViewer((s) => s.rangeMode);
  const fixedRanges = useViewer((s) => s.fixedRanges);
  const doc = useViewer((s) => s.doc);
  const picked = useViewer((s) => s.picked);
  const extra = useViewer((s) => s.zoneExtra);
  const pairVersion = useViewer((s) => s.pairVersion);
  const diffMode = useViewer((s) => s.diffMode);
  const invalidate = useThree((s) => s.invalidate);
  const mesh = useRef<InstancedMesh>(null);

  const layout = useMemo(() => {
    const r = heavy.results;
    if (!r || resultsVersion === 0) return null;
    const n = sensorCount(r);
    const owner: [number, number][] = [];
    r.zones.forEach((z, zi) => {
      for (let si = 0; si < z.sensorCount; si++) owner.push([zi, si]);
    });
    return { n, owner };
  }, [resultsVersion]);

  // Tile placement: at each sensor, on the zone's floor, sized by the zone's spacing.
  useEffect(() => {
    const r = heavy.results;
    const im = mesh.current;
    if (!r || !im || !layout) return;
    const m = new Matrix4();
    let k = 0;
    for (const z of r.zones) {
      const spec = doc?.zones?.find((d) => d.name === z.name);
      // Nearly touching on the difference map, so the hot floor between tiles is not read as "hotter".
      const size = (spec?.spacingM ?? 1) * (extra === 'mrtChange' ? 0.97 : 0.82);
      for (let i = 0; i < z.sensorCount; i++) {
        m.makeScale(size, size, 1);
        m.setPosition(z.positions[i * 3]!, z.positions[i * 3 + 1]!, z.positions[i * 3 + 2]! - z.sensorHeightM + TILE_LIFT_M);
        im.setMatrixAt(k++, m);
      }
    }
    im.instanceMatrix.needsUpdate = true;
    im.computeBoundingSphere();
    invalidate();
  }, [layout, doc, invalidate, show, extra]);

  useEffect(() => {
    const r = heavy.results;
    const im = mesh.current;
    if (!r || !im || !layout || (layer === 'none' && extra === 'none')) return;
    let rgb: Float32Array;
    const ex = extra !== 'none' ? zoneExtraColours(r, extra, timeIndex, diffMode, scale) : null;
    if (ex) rgb = ex.kind === 'difference' ? colourDifferences(ex.values, ex.halfRangeK) : colourValues(ex.values, ex.range, scale);
    else if (layer !== 'none') {
      const values = sensorValues(r, layer, timeIndex, category);
      const range = effectiveRange(rangeMode, fixedRanges[sensorRangeKey(layer, category)], sensorLayerRange(r, layer, category), rangeMode === 'step' ? stepRange(values) : null);
      rgb = colourValues(values, range, scale);
    } else return;
    const c = new Color();
    for (let i = 0; i < layout.n; i++) {
      c.setRGB(rgb[i * 3]!, rgb[i * 3 + 1]!, rgb[i * 3 + 2]!, 'srgb');
      const isPicked = picked?.kind === 'sensor' && layout.owner[i]?.[0] === picked.zone && layout.owner[i]?.[1] === picked.sensor;
      if (isPicked) c.setRGB(1, 1, 1, 'srgb');
      im.setColorAt(i, c);
    }
    if (im.instanceColor) im.instanceColor.needsUpdate = true;
    invalidate();
  }, [layout, layer, timeIndex, scale, category, rangeMode, fixedRanges, picked, invalidate, show, extra, pairVersion, diffMode]);

  if (!layout || layout.n === 0 || !show) return null;

  const onClick = (e: ThreeEvent<MouseEvent>) => {
    if (addDraftPoint(e)) return;
    if (e.instanceId === undefined) return;
    e.stopPropagation();
    const o = layout.owner[e.instanceId];
    if (o) useViewer.getState().set({ picked: { kind: 'sensor', zone: o[0], sensor: o[1] } });
  };

  return (
    <instancedMesh ref={mesh} args={[undefined, undefined, layout.n]} onClick={onClick} name="sensor-tiles" key={resultsVersion}>
      <planeGeometry args={[1, 1]} />
      <meshBasicMaterial side={DoubleSide} toneMapped={false} />
    </instancedMesh>
  );
}
