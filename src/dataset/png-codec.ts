import { unzlibSync, zlibSync } from 'fflate';
import { DatasetError } from './errors';

/**
 * A pure PNG decoder and greyscale encoder on fflate (zlib-wrapped deflate, RFC 1950/1951), so the same code runs in the browser and in Node.
 * Format: PNG (Portable Network Graphics) Specification, W3C Recommendation / ISO/IEC 15948.
 */

const SIGNATURE = [0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a];

/** PNG colour types (PNG specification, IHDR). */
export type PngColourType = 0 | 2 | 3 | 4 | 6;

export interface DecodedPng {
  readonly width: number;
  readonly height: number;
  /** Sample depth of `data`: 8 or 16 (1/2/4-bit grey is scaled up to 8; palettes expand to 8). */
  readonly bitDepth: 8 | 16;
  /** Bit depth as stored in the file. */
  readonly fileBitDepth: number;
  readonly colourType: PngColourType;
  /** Samples per pixel in `data`: 1 grey, 2 grey+alpha, 3 RGB, 4 RGBA (palette -> 3 or 4). */
  readonly channels: 1 | 2 | 3 | 4;
  /** Row-major, channel-interleaved samples. */
  readonly data: Uint8Array | Uint16Array;
  /** tEXt chunks, keyword -> text. */
  readonly text: Readonly<Record<string, string>>;
}

export interface PngEncodeInput {
  readonly width: number;
  readonly height: number;
  readonly bitDepth: 8 | 16;
  /** Row-major greyscale samples, width * height of them. */
  readonly data: Uint8Array | Uint16Array;
  /** tEXt chunks; keywords 1-79 Latin-1 characters, text Latin-1. */
  readonly text?: Readonly<Record<string, string>>;
}

function makeCrcTable(): Uint32Array {
  const table = new Uint32Array(256);
  for (let n = 0; n < 256; n++) {
    let c = n;
    for (let k = 0; k < 8; k++) c = c & 1 ? 0xedb88320 ^ (c >>> 1) : c >>> 1;
    table[n] = c >>> 0;
  }
  return table;
}

const CRC_TABLE = makeCrcTable();

/** CRC-32 as PNG uses it (ISO 3309 / ITU-T V.42 polynomial), over bytes [start, end). */
export function crc32(bytes: Uint8Array, start = 0, end = bytes.length): number {
  let c = 0xffffffff;
  for (let i = start; i < end; i++) c = CRC_TABLE[(c ^ bytes[i]) & 0xff] ^ (c >>> 8);
  return (c ^ 0xffffffff) >>> 0;
}

const CHANNELS_OF: Record<number, 1 | 2 | 3 | 4> = { 0: 1, 2: 3, 3: 1, 4: 2, 6: 4 };
const ALLOWED_DEPTHS: Record<number, readonly number[]> = {
  0: [1, 2, 4, 8, 16],
  2: [8, 16],
  3: [1, 2, 4, 8],
  4: [8, 16],
  6: [8, 16],
};

function readU32(b: Uint8Array, p: number): number {
  return ((b[p] << 24) | (b[p + 1] << 16) | (b[p + 2] << 8) | b[p + 3]) >>> 0;
}

function latin1(bytes: Uint8Array): string {
  let s = '';
  for (let i = 0; i < bytes.length; i++) s += String.fromCharCode(bytes[i]);
  return s;
}

function paeth(a: number, b: number, c: number): number {
  const p = a + b - c;
  const pa = Math.abs(p - a);
  const pb = Math.abs(p - b);
  const pc = Math.abs(p - c);
  if (pa <= pb && pa <= pc) return a;
  return pb <= pc ? b : c;
}

/** Reverses the five PNG filter types in place; `raw` holds height rows of (1 + stride) bytes. */
function unfilter(raw: Uint8Array, height: number, stride: number, bpp: number, fail: (what: string) => never): Uint8Array {
  const out = new Uint8Array(height * stride);
  for (let y = 0; y < height; y++) {
    const type = raw[y * (stride + 1)];
    const src = y * (stride + 1) + 1;
    const row = y * stride;
    const prev = row - stride;
    for (let i = 0; i < stride; i++) {
      const x = raw[src + i];
      const a = i >= bpp ? out[row + i - bpp] : 0;
      const b = y > 0 ? out[prev + i] : 0;
      const c = y > 0 && i >= bpp ? out[prev + i - bpp] : 0;
      let v: number;
      switch (type) {
        case 0: v = x; break;
        case 1: v = x + a; break;
        case 2: v = x + b; break;
        case 3: v = x + ((a + b) >> 1); break;
        case 4: v = x + paeth(a, b, c); break;
        default: fail(`row ${y} has unknown filter type ${type}`);
      }
      out[row + i] = v & 0xff;
    }
  }
  return out;
}

