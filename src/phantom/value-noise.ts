import type { Rng } from '../core/seeded-random';

/**
 * Smooth random texture: a (cells + 1)^2 lattice of uniform values in [-1, 1] interpolated with
 * a smoothstep-weighted bilinear blend (value noise; Perlin, SIGGRAPH 1985, describes the lattice idea).
 * Returns size * size values in [-1, 1]. cells < 1 is treated as 1.
 */
export function valueNoise(rng: Rng, size: number, cells: number): Float32Array {
  const c = Math.max(1, Math.floor(cells));
  const n = c + 1;
  const lattice = new Float32Array(n * n);
  for (let i = 0; i < lattice.length; i++) lattice[i] = rng.next() * 2 - 1;
  const out = new Float32Array(size * size);
  const step = c / size;
  for (let y = 0; y < size; y++) {
    const fy = (y + 0.5) * step;
    const iy = Math.min(c - 1, Math.floor(fy));
    let ty = fy - iy;
    ty = ty * ty * (3 - 2 * ty);
    for (let x = 0; x < size; x++) {
      const fx = (x + 0.5) * step;
      const ix = Math.min(c - 1, Math.floor(fx));
      let tx = fx - ix;
      tx = tx * tx * (3 - 2 * tx);
      const a = lattice[iy * n + ix], b = lattice[iy * n + ix + 1];
      const d = lattice[(iy + 1) * n + ix], e = lattice[(iy + 1) * n + ix + 1];
      out[y * size + x] = (a + (b - a) * tx) * (1 - ty) + (d + (e - d) * tx) * ty;
    }
  }
  return out;
}
