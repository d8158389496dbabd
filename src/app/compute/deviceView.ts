/**
 * The devices of one design as drawable geometry: validated with the audit's `validateDevices`
 * and generated with `buildDevices` (the same triangles the audit traces), in the engine frame.
 */
import { buildDevices, validateDevices } from '../../geometry/devices.ts';
import { CROWN_SHAPE_FLOATS } from '../../geometry/generators/tree.ts';
import type { DeviceDoc } from '../state/designDoc.ts';

export interface DeviceView {
  /** Non-indexed triangles, 9 floats each [m], engine frame. */
  positions: Float32Array;
  /** Per triangle: index of its device in the design's device list. */
  triangleDevice: Int32Array;
  /** Per triangle: 1 when semi-transparent (fabric), else 0. */
  triangleSheer: Uint8Array;
  /** Tree crowns: cx, cy, cz, rx, ry, rz per crown [m]. */
  crowns: Float64Array;
  /** Per crown: its device's index. */
  crownDevice: Int32Array;
  names: string[];
}

/**
 * Builds the view of a device list, or the readable message of the first bad device.
 * @param latitudeDeg site latitude [deg] (seasons of crowns; not drawn)
 */
export function buildDeviceView(devices: readonly DeviceDoc[], latitudeDeg: number, place = 'devices'): { ok: true; view: DeviceView } | { ok: false; message: string } {
  try {
    const specs = validateDevices(structuredClone(devices), undefined, { latitudeDeg, place });
    const b = buildDevices(specs);
    const tri = b.scene.indices.length / 3;
    const positions = new Float32Array(tri * 9);
    for (let t = 0; t < tri; t++) {
      for (let k = 0; k < 3; k++) {
        const v = b.scene.indices[t * 3 + k]! * 3;
        positions[t * 9 + k * 3] = b.scene.positions[v]!;
        positions[t * 9 + k * 3 + 1] = b.scene.positions[v + 1]!;
        positions[t * 9 + k * 3 + 2] = b.scene.positions[v + 2]!;
      }
    }
    const sheer = new Uint8Array(tri);
    for (let t = 0; t < tri; t++) sheer[t] = b.triangleTransmittance[t]! > 0 ? 1 : 0;
    return {
      ok: true,
      view: {
        positions,
        triangleDevice: b.triangleDevice.slice(),
        triangleSheer: sheer,
        crowns: b.crowns.ellipsoids.slice(0, b.crowns.count * CROWN_SHAPE_FLOATS),
        crownDevice: b.crowns.device.slice(0, b.crowns.count),
        names: specs.map((s) => s.name),
      },
    };
  } catch (e) {
    return { ok: false, message: e instanceof Error ? e.message : String(e) };
  }
}