/**
 * Decodes a PNG file into samples. Checks the signature and every chunk's CRC; supports colour
 * types 0, 2, 3, 4, 6 at their allowed bit depths and all five filter types. Adam7 interlacing is
 * rejected with a DatasetError. Throws DatasetError('unreadable-image') naming `fileName`.
 */
export function decodePng(bytes: Uint8Array, fileName = 'image.png'): DecodedPng {
  const fail = (what: string, cause?: unknown): never => {
    throw new DatasetError(`cannot read the PNG: ${what}`, {
      code: 'unreadable-image',
      file: fileName,
      fix: 'check that the file is a complete PNG (re-export or re-copy it)',
      cause,
    });
  };
  if (bytes.length < 8 || SIGNATURE.some((v, i) => bytes[i] !== v)) fail('the PNG signature is missing');
  let pos = 8;
  let width = 0;
  let height = 0;
  let depth = 0;
  let colourType = -1;
  let interlace = 0;
  let palette: Uint8Array | undefined;
  let paletteAlpha: Uint8Array | undefined;
  const idat: Uint8Array[] = [];
  const text: Record<string, string> = {};
  let sawEnd = false;
  while (pos < bytes.length) {
    if (pos + 12 > bytes.length) fail(`the file ends inside a chunk header at byte ${pos}`);
    const length = readU32(bytes, pos);
    const type = latin1(bytes.subarray(pos + 4, pos + 8));
    const dataStart = pos + 8;
    const dataEnd = dataStart + length;
    if (dataEnd + 4 > bytes.length) fail(`the file ends inside the ${type} chunk (truncated)`);
    const expected = readU32(bytes, dataEnd);
    if (crc32(bytes, pos + 4, dataEnd) !== expected) fail(`the CRC of the ${type} chunk at byte ${pos} does not match`);
    const data = bytes.subarray(dataStart, dataEnd);
    if (idat.length === 0 && colourType < 0 && type !== 'IHDR') fail('the first chunk is not IHDR');
    if (type === 'IHDR') {
      if (length !== 13) fail(`IHDR has length ${length}, expected 13`);
      width = readU32(data, 0);
      height = readU32(data, 4);
      depth = data[8];
      colourType = data[9];
      interlace = data[12];
      if (width === 0 || height === 0) fail(`the image size is ${width} x ${height}`);
      if (!(colourType in ALLOWED_DEPTHS)) fail(`colour type ${colourType} is not a PNG colour type`);
      if (!ALLOWED_DEPTHS[colourType].includes(depth)) fail(`bit depth ${depth} is not allowed for colour type ${colourType}`);
      if (data[10] !== 0 || data[11] !== 0) fail('unknown compression or filter method');
      if (interlace === 1) {
        throw new DatasetError('the PNG is interlaced (Adam7), which Tessera does not read', {
          code: 'unsupported-image',
          file: fileName,
          fix: 'save the image again without interlacing',
        });
      }
    } else if (type === 'PLTE') {
      palette = data.slice();
    } else if (type === 'tRNS') {
      if (colourType === 3) paletteAlpha = data.slice();
    } else if (type === 'IDAT') {
      idat.push(data);
    } else if (type === 'tEXt') {
      const zero = data.indexOf(0);
      if (zero > 0) text[latin1(data.subarray(0, zero))] = latin1(data.subarray(zero + 1));
    } else if (type === 'IEND') {
      sawEnd = true;
      break;
    }
    pos = dataEnd + 4;
  }
  if (colourType < 0) fail('there is no IHDR chunk');
  if (idat.length === 0) fail('there is no image data (IDAT)');
  if (!sawEnd) fail('the IEND chunk is missing (truncated file)');
  if (colourType === 3 && palette === undefined) fail('a palette image has no PLTE chunk');

  const total = idat.reduce((s, c) => s + c.length, 0);
  const joined = new Uint8Array(total);
  let off = 0;
  for (const c of idat) {
    joined.set(c, off);
    off += c.length;
  }
  const fileChannels = CHANNELS_OF[colourType];
  const bitsPerPixel = fileChannels * depth;
  const stride = Math.ceil((width * bitsPerPixel) / 8);
  const bpp = Math.max(1, bitsPerPixel >> 3);
  let raw: Uint8Array;
  try {
    raw = unzlibSync(joined);
  } catch (cause) {
    return fail('the compressed image data is corrupt', cause);
  }
  if (raw.length < height * (stride + 1)) fail(`the image data holds ${raw.length} bytes, expected ${height * (stride + 1)}`);
  const pixels = unfilter(raw, height, stride, bpp, fail);

  const n = width * height;
  if (colourType === 3) {
    const pal = palette as Uint8Array;
    const withAlpha = paletteAlpha !== undefined;
    const channels = withAlpha ? 4 : 3;
    const out = new Uint8Array(n * channels);
    const mask = (1 << depth) - 1;
    for (let y = 0; y < height; y++) {
      for (let x = 0; x < width; x++) {
        const bit = x * depth;
        const idx = depth === 8 ? pixels[y * stride + x] : (pixels[y * stride + (bit >> 3)] >> (8 - depth - (bit & 7))) & mask;
        if (idx * 3 + 2 >= pal.length) fail(`palette index ${idx} is outside the palette`);
        const o = (y * width + x) * channels;
        out[o] = pal[idx * 3];
        out[o + 1] = pal[idx * 3 + 1];
        out[o + 2] = pal[idx * 3 + 2];
        if (withAlpha) out[o + 3] = idx < (paletteAlpha as Uint8Array).length ? (paletteAlpha as Uint8Array)[idx] : 255;
      }
    }
    return { width, height, bitDepth: 8, fileBitDepth: depth, colourType, channels, data: out, text };
  }
  if (depth === 16) {
    const out = new Uint16Array(n * fileChannels);
    for (let y = 0; y < height; y++) {
      for (let i = 0; i < width * fileChannels; i++) {
        const p = y * stride + 2 * i;
        out[y * width * fileChannels + i] = (pixels[p] << 8) | pixels[p + 1];
      }
    }
    return { width, height, bitDepth: 16, fileBitDepth: 16, colourType: colourType as PngColourType, channels: fileChannels, data: out, text };
  }
  if (depth === 8) {
    const out = new Uint8Array(n * fileChannels);
    for (let y = 0; y < height; y++) out.set(pixels.subarray(y * stride, y * stride + width * fileChannels), y * width * fileChannels);
    return { width, height, bitDepth: 8, fileBitDepth: 8, colourType: colourType as PngColourType, channels: fileChannels, data: out, text };
  }
  // 1/2/4-bit grey: scale to 8 bits by exact replication of the full range (v * 255 / max).
  const out = new Uint8Array(n);
  const mask = (1 << depth) - 1;
  for (let y = 0; y < height; y++) {
    for (let x = 0; x < width; x++) {
      const bit = x * depth;
      const v = (pixels[y * stride + (bit >> 3)] >> (8 - depth - (bit & 7))) & mask;
      out[y * width + x] = Math.round((v * 255) / mask);
    }
  }
  return { width, height, bitDepth: 8, fileBitDepth: depth, colourType: 0, channels: 1, data: out, text };
}

