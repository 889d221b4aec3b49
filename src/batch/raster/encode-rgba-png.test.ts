import { PNG } from 'pngjs';
import { describe, expect, it } from 'vitest';
import { encodeRgbaPng } from './encode-rgba-png';
import { createRaster, fillRect } from './raster';

describe('encodeRgbaPng', () => {
  it('encodeRgbaPng(raster) decodes in pngjs to the same size and pixels', () => {
    const r = createRaster(17, 9, [255, 255, 255, 255]);
    fillRect(r, 3, 2, 5, 4, [0, 114, 178, 255]);
    fillRect(r, 10, 0, 2, 9, [230, 159, 0, 128]);
    const png = PNG.sync.read(Buffer.from(encodeRgbaPng(r, { Software: 'Tessera' })));
    expect(png.width).toBe(17);
    expect(png.height).toBe(9);
    expect(Array.from(png.data)).toEqual(Array.from(r.data));
  });

  it('encodeRgbaPng gives byte-identical output for the same raster', () => {
    const make = () => {
      const r = createRaster(40, 30, [255, 255, 255, 255]);
      fillRect(r, 5, 5, 20, 10, [213, 94, 0, 255]);
      return encodeRgbaPng(r, { b: '2', a: '1' });
    };
    expect(Buffer.from(make()).equals(Buffer.from(make()))).toBe(true);
  });

  it('encodeRgbaPng writes a colour-type-6 IHDR and tEXt chunks in sorted order', () => {
    const bytes = encodeRgbaPng(createRaster(2, 2, [0, 0, 0, 255]), { Zeta: 'z', Alpha: 'a' });
    expect(bytes[24]).toBe(8); // bit depth
    expect(bytes[25]).toBe(6); // colour type
    const latin = Buffer.from(bytes).toString('latin1');
    expect(latin.indexOf('tEXtAlpha')).toBeGreaterThan(0);
    expect(latin.indexOf('tEXtAlpha')).toBeLessThan(latin.indexOf('tEXtZeta'));
  });

  it('encodeRgbaPng rejects a data length that does not match the size, and non-Latin-1 text', () => {
    expect(() => encodeRgbaPng({ width: 2, height: 2, data: new Uint8Array(15) })).toThrow(/'raster.data'/);
    expect(() => encodeRgbaPng(createRaster(1, 1, [0, 0, 0, 255]), { k: '\u2192' })).toThrow(/Latin-1/);
  });
});
