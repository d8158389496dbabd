/**
 * A minimal PNG decoder for screenshots (8-bit RGB / RGBA, not interlaced), enough to compute pixel
 * statistics without another package. PNG spec (W3C, 2003): IHDR, IDAT (zlib), filters 0–4.
 */
import { inflateSync } from 'node:zlib';

export interface Image {
  width: number;
  height: number;
  /** RGBA, 4 bytes per pixel. */
  data: Uint8Array;
}

export function decodePng(buf: Uint8Array): Image {
  const sig = [137, 80, 78, 71, 13, 10, 26, 10];
  sig.forEach((b, i) => {
    if (buf[i] !== b) throw new Error('not a PNG');
  });
  const dv = new DataView(buf.buffer, buf.byteOffset, buf.byteLength);
  let off = 8;
  let width = 0, height = 0, colourType = 0, depth = 0, interlace = 0;
  const idat: Uint8Array[] = [];
  while (off < buf.length) {
    const len = dv.getUint32(off);
    const type = String.fromCharCode(...buf.subarray(off + 4, off + 8));
    const body = buf.subarray(off + 8, off + 8 + len);
    if (type === 'IHDR') {
      width = dv.getUint32(off + 8);
      height = dv.getUint32(off + 12);
      depth = body[8]!;
      colourType = body[9]!;
      interlace = body[12]!;
    } else if (type === 'IDAT') idat.push(body);
    else if (type === 'IEND') break;
    off += 12 + len;
  }
  if (depth !== 8 || (colourType !== 2 && colourType !== 6) || interlace !== 0) throw new Error(`unsupported PNG (depth ${depth}, colour type ${colourType}, interlace ${interlace})`);
  const bpp = colourType === 6 ? 4 : 3;
  const raw = inflateSync(Buffer.concat(idat));
  const stride = width * bpp;
  const out = new Uint8Array(width * height * 4);
  const prev = new Uint8Array(stride);
  const cur = new Uint8Array(stride);
  for (let y = 0; y < height; y++) {
    const f = raw[y * (stride + 1)]!;
    const line = raw.subarray(y * (stride + 1) + 1, (y + 1) * (stride + 1));
    for (let i = 0; i < stride; i++) {
      const a = i >= bpp ? cur[i - bpp]! : 0;
      const b = prev[i]!;
      const c = i >= bpp ? prev[i - bpp]! : 0;
      let v = line[i]!;
      if (f === 1) v += a;
      else if (f === 2) v += b;
      else if (f === 3) v += (a + b) >> 1;
      else if (f === 4) {
        const p = a + b - c;
        const pa = Math.abs(p - a), pb = Math.abs(p - b), pc = Math.abs(p - c);
        v += pa <= pb && pa <= pc ? a : pb <= pc ? b : c;
      }
      cur[i] = v & 255;
    }
    for (let x = 0; x < width; x++) {
      out[(y * width + x) * 4] = cur[x * bpp]!;
      out[(y * width + x) * 4 + 1] = cur[x * bpp + 1]!;
      out[(y * width + x) * 4 + 2] = cur[x * bpp + 2]!;
      out[(y * width + x) * 4 + 3] = bpp === 4 ? cur[x * bpp + 3]! : 255;
    }
    prev.set(cur);
  }
  return { width, height, data: out };
}

export interface PixelStats {
  /** Distinct colours after quantising each channel to 5 bits. */
  distinctColours: number;
  /** Standard deviation of luminance [0–255]. */
  lumaStd: number;
  /** Mean absolute per-pixel difference to another image of the same size, if given. */
}

export function pixelStats(img: Image): PixelStats {
  const seen = new Set<number>();
  let s = 0, s2 = 0;
  const n = img.width * img.height;
  for (let i = 0; i < n; i++) {
    const r = img.data[i * 4]!, g = img.data[i * 4 + 1]!, b = img.data[i * 4 + 2]!;
    seen.add(((r >> 3) << 10) | ((g >> 3) << 5) | (b >> 3));
    const l = 0.2126 * r + 0.7152 * g + 0.0722 * b;
    s += l;
    s2 += l * l;
  }
  const mean = s / n;
  return { distinctColours: seen.size, lumaStd: Math.sqrt(Math.max(0, s2 / n - mean * mean)) };
}

/** Mean absolute difference per channel between two images of the same size [0–255]. */
export function meanAbsDiff(a: Image, b: Image): number {
  if (a.width !== b.width || a.height !== b.height) throw new Error('size mismatch');
  let s = 0;
  for (let i = 0; i < a.data.length; i += 4) s += Math.abs(a.data[i]! - b.data[i]!) + Math.abs(a.data[i + 1]! - b.data[i + 1]!) + Math.abs(a.data[i + 2]! - b.data[i + 2]!);
  return s / ((a.data.length / 4) * 3);
}