function chunk(type: string, data: Uint8Array): Uint8Array {
  const out = new Uint8Array(12 + data.length);
  const view = new DataView(out.buffer);
  view.setUint32(0, data.length);
  for (let i = 0; i < 4; i++) out[4 + i] = type.charCodeAt(i);
  out.set(data, 8);
  view.setUint32(8 + data.length, crc32(out, 4, 8 + data.length));
  return out;
}

function latin1Bytes(s: string, what: string): Uint8Array {
  const out = new Uint8Array(s.length);
  for (let i = 0; i < s.length; i++) {
    const c = s.charCodeAt(i);
    if (c > 255) throw new RangeError(`${what} must be Latin-1 text; got character U+${c.toString(16).padStart(4, '0')}`);
    out[i] = c;
  }
  return out;
}

/** Filters one row with the given type into dst (1 + stride bytes). */
function filterRow(type: number, cur: Uint8Array, prev: Uint8Array | undefined, bpp: number, dst: Uint8Array): void {
  dst[0] = type;
  for (let i = 0; i < cur.length; i++) {
    const a = i >= bpp ? cur[i - bpp] : 0;
    const b = prev ? prev[i] : 0;
    const c = prev && i >= bpp ? prev[i - bpp] : 0;
    const pred = type === 0 ? 0 : type === 1 ? a : type === 2 ? b : type === 3 ? (a + b) >> 1 : paeth(a, b, c);
    dst[i + 1] = (cur[i] - pred) & 0xff;
  }
}

