import type { ImagePoint, ImageRect, InputRect, ResizePolicy, ResizeTransform, Size } from './types';

/** A point in encoder-input pixels. */
export interface InputPoint {
  readonly inputX: number;
  readonly inputY: number;
}

const POLICIES: readonly ResizePolicy[] = ['stretch', 'letterbox', 'centre-crop'];

function checkSize(name: string, s: Size): void {
  if (!(Number.isFinite(s?.width) && s.width > 0 && Number.isFinite(s.height) && s.height > 0)) {
    throw new RangeError(`'${name}' must have finite width and height > 0; got ${s?.width} x ${s?.height}`);
  }
}

/**
 * The exact affine map from original image pixels (source) to encoder-input pixels (input):
 * - stretch: scaleX = input.width / source.width, scaleY = input.height / source.height, no offset;
 * - letterbox: one scale s = min of the two ratios, the image centred, the rest padding
 *   (offsets (input - s * source) / 2 >= 0);
 * - centre-crop: s = max of the two ratios, centred, the overflow cropped (offsets <= 0).
 * Offsets are exact (fractional when the margins are odd); the resampler honours them, so no
 * rounding error enters the cell geometry. Sizes must be finite and > 0, else RangeError.
 */
export function computeResizeTransform(source: Size, input: Size, policy: ResizePolicy): ResizeTransform {
  checkSize('source', source);
  checkSize('input', input);
  if (!POLICIES.includes(policy)) {
    throw new RangeError(`'policy' must be one of ${POLICIES.join(', ')}; got '${String(policy)}'`);
  }
  const rx = input.width / source.width;
  const ry = input.height / source.height;
  if (policy === 'stretch') {
    return { policy, source, input, scaleX: rx, scaleY: ry, offsetX: 0, offsetY: 0 };
  }
  const s = policy === 'letterbox' ? Math.min(rx, ry) : Math.max(rx, ry);
  // The axis that sets the scale fills the input exactly; its offset is 0 by construction, not by
  // float rounding (400 * (224 / 400) is 224.00000000000003).
  return {
    policy,
    source,
    input,
    scaleX: s,
    scaleY: s,
    offsetX: s === rx ? 0 : (input.width - source.width * s) / 2,
    offsetY: s === ry ? 0 : (input.height - source.height * s) / 2,
  };
}

/** Maps an image-pixel rectangle to input pixels (no clipping). */
export function imageRectToInput(t: ResizeTransform, r: ImageRect): InputRect {
  return {
    inputX: r.x * t.scaleX + t.offsetX,
    inputY: r.y * t.scaleY + t.offsetY,
    inputW: r.w * t.scaleX,
    inputH: r.h * t.scaleY,
  };
}

/** Maps an input-pixel rectangle back to image pixels (no clipping; may extend past the image). */
export function inputRectToImage(t: ResizeTransform, r: InputRect): ImageRect {
  return {
    x: (r.inputX - t.offsetX) / t.scaleX,
    y: (r.inputY - t.offsetY) / t.scaleY,
    w: r.inputW / t.scaleX,
    h: r.inputH / t.scaleY,
  };
}

/** Maps an image-pixel point to input pixels. */
export function imagePointToInput(t: ResizeTransform, p: ImagePoint): InputPoint {
  return { inputX: p.x * t.scaleX + t.offsetX, inputY: p.y * t.scaleY + t.offsetY };
}

/** Maps an input-pixel point back to image pixels. */
export function inputPointToImage(t: ResizeTransform, p: InputPoint): ImagePoint {
  return { x: (p.inputX - t.offsetX) / t.scaleX, y: (p.inputY - t.offsetY) / t.scaleY };
}
