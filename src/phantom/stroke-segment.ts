/**
 * Draws a line segment into a square row-major float buffer, keeping the larger of the existing
 * value and amp * profile(d), where d is the distance from the pixel centre to the segment:
 * profile is 1 within `radius` and falls off as a Gaussian of width `soft` beyond it.
 */
export function strokeSegment(
  buf: Float32Array,
  size: number,
  seg: { x0: number; y0: number; x1: number; y1: number },
  radius: number,
  soft: number,
  amp: number,
): void {
  const reach = radius + 3 * soft + 1;
  const xmin = Math.max(0, Math.floor(Math.min(seg.x0, seg.x1) - reach));
  const xmax = Math.min(size - 1, Math.ceil(Math.max(seg.x0, seg.x1) + reach));
  const ymin = Math.max(0, Math.floor(Math.min(seg.y0, seg.y1) - reach));
  const ymax = Math.min(size - 1, Math.ceil(Math.max(seg.y0, seg.y1) + reach));
  const dx = seg.x1 - seg.x0, dy = seg.y1 - seg.y0;
  const len2 = dx * dx + dy * dy;
  const inv2s2 = soft > 0 ? 1 / (2 * soft * soft) : 0;
  for (let y = ymin; y <= ymax; y++) {
    const py = y + 0.5;
    for (let x = xmin; x <= xmax; x++) {
      const px = x + 0.5;
      let t = len2 > 0 ? ((px - seg.x0) * dx + (py - seg.y0) * dy) / len2 : 0;
      t = t < 0 ? 0 : t > 1 ? 1 : t;
      const ex = px - (seg.x0 + t * dx), ey = py - (seg.y0 + t * dy);
      const d = Math.sqrt(ex * ex + ey * ey);
      let v: number;
      if (d <= radius) v = amp;
      else if (soft > 0) {
        const e = d - radius;
        if (e > 3 * soft) continue;
        v = amp * Math.exp(-e * e * inv2s2);
      } else continue;
      const i = y * size + x;
      if (v > buf[i]) buf[i] = v;
    }
  }
}
