import type { ResizeTransform, Size } from './types';

/** One axis of a separable resampling: output o reads source indices start[o] .. start[o] + count[o] - 1. */
interface AxisTaps {
  readonly inside: Uint8Array;
  readonly start: Int32Array;
  readonly count: Int32Array;
  readonly weightOffset: Int32Array;
  readonly weights: Float64Array;
}

function axisTaps(outN: number, srcN: number, scale: number, offset: number): AxisTaps {
  const inside = new Uint8Array(outN);
  const start = new Int32Array(outN);
  const count = new Int32Array(outN);
  const weightOffset = new Int32Array(outN);
  const factor = 1 / scale;
  const area = factor > 2;
  const weights: number[] = [];
  for (let o = 0; o < outN; o++) {
    const centre = (o + 0.5 - offset) / scale;
    weightOffset[o] = weights.length;
    if (!(centre >= 0 && centre <= srcN)) continue;
    inside[o] = 1;
    if (!area) {
      const g = Math.min(Math.max(centre - 0.5, 0), srcN - 1);
      const i0 = Math.floor(g);
      const t = g - i0;
      start[o] = i0;
      if (t > 0 && i0 + 1 < srcN) {
        count[o] = 2;
        weights.push(1 - t, t);
      } else {
        count[o] = 1;
        weights.push(1);
      }
      continue;
    }
    const a = Math.max(0, (o - offset) / scale);
    const b = Math.min(srcN, (o + 1 - offset) / scale);
    const i0 = Math.floor(a);
    const i1 = Math.min(srcN - 1, Math.ceil(b) - 1);
    start[o] = i0;
    count[o] = i1 - i0 + 1;
    const len = b - a;
    for (let i = i0; i <= i1; i++) weights.push((Math.min(b, i + 1) - Math.max(a, i)) / len);
  }
  return { inside, start, count, weightOffset, weights: Float64Array.from(weights) };
}

/**
 * Resamples a single-channel image (row-major, srcSize.width x srcSize.height) into the encoder
 * input (t.input.width x t.input.height) through the resize transform. Pixel-centre convention:
 * input pixel u samples the source at x = (u + 0.5 - offsetX) / scaleX - 0.5 (source index
 * space), likewise in y. Bilinear interpolation with edge clamping while the source shrinks by at
 * most 2x along an axis; beyond that the axis uses area averaging (each input pixel is the
 * overlap-weighted mean of the source pixels under its pre-image), since two bilinear taps would
 * skip source pixels and alias. Input pixels whose centre maps outside the source (letterbox
 * padding) get padValue. The axes are separable, so the cost is O(srcH * inW + inH * inW * taps).
 * The one resampler of the project: preprocessing and the phantom generator both use it.
 */
export function resampleToInput(src: Float32Array, srcSize: Size, t: ResizeTransform, padValue = 0): Float32Array {
  const sw = srcSize.width;
  const sh = srcSize.height;
  if (!(Number.isInteger(sw) && sw >= 1 && Number.isInteger(sh) && sh >= 1)) {
    throw new RangeError(`'srcSize' must have integer width and height >= 1; got ${sw} x ${sh}`);
  }
  if (src.length !== sw * sh) throw new RangeError(`'src' must hold ${sw} x ${sh} = ${sw * sh} values; got ${src.length}`);
  const ow = t.input.width;
  const oh = t.input.height;
  if (!(Number.isInteger(ow) && ow >= 1 && Number.isInteger(oh) && oh >= 1)) {
    throw new RangeError(`'t.input' must have integer width and height >= 1; got ${ow} x ${oh}`);
  }
  const tx = axisTaps(ow, sw, t.scaleX, t.offsetX);
  const ty = axisTaps(oh, sh, t.scaleY, t.offsetY);
  const needed = new Uint8Array(sh);
  for (let o = 0; o < oh; o++) {
    if (ty.inside[o]) for (let k = 0; k < ty.count[o]; k++) needed[ty.start[o] + k] = 1;
  }
  const rows = new Float64Array(sh * ow);
  for (let y = 0; y < sh; y++) {
    if (!needed[y]) continue;
    const so = y * sw;
    const ro = y * ow;
    for (let o = 0; o < ow; o++) {
      if (!tx.inside[o]) continue;
      const s0 = so + tx.start[o];
      const w0 = tx.weightOffset[o];
      let acc = 0;
      for (let k = 0; k < tx.count[o]; k++) acc += tx.weights[w0 + k] * src[s0 + k];
      rows[ro + o] = acc;
    }
  }
  const out = new Float32Array(ow * oh);
  for (let o = 0; o < oh; o++) {
    const oo = o * ow;
    if (!ty.inside[o]) {
      out.fill(padValue, oo, oo + ow);
      continue;
    }
    const r0 = ty.start[o];
    const w0 = ty.weightOffset[o];
    const n = ty.count[o];
    for (let u = 0; u < ow; u++) {
      if (!tx.inside[u]) {
        out[oo + u] = padValue;
        continue;
      }
      let acc = 0;
      for (let k = 0; k < n; k++) acc += ty.weights[w0 + k] * rows[(r0 + k) * ow + u];
      out[oo + u] = acc;
    }
  }
  return out;
}
