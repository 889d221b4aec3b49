import { describe, expect, it } from 'vitest';
import { PNG } from 'pngjs';
import { zlibSync } from 'fflate';
import { createRng } from '../core/seeded-random';
import { crc32, decodePng, encodePng } from './png-codec';
import { DatasetError } from './errors';

function randomGrey16(width: number, height: number, seed: number): Uint16Array {
  const rng = createRng(seed);
  const out = new Uint16Array(width * height);
  for (let i = 0; i < out.length; i++) out[i] = Math.floor(rng.next() * 65536);
  return out;
}

function gradient8(width: number, height: number): Uint8Array {
  const out = new Uint8Array(width * height);
  for (let y = 0; y < height; y++) for (let x = 0; x < width; x++) out[y * width + x] = (x * 7 + y * 13) & 0xff;
  return out;
}

/** Builds a PNG by hand from already-filtered scanlines, to exercise paths our encoder never writes. */
function handPng(ihdr: { width: number; height: number; depth: number; colourType: number }, rows: Uint8Array, extra: Array<[string, Uint8Array]> = []): Uint8Array {
  const chunk = (type: string, data: Uint8Array): Uint8Array => {
    const out = new Uint8Array(12 + data.length);
    const view = new DataView(out.buffer);
    view.setUint32(0, data.length);
    for (let i = 0; i < 4; i++) out[4 + i] = type.charCodeAt(i);
    out.set(data, 8);
    view.setUint32(8 + data.length, crc32(out, 4, 8 + data.length));
    return out;
  };
  const h = new Uint8Array(13);
  const v = new DataView(h.buffer);
  v.setUint32(0, ihdr.width);
  v.setUint32(4, ihdr.height);
  h[8] = ihdr.depth;
  h[9] = ihdr.colourType;
  const parts = [
    Uint8Array.from([0x89, 0x50, 0x4e, 0x47, 0x0d, 0x0a, 0x1a, 0x0a]),
    chunk('IHDR', h),
    ...extra.map(([t, d]) => chunk(t, d)),
    chunk('IDAT', zlibSync(rows)),
    chunk('IEND', new Uint8Array(0)),
  ];
  const out = new Uint8Array(parts.reduce((s, p) => s + p.length, 0));
  let o = 0;
  for (const p of parts) {
    out.set(p, o);
    o += p.length;
  }
  return out;
}

