/** Similarity transform about the image centre: rotation, zoom and a shift, in output pixels. */
export interface PlaneTransform {
  readonly angle: number; // radians; positive turns the content clockwise on screen (y points down)
  readonly scale?: number; // > 1 enlarges the content
  readonly shiftX?: number;
  readonly shiftY?: number;
}

/** Maps an output pixel to its source point: inverse rotation and zoom about the centre. */
function sourceMapper(size: number, { angle, scale = 1, shiftX = 0, shiftY = 0 }: PlaneTransform): (x: number, y: number) => [number, number] {
  const c = (size - 1) / 2;
  const cos = Math.cos(angle) / scale, sin = Math.sin(angle) / scale;
  return (x, y) => {
    const dx = x - c - shiftX, dy = y - c - shiftY;
    return [cos * dx + sin * dy + c, -sin * dx + cos * dy + c];
  };
}

const isIdentity = (t: PlaneTransform): boolean => t.angle === 0 && (t.scale ?? 1) === 1 && (t.shiftX ?? 0) === 0 && (t.shiftY ?? 0) === 0;

/**
 * Resamples a square row-major image under a rotation, zoom and shift about its centre, sampling
 * the source bilinearly; a source point outside the image takes the nearest edge pixel. The
 * identity transform returns a copy.
 */
export function transformImage(src: Float32Array, size: number, transform: PlaneTransform): Float32Array {
  if (isIdentity(transform) || size < 2) return Float32Array.from(src);
  const out = new Float32Array(size * size);
  const map = sourceMapper(size, transform);
  const last = size - 1;
  for (let y = 0; y < size; y++) {
    for (let x = 0; x < size; x++) {
      const [fx, fy] = map(x, y);
      // Edge replication keeps the corners from turning black.
      const sx = Math.min(last, Math.max(0, fx));
      const sy = Math.min(last, Math.max(0, fy));
      const ix = Math.min(last - 1, Math.floor(sx)), iy = Math.min(last - 1, Math.floor(sy));
      const tx = sx - ix, ty = sy - iy;
      const i = iy * size + ix;
      const top = src[i] + (src[i + 1] - src[i]) * tx;
      const bottom = src[i + size] + (src[i + size + 1] - src[i + size]) * tx;
      out[y * size + x] = top + (bottom - top) * ty;
    }
  }
  return out;
}

/** Resamples a binary mask like transformImage, taking the nearest source pixel (0 outside). */
export function transformMask(src: Uint8Array, size: number, transform: PlaneTransform): Uint8Array {
  if (isIdentity(transform)) return Uint8Array.from(src);
  const out = new Uint8Array(size * size);
  const map = sourceMapper(size, transform);
  for (let y = 0; y < size; y++) {
    for (let x = 0; x < size; x++) {
      const [fx, fy] = map(x, y);
      const sx = Math.round(fx), sy = Math.round(fy);
      if (sx >= 0 && sy >= 0 && sx < size && sy < size) out[y * size + x] = src[sy * size + sx];
    }
  }
  return out;
}
