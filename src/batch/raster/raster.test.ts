import { describe, expect, it } from 'vitest';
import { GLYPH_ASCENT, GLYPH_HEIGHT, GLYPH_WIDTH, glyphBits, glyphRows } from './bitmap-font';
import { createRaster, drawLine, drawText, fillRect, hexColour, pixelAt, textWidth, type Raster, type Rgba } from './raster';

const WHITE: Rgba = [255, 255, 255, 255];
const INK: Rgba = [0, 0, 0, 255];

function inkCount(r: Raster, colour: Rgba = INK): number {
  let n = 0;
  for (let i = 0; i < r.data.length; i += 4) {
    if (r.data[i] === colour[0] && r.data[i + 1] === colour[1] && r.data[i + 2] === colour[2] && r.data[i + 3] === colour[3]) n++;
  }
  return n;
}

describe('bitmap font', () => {
  it('glyphRows covers printable ASCII 32-126 with 9 rows of 5 cells', () => {
    for (let code = 32; code <= 126; code++) {
      const rows = glyphRows(String.fromCharCode(code));
      expect(rows, `code ${code}`).toBeDefined();
      expect(rows!.length).toBe(GLYPH_HEIGHT);
      for (const row of rows!) expect(row).toMatch(new RegExp(`^[.#]{${GLYPH_WIDTH}}$`));
    }
  });

  it('glyphRows uses the descender rows only for g j p q y , ;', () => {
    const withDescender: string[] = [];
    for (let code = 32; code <= 126; code++) {
      const ch = String.fromCharCode(code);
      if (glyphRows(ch)!.slice(GLYPH_ASCENT).some((row) => row.includes('#'))) withDescender.push(ch);
    }
    expect(withDescender.sort()).toEqual([',', ';', 'g', 'j', 'p', 'q', 'y']);
  });

  it('glyphBits gives every printable character a distinct glyph, ink in all but the space', () => {
    const seen = new Map<string, string>();
    for (let code = 32; code <= 126; code++) {
      const key = Array.from(glyphBits(code)).join('');
      expect(seen.get(key), `'${String.fromCharCode(code)}' duplicates '${seen.get(key)}'`).toBeUndefined();
      seen.set(key, String.fromCharCode(code));
      const ink = Array.from(glyphBits(code)).reduce((s, b) => s + b, 0);
      if (code === 32) expect(ink).toBe(0);
      else expect(ink).toBeGreaterThan(0);
    }
  });

  it("glyphBits maps codes outside ASCII 32-126 to '?'", () => {
    expect(Array.from(glyphBits(0x00e9))).toEqual(Array.from(glyphBits(63)));
    expect(Array.from(glyphBits(10))).toEqual(Array.from(glyphBits(63)));
  });
});

describe('raster', () => {
  it('createRaster(w, h, bg) fills every pixel with the background', () => {
    const r = createRaster(3, 2, [1, 2, 3, 4]);
    expect(r.data.length).toBe(24);
    expect(pixelAt(r, 2, 1)).toEqual([1, 2, 3, 4]);
    expect(pixelAt(r, 3, 0)).toBeUndefined();
  });

  it('createRaster rejects bad sizes and colours naming the parameter', () => {
    expect(() => createRaster(0, 2, WHITE)).toThrow(/'width'/);
    expect(() => createRaster(2, 1.5, WHITE)).toThrow(/'height'/);
    expect(() => createRaster(2, 2, [0, 0, 256, 255])).toThrow(/'background'/);
  });

  it("hexColour('#0072B2') parses to opaque RGB and rejects malformed input", () => {
    expect(hexColour('#0072B2')).toEqual([0, 114, 178, 255]);
    expect(hexColour('#00000080')).toEqual([0, 0, 0, 128]);
    expect(() => hexColour('0072B2')).toThrow(TypeError);
  });

  it('fillRect clips to the raster and covers exactly w x h pixels inside it', () => {
    const r = createRaster(10, 10, WHITE);
    fillRect(r, 2, 3, 4, 5, INK);
    expect(inkCount(r)).toBe(20);
    expect(pixelAt(r, 2, 3)).toEqual(INK);
    expect(pixelAt(r, 5, 7)).toEqual(INK);
    expect(pixelAt(r, 6, 7)).toEqual(WHITE);
    fillRect(r, -5, -5, 7, 7, INK); // 2x2 visible
    expect(inkCount(r)).toBe(24);
    fillRect(r, 0, 0, NaN, 3, INK);
    fillRect(r, 20, 20, 5, 5, INK);
    fillRect(r, 0, 0, -3, 3, INK);
    expect(inkCount(r)).toBe(24);
  });

  it('drawLine draws both end points and a thickness-wide horizontal band', () => {
    const r = createRaster(20, 20, WHITE);
    drawLine(r, 1, 1, 15, 9, INK);
    expect(pixelAt(r, 1, 1)).toEqual(INK);
    expect(pixelAt(r, 15, 9)).toEqual(INK);
    expect(inkCount(r)).toBe(15); // Bresenham: one pixel per step along the major axis
    const t = createRaster(20, 20, WHITE);
    drawLine(t, 2, 10, 11, 10, INK, { thickness: 3 });
    expect(inkCount(t)).toBe((10 + 2) * 3); // the square pen overhangs each end by one pixel
    expect(pixelAt(t, 5, 9)).toEqual(INK);
    expect(pixelAt(t, 5, 11)).toEqual(INK);
    expect(pixelAt(t, 5, 12)).toEqual(WHITE);
  });

  it('drawLine with dash [2, 2] inks half of a long line', () => {
    const r = createRaster(20, 3, WHITE);
    drawLine(r, 0, 1, 15, 1, INK, { dash: [2, 2] });
    expect(inkCount(r)).toBe(8);
    expect(() => drawLine(r, 0, 0, 1, 1, INK, { thickness: 0 })).toThrow(/'thickness'/);
  });

  it('drawText inks the glyph cells at the given scale', () => {
    const r = createRaster(30, 30, WHITE);
    drawText(r, 'I', 1, 1, INK, { scale: 2 });
    const glyphInk = Array.from(glyphBits('I'.charCodeAt(0))).reduce((s, b) => s + b, 0);
    expect(inkCount(r)).toBe(glyphInk * 4);
    expect(pixelAt(r, 1 + 2 * 2, 1)).toEqual(INK); // top bar of 'I' spans columns 1-3
  });

  it('drawText rotated by 90 is the transpose-and-flip of the unrotated text', () => {
    const text = 'Ab1';
    const w = textWidth(text);
    const a = createRaster(w, GLYPH_HEIGHT, WHITE);
    drawText(a, text, 0, 0, INK);
    const b = createRaster(GLYPH_HEIGHT, w, WHITE);
    drawText(b, text, 0, 0, INK, { rotate: 90 });
    for (let y = 0; y < GLYPH_HEIGHT; y++) {
      for (let x = 0; x < w; x++) expect(pixelAt(b, y, w - 1 - x)).toEqual(pixelAt(a, x, y));
    }
  });

  it('textWidth is 6n - 1 font pixels, 0 for the empty string', () => {
    expect(textWidth('')).toBe(0);
    expect(textWidth('a')).toBe(5);
    expect(textWidth('abc', 3)).toBe(51);
    expect(() => textWidth('a', 0)).toThrow(/'scale'/);
  });
});