describe('png-codec', () => {
  it('crc32(bytes) matches the check value of the CRC-32 catalogue for "123456789"', () => {
    // Check value 0xCBF43926: CRC RevEng catalogue, CRC-32/ISO-HDLC (the CRC PNG uses).
    expect(crc32(new TextEncoder().encode('123456789'))).toBe(0xcbf43926);
  });

  it('encodePng/decodePng round-trip 8-bit and 16-bit greyscale with tEXt', () => {
    const d16 = randomGrey16(37, 23, 1);
    const png16 = encodePng({ width: 37, height: 23, bitDepth: 16, data: d16, text: { Source: 'phantom', Seed: '1' } });
    const back16 = decodePng(png16);
    expect(back16.bitDepth).toBe(16);
    expect(back16.channels).toBe(1);
    expect(Array.from(back16.data)).toEqual(Array.from(d16));
    expect(back16.text).toEqual({ Source: 'phantom', Seed: '1' });

    const d8 = gradient8(64, 9);
    const back8 = decodePng(encodePng({ width: 64, height: 9, bitDepth: 8, data: d8 }));
    expect(back8.bitDepth).toBe(8);
    expect(Array.from(back8.data)).toEqual(Array.from(d8));
  });

  it('encodePng(...) of one pixel and of extreme values round-trips', () => {
    for (const v of [0, 1, 65534, 65535]) {
      const back = decodePng(encodePng({ width: 1, height: 1, bitDepth: 16, data: Uint16Array.of(v) }));
      expect(back.data[0]).toBe(v);
    }
  });

  it('encodePng(...) is deterministic (byte-identical for the same input)', () => {
    const d = randomGrey16(16, 16, 7);
    const a = encodePng({ width: 16, height: 16, bitDepth: 16, data: d, text: { b: '2', a: '1' } });
    const b = encodePng({ width: 16, height: 16, bitDepth: 16, data: d.slice(), text: { a: '1', b: '2' } });
    expect(Buffer.from(a).equals(Buffer.from(b))).toBe(true);
  });

  it('encodePng(...) output is read identically by pngjs (external check: pngjs 7)', () => {
    const d16 = randomGrey16(31, 17, 3);
    const parsed16 = PNG.sync.read(Buffer.from(encodePng({ width: 31, height: 17, bitDepth: 16, data: d16 })), { skipRescale: true });
    expect(parsed16.width).toBe(31);
    const grey16 = Array.from({ length: 31 * 17 }, (_, i) => (parsed16.data as unknown as Uint16Array)[i * 4]);
    expect(grey16).toEqual(Array.from(d16));

    const d8 = gradient8(20, 11);
    const parsed8 = PNG.sync.read(Buffer.from(encodePng({ width: 20, height: 11, bitDepth: 8, data: d8 })));
    const grey8 = Array.from({ length: 20 * 11 }, (_, i) => parsed8.data[i * 4]);
    expect(grey8).toEqual(Array.from(d8));
  });

  it('decodePng(...) reads what pngjs writes: grey, grey+alpha, RGB, RGBA at 8 and 16 bits (external check: pngjs 7)', () => {
    const w = 13;
    const h = 7;
    const rng = createRng(11);
    for (const bitDepth of [8, 16] as const) {
      for (const colorType of [0, 2, 4, 6] as const) {
        const max = bitDepth === 16 ? 65535 : 255;
        const rgba = new Array<number>(w * h * 4);
        for (let i = 0; i < w * h; i++) {
          const g = Math.floor(rng.next() * (max + 1));
          const isGrey = colorType === 0 || colorType === 4;
          rgba[i * 4] = g;
          rgba[i * 4 + 1] = isGrey ? g : Math.floor(rng.next() * (max + 1));
          rgba[i * 4 + 2] = isGrey ? g : Math.floor(rng.next() * (max + 1));
          rgba[i * 4 + 3] = colorType === 4 || colorType === 6 ? Math.floor(rng.next() * (max + 1)) : max;
        }
        const png = new PNG({ width: w, height: h, bitDepth, colorType, inputColorType: 6, inputHasAlpha: true });
        const input = bitDepth === 16 ? Uint16Array.from(rgba) : Uint8Array.from(rgba);
        png.data = Buffer.from(input.buffer);
        const bytes = PNG.sync.write(png, { bitDepth, colorType, inputColorType: 6, inputHasAlpha: true });
        const decoded = decodePng(new Uint8Array(bytes));
        expect(decoded.bitDepth).toBe(bitDepth);
        expect(decoded.colourType).toBe(colorType);
        const ch = decoded.channels;
        for (let i = 0; i < w * h; i++) {
          const expected = ch === 1 ? [rgba[i * 4]] : ch === 2 ? [rgba[i * 4], rgba[i * 4 + 3]] : ch === 3 ? rgba.slice(i * 4, i * 4 + 3) : rgba.slice(i * 4, i * 4 + 4);
          expect(Array.from(decoded.data.subarray(i * ch, i * ch + ch))).toEqual(expected);
        }
      }
    }
  });

  it('decodePng(...) reverses all five filter types (hand-filtered rows)', () => {
    // 3x5 grey 8-bit; row y uses filter y. Target pixels and filters worked out per PNG spec section 9.
    const target = [
      [10, 20, 30],
      [15, 25, 5],
      [200, 100, 50],
      [1, 2, 3],
      [250, 0, 128],
    ];
    const paeth = (a: number, b: number, c: number): number => {
      const p = a + b - c;
      const pa = Math.abs(p - a), pb = Math.abs(p - b), pc = Math.abs(p - c);
      return pa <= pb && pa <= pc ? a : pb <= pc ? b : c;
    };
    const rows: number[] = [];
    target.forEach((row, y) => {
      rows.push(y);
      row.forEach((v, x) => {
        const a = x > 0 ? row[x - 1] : 0;
        const b = y > 0 ? target[y - 1][x] : 0;
        const c = x > 0 && y > 0 ? target[y - 1][x - 1] : 0;
        const pred = [0, a, b, (a + b) >> 1, paeth(a, b, c)][y];
        rows.push((v - pred) & 0xff);
      });
    });
    const png = handPng({ width: 3, height: 5, depth: 8, colourType: 0 }, Uint8Array.from(rows));
    expect(Array.from(decodePng(png).data)).toEqual(target.flat());
  });

  it('decodePng(...) expands palettes (with tRNS) and 1/2/4-bit grey', () => {
    const plte = Uint8Array.of(0, 0, 0, 255, 0, 0, 0, 255, 0, 9, 9, 9);
    const trns = Uint8Array.of(255, 128);
    // 4-bit palette, 3 pixels: indices 1, 2, 3 -> bytes 0x12, 0x30
    const pal = decodePng(handPng({ width: 3, height: 1, depth: 4, colourType: 3 }, Uint8Array.of(0, 0x12, 0x30), [['PLTE', plte], ['tRNS', trns]]));
    expect(pal.channels).toBe(4);
    expect(Array.from(pal.data)).toEqual([255, 0, 0, 128, 0, 255, 0, 255, 9, 9, 9, 255]);

    // 1-bit grey: 10 pixels 1,0,1,1,0,0,0,1 | 1,0 -> 0xB1, 0x80
    const g1 = decodePng(handPng({ width: 10, height: 1, depth: 1, colourType: 0 }, Uint8Array.of(0, 0xb1, 0x80)));
    expect(Array.from(g1.data)).toEqual([255, 0, 255, 255, 0, 0, 0, 255, 255, 0]);
    // 2-bit grey: 0,1,2,3 -> 0x1B -> 0, 85, 170, 255
    const g2 = decodePng(handPng({ width: 4, height: 1, depth: 2, colourType: 0 }, Uint8Array.of(0, 0x1b)));
    expect(Array.from(g2.data)).toEqual([0, 85, 170, 255]);
    // 4-bit grey: 15, 0 -> 0xF0
    const g4 = decodePng(handPng({ width: 2, height: 1, depth: 4, colourType: 0 }, Uint8Array.of(0, 0xf0)));
    expect(Array.from(g4.data)).toEqual([255, 0]);
  });

  it('decodePng(truncated) throws DatasetError unreadable-image naming the file', () => {
    const png = encodePng({ width: 8, height: 8, bitDepth: 8, data: gradient8(8, 8) });
    for (const cut of [0, 5, 20, png.length - 20, png.length - 3]) {
      try {
        decodePng(png.subarray(0, cut), 'studies/s1.png');
        expect.unreachable();
      } catch (e) {
        expect(e).toBeInstanceOf(DatasetError);
        expect((e as DatasetError).code).toBe('unreadable-image');
        expect((e as DatasetError).message).toContain('studies/s1.png');
      }
    }
  });

  it('decodePng(corrupted) reports a CRC mismatch', () => {
    const png = encodePng({ width: 8, height: 8, bitDepth: 8, data: gradient8(8, 8) });
    const bad = png.slice();
    bad[40] ^= 0xff;
    expect(() => decodePng(bad, 'x.png')).toThrow(/CRC/);
  });

  it('decodePng(interlaced) is a clear unsupported-image error', () => {
    const h = handPng({ width: 1, height: 1, depth: 8, colourType: 0 }, Uint8Array.of(0, 0));
    const bytes = h.slice();
    bytes[8 + 8 + 12] = 1; // interlace method byte of IHDR
    const view = new DataView(bytes.buffer);
    view.setUint32(8 + 8 + 13, crc32(bytes, 12, 8 + 8 + 13));
    expect(() => decodePng(bytes, 'i.png')).toThrow(expect.objectContaining({ code: 'unsupported-image' }));
  });

  it('encodePng(...) rejects bad arguments naming the parameter', () => {
    expect(() => encodePng({ width: 0, height: 1, bitDepth: 8, data: new Uint8Array(0) })).toThrow(/'width'/);
    expect(() => encodePng({ width: 2, height: 2, bitDepth: 8, data: new Uint8Array(3) })).toThrow(/'data'/);
    expect(() => encodePng({ width: 1, height: 1, bitDepth: 16, data: new Uint8Array(1) })).toThrow(TypeError);
    expect(() => encodePng({ width: 1, height: 1, bitDepth: 12 as 8, data: new Uint8Array(1) })).toThrow(/'bitDepth'/);
    expect(() => encodePng({ width: 1, height: 1, bitDepth: 8, data: new Uint8Array(1), text: { k: 'é€' } })).toThrow(/Latin-1/);
  });
});
