import { zlibSync } from 'fflate';
import { crc32 } from '../../dataset/png-codec';
import type { Raster } from './raster';

/**
 * Encodes an RGBA raster as a colour PNG: colour type 6 (truecolour with alpha), 8 bits per channel,
 * no interlace, filter type 0 on every row, one zlib-wrapped IDAT (RFC 1950) at a fixed level, and
 * optional tEXt chunks in sorted keyword order. No time chunk is written, so the same raster gives
 * byte-identical files. Format: PNG Specification (W3C Recommendation / ISO/IEC 15948).
 * Throws RangeError when the data length does not match the size or a text chunk is not Latin-1.
 */
export function encodeRgbaPng(raster: Raster, text: Readonly<Record<string, string>> = {}): Uint8Array {
  const { width, height, data } = raster;
  if (!Number.isInteger(width) || width < 1) throw new RangeError(`'raster.width' must be a positive integer; got ${width}`);
  if (!Number.isInteger(height) || height < 1) throw new RangeError(`'raster.height' must be a positive integer; got ${height}`);
  if (data.length !== width * height * 4) {
    throw new RangeError(`'raster.data' must hold width * height * 4 = ${width * height * 4} bytes; got ${data.length}`);
  }
  const stride = width * 4;
  // Chart rasters are flat colour, so the unfiltered rows already compress well and keep encoding simple.
  const raw = new Uint8Array(height * (stride + 1));
  for (let y = 0; y < height; y++) raw.set(data.subarray(y * stride, (y + 1) * stride), y * (stride + 1) + 1);

  const ihdr = new Uint8Array(13);
  const view = new DataView(ihdr.buffer);
  view.setUint32(0, width);
  view.setUint32(4, height);
  ihdr[8] = 8;
  ihdr[9] = 6;
  const parts: Uint8Array[] = [Uint8Array.of(0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a), pngChunk('IHDR', ihdr)];
  for (const key of Object.keys(text).sort()) {
    if (key.length < 1 || key.length > 79 || key !== key.trim()) {
      throw new RangeError(`'text' keyword must be 1-79 characters without leading or trailing spaces; got '${key}'`);
    }
    const k = latin1(key, `'text' keyword '${key}'`);
    const v = latin1(text[key], `'text' value of '${key}'`);
    const body = new Uint8Array(k.length + 1 + v.length);
    body.set(k, 0);
    body.set(v, k.length + 1);
    parts.push(pngChunk('tEXt', body));
  }
  parts.push(pngChunk('IDAT', zlibSync(raw, { level: 6 })));
  parts.push(pngChunk('IEND', new Uint8Array(0)));
  const out = new Uint8Array(parts.reduce((s, p) => s + p.length, 0));
  let offset = 0;
  for (const p of parts) {
    out.set(p, offset);
    offset += p.length;
  }
  return out;
}

function pngChunk(type: string, body: Uint8Array): Uint8Array {
  const out = new Uint8Array(12 + body.length);
  const view = new DataView(out.buffer);
  view.setUint32(0, body.length);
  for (let i = 0; i < 4; i++) out[4 + i] = type.charCodeAt(i);
  out.set(body, 8);
  view.setUint32(8 + body.length, crc32(out, 4, 8 + body.length));
  return out;
}

function latin1(s: string, what: string): Uint8Array {
  const out = new Uint8Array(s.length);
  for (let i = 0; i < s.length; i++) {
    const c = s.charCodeAt(i);
    if (c > 255 || c === 0) throw new RangeError(`${what} must be Latin-1 text without NUL; got character code ${c} at ${i}`);
    out[i] = c;
  }
  return out;
}
