/**
 * The cividis colour scale: perceptually uniform and readable with red-green colour-vision
 * deficiency (Nuñez, Anderton and Renslow 2018, "Optimizing colormaps with consideration for
 * color vision deficiency to enable accurate interpretation of scientific data", PLOS ONE 13(7):
 * e0199239). Control points are entries 0, 8, ..., 248 and 255 of the authors' published
 * 256-entry table (file colormaps/cividis.txt of their cmaputil repository), sRGB in [0, 1];
 * linear interpolation between them stays within 0.018 of every table entry.
 */
export const CIVIDIS_CONTROL_POINTS: readonly (readonly [number, number, number, number])[] = [
  [0, 0.0, 0.1262, 0.3015],
  [8, 0.0, 0.1492, 0.3537],
  [16, 0.0, 0.1714, 0.4102],
  [24, 0.0, 0.1901, 0.4365],
  [32, 0.0236, 0.213, 0.4314],
  [40, 0.1204, 0.2357, 0.4262],
  [48, 0.1752, 0.2583, 0.4224],
  [56, 0.2183, 0.2808, 0.4204],
  [64, 0.2556, 0.3032, 0.4201],
  [72, 0.2894, 0.3256, 0.4215],
  [80, 0.3209, 0.3481, 0.4244],
  [88, 0.3509, 0.3706, 0.4288],
  [96, 0.3798, 0.3933, 0.4346],
  [104, 0.408, 0.4161, 0.4419],
  [112, 0.4354, 0.439, 0.4508],
  [120, 0.4622, 0.4622, 0.462],
  [128, 0.4897, 0.4856, 0.4714],
  [136, 0.5196, 0.5095, 0.4737],
  [144, 0.5502, 0.5338, 0.4735],
  [152, 0.5813, 0.5584, 0.4714],
  [160, 0.6129, 0.5835, 0.4673],
  [168, 0.6449, 0.6089, 0.4617],
  [176, 0.6773, 0.6347, 0.4543],
  [184, 0.7101, 0.661, 0.445],
  [192, 0.7434, 0.6877, 0.4338],
  [200, 0.7771, 0.715, 0.4205],
  [208, 0.8114, 0.7427, 0.4049],
  [216, 0.8461, 0.771, 0.3869],
  [224, 0.8813, 0.7998, 0.3657],
  [232, 0.9172, 0.8293, 0.3409],
  [240, 0.9536, 0.8593, 0.3116],
  [248, 0.9907, 0.8901, 0.2759],
  [255, 1.0, 0.9169, 0.2731],
];

/**
 * cividis at t in [0, 1] (clamped) as sRGB fractions [r, g, b] in [0, 1], by linear interpolation
 * between the control points in table-entry units (t = entry / 255). NaN gives undefined.
 */
export function cividis(t: number): [number, number, number] | undefined {
  if (Number.isNaN(t)) return undefined;
  const e = Math.max(0, Math.min(1, t)) * 255;
  const pts = CIVIDIS_CONTROL_POINTS;
  let i = 0;
  while (i < pts.length - 2 && pts[i + 1][0] < e) i++;
  const [e0, r0, g0, b0] = pts[i];
  const [e1, r1, g1, b1] = pts[i + 1];
  const f = (e - e0) / (e1 - e0);
  return [r0 + f * (r1 - r0), g0 + f * (g1 - g0), b0 + f * (b1 - b0)];
}

/** An sRGB fraction triple as '#rrggbb'. */
export function rgbToHex([r, g, b]: readonly [number, number, number]): string {
  const byte = (v: number): string => Math.round(Math.max(0, Math.min(1, v)) * 255).toString(16).padStart(2, '0');
  return `#${byte(r)}${byte(g)}${byte(b)}`;
}

/** cividis(t) as '#rrggbb'; undefined for NaN. */
export function cividisHex(t: number): string | undefined {
  const c = cividis(t);
  return c && rgbToHex(c);
}

/** The smallest and largest finite values; undefined when there are none. */
export function valueDomain(values: ArrayLike<number>): [number, number] | undefined {
  let lo = Infinity;
  let hi = -Infinity;
  for (let i = 0; i < values.length; i++) {
    const v = values[i];
    if (Number.isFinite(v)) {
      if (v < lo) lo = v;
      if (v > hi) hi = v;
    }
  }
  return lo <= hi ? [lo, hi] : undefined;
}

/** Position of v in the domain, in [0, 1]; a one-value domain gives 0.5; NaN stays NaN. */
export function normaliseToDomain(v: number, [lo, hi]: readonly [number, number]): number {
  if (Number.isNaN(v)) return NaN;
  if (!(hi > lo)) return 0.5;
  return Math.max(0, Math.min(1, (v - lo) / (hi - lo)));
}
