/**
 * The sun's path over the model for the day shown (with whole-hour marks), and optionally the
 * June and December solstice paths, drawn on a dome around the model. Engine frame (inside
 * EngineFrame), so north is applied.
 */
import { useMemo } from 'react';
import { BufferGeometry, Float32BufferAttribute, Line, LineBasicMaterial, LineDashedMaterial } from 'three';
import { useViewer } from '../state/store.ts';
import { heavy } from '../state/heavy.ts';
import { engineFromDisplay } from '../compute/frames.ts';
import { localMidnightMs, sunArc } from './sunArcs.ts';
import { useSunAtStep } from './SunLight.tsx';

const DAY_LINE = new LineBasicMaterial({ color: '#d08a00' });
const SOLSTICE_LINE = new LineDashedMaterial({ color: '#8a6a2a', dashSize: 1.2, gapSize: 0.8 });
const HORIZON_LINE = new LineBasicMaterial({ color: '#9aa3ad' });

function line(points: number[], material: LineBasicMaterial | LineDashedMaterial, closed = false): Line {
  const arr = closed && points.length >= 3 ? [...points, points[0]!, points[1]!, points[2]!] : points;
  const g = new BufferGeometry();
  g.setAttribute('position', new Float32BufferAttribute(arr, 3));
  const l = new Line(g, material);
  if (material instanceof LineDashedMaterial) l.computeLineDistances();
  return l;
}

export function SunPathDome() {
  const show = useViewer((s) => s.showSunPath);
  const solstices = useViewer((s) => s.showSolstices);
  const modelVersion = useViewer((s) => s.modelVersion);
  const site = useViewer((s) => s.doc?.site);
  const groundZ = useViewer((s) => s.doc?.ground?.z);
  const sun = useSunAtStep();
  const day = sun?.time ? sun.time.slice(0, 10) + sun.time.slice(19) : '';

  const frame = useMemo(() => {
    const b = heavy.model?.bounds ?? [0, 0, 0, 10, 10, 10];
    const [cx, cy] = engineFromDisplay((b[0] + b[3]) / 2, (b[1] + b[4]) / 2, site?.northDeg ?? 0);
    const r = Math.max(12, Math.hypot(b[3] - b[0], b[4] - b[1]) * 0.75, (b[5] - b[2]) * 1.3);
    return { c: [cx, cy, groundZ ?? b[2]] as [number, number, number], r };
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, [modelVersion, site?.northDeg, groundZ]);

  const drawn = useMemo(() => {
    if (!show || !site || !sun?.time) return null;
    const mid = localMidnightMs(sun.time);
    if (!Number.isFinite(mid)) return null;
    const arc = sunArc(mid, site, frame.c, frame.r);
    const objs: Line[] = [];
    if (arc.points.length >= 6) objs.push(line(arc.points, DAY_LINE));
    const ring: number[] = [];
    for (let a = 0; a < 72; a++) ring.push(frame.c[0] + Math.cos((a / 72) * 2 * Math.PI) * frame.r, frame.c[1] + Math.sin((a / 72) * 2 * Math.PI) * frame.r, frame.c[2] + 0.02);
    objs.push(line(ring, HORIZON_LINE, true));
    if (solstices) {
      const year = sun.time.slice(0, 4);
      const off = sun.time.slice(19);
      for (const md of ['06-21', '12-21']) {
        const s = sunArc(Date.parse(`${year}-${md}T00:00:00${off || 'Z'}`), site, frame.c, frame.r, 15);
        if (s.points.length >= 6) objs.push(line(s.points, SOLSTICE_LINE));
      }
    }
    return { objs, marks: arc.hourMarks, hours: arc.hours };
    // eslint-disable-next-line react-hooks/exhaustive-deps
  }, [show, solstices, site?.latitudeDeg, site?.longitudeDeg, site?.elevationM, day, frame]);

  if (!drawn) return null;
  const markR = frame.r * 0.012;
  return (
    <group name="sun-path">
      {drawn.objs.map((o, i) => (
        <primitive key={i} object={o} />
      ))}
      {drawn.hours.map((h, i) => (
        <mesh key={h} position={[drawn.marks[i * 3]!, drawn.marks[i * 3 + 1]!, drawn.marks[i * 3 + 2]!]} name={`sun-hour-${h}`}>
          <sphereGeometry args={[h % 6 === 0 ? markR * 1.8 : markR, 10, 8]} />
          <meshBasicMaterial color={h === 12 ? '#b04a00' : '#d08a00'} />
        </mesh>
      ))}
    </group>
  );
}
