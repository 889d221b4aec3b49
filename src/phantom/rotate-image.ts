/**
 * Rotates a square row-major image by `angle` radians about its centre (positive turns the
 * content clockwise on screen, y pointing down), sampling the source bilinearly; a source point
 * outside the image takes the nearest edge pixel. Angle 0 returns a copy.
 */
export function rotateImage(src: Float32Array, size: number, angle: number): Float32Array {
  if (angle === 0 || size < 2) return Float32Array.from(src);
  const out = new Float32Array(size * size);
  const c = (size - 1) / 2;
  const cos = Math.cos(angle), sin = Math.sin(angle);
  const last = size - 1;
  for (let y = 0; y < size; y++) {
    for (let x = 0; x < size; x++) {
      const dx = x - c, dy = y - c;
      // Edge replication keeps the rotated corners from turning black.
      const sx = Math.min(last, Math.max(0, cos * dx + sin * dy + c));
      const sy = Math.min(last, Math.max(0, -sin * dx + cos * dy + c));
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

/** Rotates a binary mask like rotateImage, taking the nearest source pixel. */
export function rotateMask(src: Uint8Array, size: number, angle: number): Uint8Array {
  if (angle === 0) return Uint8Array.from(src);
  const out = new Uint8Array(size * size);
  const c = (size - 1) / 2;
  const cos = Math.cos(angle), sin = Math.sin(angle);
  for (let y = 0; y < size; y++) {
    for (let x = 0; x < size; x++) {
      const dx = x - c, dy = y - c;
      const sx = Math.round(cos * dx + sin * dy + c);
      const sy = Math.round(-sin * dx + cos * dy + c);
      if (sx >= 0 && sy >= 0 && sx < size && sy < size) out[y * size + x] = src[sy * size + sx];
    }
  }
  return out;
}