/**
 * Encodes a greyscale PNG (colour type 0) at 8 or 16 bits with optional tEXt chunks. Each row takes the
 * filter with the smallest sum of absolute signed residuals (the heuristic the PNG specification
 * suggests). Same input gives byte-identical output. Throws RangeError/TypeError on bad arguments.
 */
export function encodePng({ width, height, bitDepth, data, text = {} }: PngEncodeInput): Uint8Array {
  if (!Number.isInteger(width) || width < 1 || width > 0x7fffffff) throw new RangeError(`'width' must be a positive integer; got ${width}`);
  if (!Number.isInteger(height) || height < 1 || height > 0x7fffffff) throw new RangeError(`'height' must be a positive integer; got ${height}`);
  if (bitDepth !== 8 && bitDepth !== 16) throw new RangeError(`'bitDepth' must be 8 or 16; got ${bitDepth}`);
  if (data.length !== width * height) throw new RangeError(`'data' must hold width * height = ${width * height} samples; got ${data.length}`);
  if (bitDepth === 8 && !(data instanceof Uint8Array)) throw new TypeError(`'data' must be a Uint8Array for bitDepth 8; got ${data.constructor.name}`);
  if (bitDepth === 16 && !(data instanceof Uint16Array)) throw new TypeError(`'data' must be a Uint16Array for bitDepth 16; got ${data.constructor.name}`);

  const bpp = bitDepth / 8;
  const stride = width * bpp;
  const raw = new Uint8Array(height * (stride + 1));
  const rowBytes = new Uint8Array(stride);
  let prevRow: Uint8Array | undefined;
  const candidate = new Uint8Array(stride + 1);
  for (let y = 0; y < height; y++) {
    const cur = rowBytes;
    if (bitDepth === 8) cur.set((data as Uint8Array).subarray(y * width, (y + 1) * width));
    else {
      for (let x = 0; x < width; x++) {
        const v = (data as Uint16Array)[y * width + x];
        cur[2 * x] = v >> 8;
        cur[2 * x + 1] = v & 0xff;
      }
    }
    let bestScore = Infinity;
    const dst = raw.subarray(y * (stride + 1), (y + 1) * (stride + 1));
    for (let type = 0; type <= 4; type++) {
      filterRow(type, cur, prevRow, bpp, candidate);
      let score = 0;
      for (let i = 1; i <= stride; i++) score += candidate[i] < 128 ? candidate[i] : 256 - candidate[i];
      if (score < bestScore) {
        bestScore = score;
        dst.set(candidate);
      }
    }
    prevRow = cur.slice();
  }

  return assemblePng({ width, height, bitDepth, colourType: 0 }, raw, text);
}

/**
 * Assembles a PNG file from already filtered scanlines (each row prefixed by its filter type byte):
 * signature, IHDR (no interlace), tEXt chunks in sorted keyword order, one zlib-wrapped IDAT
 * (RFC 1950) and IEND. Used by every PNG writer of the project, greyscale and colour.
 */
export function assemblePng(
  header: { readonly width: number; readonly height: number; readonly bitDepth: 8 | 16; readonly colourType: 0 | 6 },
  filteredRows: Uint8Array,
  text: Readonly<Record<string, string>> = {},
): Uint8Array {
  const ihdr = new Uint8Array(13);
  const hv = new DataView(ihdr.buffer);
  hv.setUint32(0, header.width);
  hv.setUint32(4, header.height);
  ihdr[8] = header.bitDepth;
  ihdr[9] = header.colourType;
  const parts: Uint8Array[] = [Uint8Array.from(SIGNATURE), chunk('IHDR', ihdr)];
  for (const key of Object.keys(text).sort()) {
    if (key.length < 1 || key.length > 79 || key !== key.trim()) throw new RangeError(`'text' keyword must be 1-79 characters without leading or trailing spaces; got '${key}'`);
    const k = latin1Bytes(key, `'text' keyword '${key}'`);
    const v = latin1Bytes(text[key], `'text' value of '${key}'`);
    const body = new Uint8Array(k.length + 1 + v.length);
    body.set(k, 0);
    body.set(v, k.length + 1);
    parts.push(chunk('tEXt', body));
  }
  parts.push(chunk('IDAT', zlibSync(filteredRows, { level: 6 })));
  parts.push(chunk('IEND', new Uint8Array(0)));
  const size = parts.reduce((n, part) => n + part.length, 0);
  const out = new Uint8Array(size);
  let o = 0;
  for (const part of parts) {
    out.set(part, o);
    o += part.length;
  }
  return out;
}
