import { assemblePng } from '../../dataset/png-codec';
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

  return assemblePng({ width, height, bitDepth: 8, colourType: 6 }, raw, text);
}
