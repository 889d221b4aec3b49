import { GLYPH_ADVANCE, GLYPH_HEIGHT, GLYPH_WIDTH, LINE_HEIGHT, glyphBits } from './bitmap-font';

/** An sRGB colour with alpha, each channel an integer 0..255. */
export type Rgba = readonly [number, number, number, number];

/** A row-major RGBA image, 8 bits per channel; pixel (x, y) starts at data[(y * width + x) * 4]. */
export interface Raster {
  readonly width: number;
  readonly height: number;
  readonly data: Uint8Array;
}

/** Parses '#rrggbb' (opaque) or '#rrggbbaa' into an Rgba; throws TypeError on anything else. */
export function hexColour(hex: string): Rgba {
  const m = /^#([0-9a-fA-F]{6})([0-9a-fA-F]{2})?$/.exec(hex);
  if (!m) throw new TypeError(`'hex' must look like '#rrggbb' or '#rrggbbaa'; got '${hex}'`);
  const v = parseInt(m[1], 16);
  return [(v >> 16) & 0xff, (v >> 8) & 0xff, v & 0xff, m[2] === undefined ? 255 : parseInt(m[2], 16)];
}

function checkColour(colour: Rgba, name: string): void {
  if (colour.length !== 4 || colour.some((c) => !Number.isInteger(c) || c < 0 || c > 255)) {
    throw new RangeError(`'${name}' must be four integers in [0, 255]; got [${colour.join(', ')}]`);
  }
}

/** A width x height raster filled with `background`. Throws RangeError for non-positive or non-integer sizes. */
export function createRaster(width: number, height: number, background: Rgba): Raster {
  if (!Number.isInteger(width) || width < 1 || width > 16384) throw new RangeError(`'width' must be an integer in [1, 16384]; got ${width}`);
  if (!Number.isInteger(height) || height < 1 || height > 16384) throw new RangeError(`'height' must be an integer in [1, 16384]; got ${height}`);
  checkColour(background, 'background');
  const data = new Uint8Array(width * height * 4);
  data.set(background, 0);
  // Doubling copies fill the buffer in log2(pixels) steps.
  for (let filled = 4; filled < data.length; filled *= 2) data.copyWithin(filled, 0, Math.min(filled, data.length - filled));
  return { width, height, data };
}

/** The colour at (x, y), or undefined outside the raster. */
export function pixelAt(raster: Raster, x: number, y: number): Rgba | undefined {
  if (!Number.isInteger(x) || !Number.isInteger(y) || x < 0 || y < 0 || x >= raster.width || y >= raster.height) return undefined;
  const i = (y * raster.width + x) * 4;
  const d = raster.data;
  return [d[i], d[i + 1], d[i + 2], d[i + 3]];
}

/**
 * Fills the rectangle [x, x + w) x [y, y + h), corners rounded to whole pixels and clipped to the
 * raster; the colour replaces what was there (no blending). Empty or off-raster rectangles draw nothing.
 */
export function fillRect(raster: Raster, x: number, y: number, w: number, h: number, colour: Rgba): void {
  checkColour(colour, 'colour');
  if (![x, y, w, h].every(Number.isFinite)) return;
  const x0 = Math.max(0, Math.round(x));
  const y0 = Math.max(0, Math.round(y));
  const x1 = Math.min(raster.width, Math.round(x + w));
  const y1 = Math.min(raster.height, Math.round(y + h));
  if (x1 <= x0 || y1 <= y0) return;
  const d = raster.data;
  const rowStart = (y0 * raster.width + x0) * 4;
  for (let px = 0; px < x1 - x0; px++) d.set(colour, rowStart + px * 4);
  // Later rows copy the first one.
  for (let py = y0 + 1; py < y1; py++) d.copyWithin((py * raster.width + x0) * 4, rowStart, rowStart + (x1 - x0) * 4);
}

export interface LineOptions {
  /** Pen width in pixels; each step of the line stamps a thickness x thickness square. */
  readonly thickness?: number;
  /** [on, off] lengths in steps for a dashed line; omitted for a solid one. */
  readonly dash?: readonly [number, number];
}

