import type { ImagePoint, ImageRect, LungZone } from './types';
import { LUNG_ZONES } from './types';

function thirds(lung: ImageRect): [ImageRect, ImageRect, ImageRect] {
  const y1 = lung.y + lung.h / 3;
  const y2 = lung.y + (2 * lung.h) / 3;
  const y3 = lung.y + lung.h;
  return [
    { x: lung.x, y: lung.y, w: lung.w, h: y1 - lung.y },
    { x: lung.x, y: y1, w: lung.w, h: y2 - y1 },
    { x: lung.x, y: y2, w: lung.w, h: y3 - y2 },
  ];
}

/**
 * The six lung zones from the two lung bounding rectangles (image pixels): each lung split into
 * upper, middle and lower thirds of its height (the six zones of the ILO International
 * Classification of Radiographs of Pneumoconioses). 'right' is the patient's right, which a
 * frontal radiograph shows on the viewer's left (display convention, common practice), so the
 * right lung must lie left of the left lung (centre x smaller), else RangeError; both need
 * positive finite size.
 */
export function zonesFromLungs(lungs: { right: ImageRect; left: ImageRect }): Record<LungZone, ImageRect> {
  for (const side of ['right', 'left'] as const) {
    const r = lungs[side];
    if (![r.x, r.y, r.w, r.h].every(Number.isFinite) || r.w <= 0 || r.h <= 0) {
      throw new RangeError(`'lungs.${side}' must have finite x, y and w, h > 0; got ${r.x}, ${r.y}, ${r.w}, ${r.h}`);
    }
  }
  const rc = lungs.right.x + lungs.right.w / 2;
  const lc = lungs.left.x + lungs.left.w / 2;
  if (!(rc < lc)) {
    throw new RangeError(
      `'lungs.right' (the patient's right) must lie on the viewer's left of 'lungs.left'; got centre x ${rc} >= ${lc}`,
    );
  }
  const [ru, rm, rl] = thirds(lungs.right);
  const [lu, lm, ll] = thirds(lungs.left);
  return {
    'right-upper': ru,
    'right-middle': rm,
    'right-lower': rl,
    'left-upper': lu,
    'left-middle': lm,
    'left-lower': ll,
  };
}

/**
 * The zone containing a point, or undefined outside every zone. A point on the line between two
 * thirds belongs to the lower one; a lung's own outline (left, right and bottom edges included)
 * belongs to it. Right zones are tested first.
 */
export function zoneOfPoint(zones: Record<LungZone, ImageRect>, p: ImagePoint): LungZone | undefined {
  for (const z of LUNG_ZONES) {
    const r = zones[z];
    const lower = z.endsWith('-lower');
    const inX = p.x >= r.x && p.x <= r.x + r.w;
    const inY = p.y >= r.y && (lower ? p.y <= r.y + r.h : p.y < r.y + r.h);
    if (inX && inY) return z;
  }
  return undefined;
}

/** The same zone on the other side: 'right-upper' <-> 'left-upper', and so on. */
export function mirrorZone(z: LungZone): LungZone {
  if (!LUNG_ZONES.includes(z)) throw new RangeError(`'zone' must be one of ${LUNG_ZONES.join(', ')}; got '${String(z)}'`);
  return (z.startsWith('right-') ? `left-${z.slice(6)}` : `right-${z.slice(5)}`) as LungZone;
}
