/**
 * The viewer's two frames. The model is drawn in its own frame (up axis and units applied, north
 * not), so turning north turns the north arrow, the sun and the audit's engine-frame objects, not
 * the model. Engine frame (DESIGN §3): x east, y north, z up; model +y points to azimuth northDeg.
 * engine = R(−θ)·model, i.e. x_e = x·cosθ + y·sinθ, y_e = −x·sinθ + y·cosθ (src/geometry/transform.ts).
 */

/** Engine-frame x, y [m] of a point given in the drawn (model) frame. */
export function engineFromDisplay(xM: number, yM: number, northDeg: number): [number, number] {
  const t = (northDeg * Math.PI) / 180;
  const c = Math.cos(t), s = Math.sin(t);
  return [xM * c + yM * s, -xM * s + yM * c];
}

/** Drawn (model) frame x, y [m] of an engine-frame point. */
export function displayFromEngine(xM: number, yM: number, northDeg: number): [number, number] {
  const t = (northDeg * Math.PI) / 180;
  const c = Math.cos(t), s = Math.sin(t);
  return [xM * c - yM * s, xM * s + yM * c];
}

/** Rotation about z [rad] (counter-clockwise seen from above, three.js convention) of the engine group. */
export function engineGroupRotationRad(northDeg: number): number {
  return (northDeg * Math.PI) / 180;
}

/** Unit vector toward the sun in the engine frame from altitude and azimuth (clockwise from north) [deg]. */
export function sunDirection(altitudeDeg: number, azimuthDeg: number): [number, number, number] {
  const a = (altitudeDeg * Math.PI) / 180, z = (azimuthDeg * Math.PI) / 180;
  return [Math.sin(z) * Math.cos(a), Math.cos(z) * Math.cos(a), Math.sin(a)];
}