/**
 * Draws a line from (x0, y0) to (x1, y1) (rounded to pixel centres) with Bresenham's algorithm
 * (Bresenham 1965, IBM Systems Journal 4(1)), stamping a square pen centred on each step; clipped.
 */
export function drawLine(
  raster: Raster,
  x0: number,
  y0: number,
  x1: number,
  y1: number,
  colour: Rgba,
  { thickness = 1, dash }: LineOptions = {},
): void {
  if (!Number.isInteger(thickness) || thickness < 1) throw new RangeError(`'thickness' must be a positive integer; got ${thickness}`);
  if (dash && (dash.length !== 2 || !dash.every((d) => Number.isInteger(d) && d >= 1))) {
    throw new RangeError(`'dash' must be two positive integers [on, off]; got [${dash.join(', ')}]`);
  }
  if (![x0, y0, x1, y1].every(Number.isFinite)) return;
  let x = Math.round(x0);
  let y = Math.round(y0);
  const xe = Math.round(x1);
  const ye = Math.round(y1);
  const dx = Math.abs(xe - x);
  const dy = -Math.abs(ye - y);
  const sx = x < xe ? 1 : -1;
  const sy = y < ye ? 1 : -1;
  let err = dx + dy;
  const half = Math.floor((thickness - 1) / 2);
  for (let step = 0; ; step++) {
    const on = !dash || step % (dash[0] + dash[1]) < dash[0];
    if (on) fillRect(raster, x - half, y - half, thickness, thickness, colour);
    if (x === xe && y === ye) break;
    const e2 = 2 * err;
    if (e2 >= dy) {
      err += dy;
      x += sx;
    }
    if (e2 <= dx) {
      err += dx;
      y += sy;
    }
  }
}

export interface TextOptions {
  /** Each font pixel becomes a scale x scale block. */
  readonly scale?: number;
  /** 0 reads left to right; 90 reads bottom to top (for a vertical axis label). */
  readonly rotate?: 0 | 90;
}

function checkScale(scale: number): void {
  if (!Number.isInteger(scale) || scale < 1 || scale > 16) throw new RangeError(`'scale' must be an integer in [1, 16]; got ${scale}`);
}

/** Width in pixels of `text` drawn unrotated at `scale` (0 for the empty string); one line, no wrapping. */
export function textWidth(text: string, scale = 1): number {
  checkScale(scale);
  const n = [...text].length;
  return n === 0 ? 0 : (n * GLYPH_ADVANCE - (GLYPH_ADVANCE - GLYPH_WIDTH)) * scale;
}

/** Height in pixels of one line of text at `scale` (the glyph height; spacing excluded). */
export function textHeight(scale = 1): number {
  checkScale(scale);
  return GLYPH_HEIGHT * scale;
}

/** Line advance in pixels at `scale`, for stacking lines. */
export function lineAdvance(scale = 1): number {
  checkScale(scale);
  return LINE_HEIGHT * scale;
}

/**
 * Draws one line of `text` in the built-in bitmap font with its bounding box's top-left corner at
 * (x, y). Rotated by 90 the box is textHeight wide and textWidth tall, and the text reads upwards.
 * Characters outside printable ASCII draw as '?'. Clipped to the raster.
 */
export function drawText(
  raster: Raster,
  text: string,
  x: number,
  y: number,
  colour: Rgba,
  { scale = 1, rotate = 0 }: TextOptions = {},
): void {
  checkScale(scale);
  const ox = Math.round(x);
  const oy = Math.round(y);
  const chars = [...text];
  const length = textWidth(text, scale);
  chars.forEach((ch, i) => {
    const bits = glyphBits(ch.codePointAt(0) ?? 63);
    for (let gy = 0; gy < GLYPH_HEIGHT; gy++) {
      for (let gx = 0; gx < GLYPH_WIDTH; gx++) {
        if (!bits[gy * GLYPH_WIDTH + gx]) continue;
        const u = (i * GLYPH_ADVANCE + gx) * scale; // along the reading direction
        const v = gy * scale; // across it, top of the glyph first
        if (rotate === 0) fillRect(raster, ox + u, oy + v, scale, scale, colour);
        else fillRect(raster, ox + v, oy + length - u - scale, scale, scale, colour);
      }
    }
  });
}
