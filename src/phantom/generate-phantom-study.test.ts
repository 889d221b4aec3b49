import { describe, expect, it } from 'vitest';
import { createRng } from '../core/seeded-random';
import { LUNG_ZONES, type ImageRect, type LungZone } from '../core/types';
import { parseReport } from '../report/parse-report';
import { generatePhantomStudy, type PhantomStudy } from './generate-phantom-study';
import { maskBounds } from './mask-bounds';

const SIZE = 160;
const studies: PhantomStudy[] = Array.from({ length: 90 }, (_, i) => generatePhantomStudy(createRng(500 + i), { size: SIZE, id: `t${i}` }));
const allFindings = studies.flatMap((s) => s.masks.findings.map((f) => ({ study: s, ...f })));

/** ILO thirds measured directly: which lung template holds the pixel, and which third of its height. */
function zoneOfPixel(x: number, y: number, lungs: { right: ImageRect; left: ImageRect }): LungZone | undefined {
  for (const side of ['right', 'left'] as const) {
    const r = lungs[side];
    const cx = x + 0.5, cy = y + 0.5;
    if (cx < r.x || cx >= r.x + r.w || cy < r.y || cy >= r.y + r.h) continue;
    const third = Math.min(2, Math.floor(((cy - r.y) / r.h) * 3));
    return `${side}-${['upper', 'middle', 'lower'][third]}` as LungZone;
  }
  return undefined;
}

function shares(mask: Uint8Array, size: number, lungs: { right: ImageRect; left: ImageRect }): Map<LungZone, number> {
  const counts = new Map<LungZone, number>();
  let total = 0;
  for (let y = 0; y < size; y++) {
    for (let x = 0; x < size; x++) {
      if (!mask[y * size + x]) continue;
      const z = zoneOfPixel(x, y, lungs);
      if (z) counts.set(z, (counts.get(z) ?? 0) + 1);
      total++;
    }
  }
  for (const [z, c] of counts) counts.set(z, c / total);
  return counts;
}

describe('generatePhantomStudy', () => {
  it('generatePhantomStudy(rng) gives identical output for the same seed and different output for another', () => {
    const a = generatePhantomStudy(createRng(11), { size: 128 });
    const b = generatePhantomStudy(createRng(11), { size: 128 });
    const c = generatePhantomStudy(createRng(12), { size: 128 });
    expect(Buffer.from(a.image.buffer).equals(Buffer.from(b.image.buffer))).toBe(true);
    expect(a.report).toBe(b.report);
    expect(a.boxes).toEqual(b.boxes);
    expect(a.labels).toEqual(b.labels);
    expect(Buffer.from(a.image.buffer).equals(Buffer.from(c.image.buffer))).toBe(false);
  }, 30_000);

  it('generatePhantomStudy(rng, { size }) rejects sizes below 128 or not integers', () => {
    for (const size of [127, 0, -5, 128.5, Number.NaN, Infinity]) {
      expect(() => generatePhantomStudy(createRng(1), { size })).toThrow(RangeError);
    }
    expect(() => generatePhantomStudy(createRng(1), { size: 127 })).toThrow(/'size' must be an integer >= 128; got 127/);
    expect(generatePhantomStudy(createRng(1), { size: 128 }).image.length).toBe(128 * 128);
  }, 30_000);

  it('generatePhantomStudy(rng) writes finite intensities in [0, 1] with dark lungs and a bright mediastinum', () => {
    for (const s of studies.slice(0, 20)) {
      let lung = 0, nl = 0, heart = 0, nh = 0, bad = 0;
      const anyFinding = new Uint8Array(s.image.length);
      for (const f of s.masks.findings) for (let i = 0; i < f.mask.length; i++) anyFinding[i] |= f.mask[i];
      for (let i = 0; i < s.image.length; i++) {
        const v = s.image[i];
        if (!(Number.isFinite(v) && v >= 0 && v <= 1)) bad++;
        if ((s.masks.right[i] || s.masks.left[i]) && !anyFinding[i]) { lung += v; nl++; }
        if (s.masks.heart[i]) { heart += v; nh++; }
      }
      expect(bad).toBe(0);
      expect(heart / nh - lung / nl).toBeGreaterThan(0.2);
    }
  }, 30_000);

  it('generatePhantomStudy(rng).lungs are the bounding boxes of the lung masks, right lung on the image left', () => {
    for (const s of studies) {
      expect(s.lungs.right).toEqual(maskBounds(s.masks.right, SIZE));
      expect(s.lungs.left).toEqual(maskBounds(s.masks.left, SIZE));
      expect(s.lungs.right.x + s.lungs.right.w / 2).toBeLessThan(SIZE / 2);
      expect(s.lungs.left.x + s.lungs.left.w / 2).toBeGreaterThan(SIZE / 2);
      expect(s.lungs.annotator).toBe('phantom-generator');
    }
  }, 30_000);

  it('finding zones agree with the ILO thirds split measured from the masks and lung templates', () => {
    expect(allFindings.length).toBeGreaterThan(60);
    for (const f of allFindings) {
      const share = shares(f.mask, SIZE, f.study.lungs);
      const measured = [...share.entries()].filter(([, v]) => v >= 0.15).map(([z]) => z);
      const largest = [...share.entries()].sort((a, b) => b[1] - a[1])[0][0];
      expect([...f.zones].sort()).toEqual(measured.length > 0 ? measured.sort() : [largest]);
      expect(f.zones[0]).toBe(largest);
    }
  }, 30_000);

  it('findings land in the zones they are planned for: effusions basal, apical pneumothoraces upper', () => {
    for (const f of allFindings) {
      if (f.finding === 'effusion') expect(f.zones.some((z) => z.endsWith('lower'))).toBe(true);
      if (f.finding === 'pneumothorax') expect(f.zones).toContain(f.zones.find((z) => z.endsWith('upper')));
      if (f.finding === 'edema') expect(f.zones.filter((z) => z.endsWith('middle')).length).toBe(2);
    }
  }, 30_000);

  it("a 'left' finding's mask centroid lies right of the image midline, a 'right' one's left of it", () => {
    let checked = 0;
    for (const f of allFindings) {
      const sides = new Set(f.zones.map((z) => z.split('-')[0]));
      if (sides.size !== 1) continue;
      let sx = 0, n = 0;
      for (let i = 0; i < f.mask.length; i++) if (f.mask[i]) { sx += (i % SIZE) + 0.5; n++; }
      const cx = sx / n;
      if (sides.has('left')) expect(cx).toBeGreaterThan(SIZE / 2);
      else expect(cx).toBeLessThan(SIZE / 2);
      checked++;
    }
    expect(checked).toBeGreaterThan(50);
  }, 30_000);

  it('generatePhantomStudy(rng).boxes lie inside the image, overlap their masks and sit in their zone', () => {
    let n = 0;
    for (const s of studies) {
      const zoneRects = {} as Record<LungZone, ImageRect>;
      for (const side of ['right', 'left'] as const) {
        const r = s.lungs[side];
        ['upper', 'middle', 'lower'].forEach((row, k) => (zoneRects[`${side}-${row}` as LungZone] = { x: r.x, y: r.y + (r.h * k) / 3, w: r.w, h: r.h / 3 }));
      }
      for (const b of s.boxes) {
        n++;
        const { x, y, w, h } = b.box;
        expect(x >= 0 && y >= 0 && w >= 1 && h >= 1 && x + w <= SIZE && y + h <= SIZE).toBe(true);
        const sentence = s.sentences[b.sentence.index];
        expect(sentence.text).toBe(b.sentence.text);
        expect(sentence.negated).toBe(false);
        const masks = sentence.targets.map((t) => (t.finding === 'heart' ? s.masks.heart : s.masks.findings[t.finding].mask));
        let overlap = 0;
        for (let yy = y; yy < y + h; yy++) for (let xx = x; xx < x + w; xx++) if (masks.some((m) => m[yy * SIZE + xx])) overlap++;
        expect(overlap).toBeGreaterThan(0);
        if (b.zone === 'cardiac') continue;
        const z = zoneRects[b.zone as LungZone];
        const cy = y + h / 2, cx = x + w / 2;
        if (sentence.finding === 'edema') {
          // Perihilar oedema is boxed over its whole opacity in the lung (next test): the box
          // reaches into its named middle third and its centre lies in that lung.
          expect(y < z.y + z.h && y + h > z.y && cx >= z.x && cx <= z.x + z.w).toBe(true);
          continue;
        }
        expect(cy >= z.y - 0.5 && cy <= z.y + z.h + 0.5 && cx >= z.x && cx <= z.x + z.w).toBe(true);
      }
    }
    expect(n).toBeGreaterThan(100);
  }, 30_000);

  it('a perihilar oedema box covers the whole opacity in its lung, across the thirds, and is labelled with the middle zone', () => {
    let n = 0, spanning = 0;
    for (const s of studies) {
      for (const b of s.boxes) {
        const sentence = s.sentences[b.sentence.index];
        const target = sentence.targets.find((t) => t.finding !== 'heart' && s.masks.findings[t.finding].finding === 'edema');
        if (!target || target.finding === 'heart') continue;
        n++;
        expect(b.zone.endsWith('middle')).toBe(true);
        const side = b.zone.startsWith('right') ? s.lungs.right : s.lungs.left;
        expect(b.box).toEqual(maskBounds(s.masks.findings[target.finding].mask, SIZE, side));
        const thirds = side.h / 3;
        if (b.box.y < side.y + thirds - 0.5 || b.box.y + b.box.h > side.y + 2 * thirds + 0.5) spanning++;
      }
    }
    expect(n).toBeGreaterThan(10);
    // The opacity is not confined to the middle third, so a middle-third box would cut it.
    expect(spanning).toBeGreaterThan(n / 2);
  }, 30_000);

  it('every positive sentence that names a finding and a place has a box per named zone; negated ones have none', () => {
    for (const s of studies) {
      s.sentences.forEach((sentence, index) => {
        const boxes = s.boxes.filter((b) => b.sentence.index === index);
        if (sentence.negated || sentence.finding === '') expect(boxes).toHaveLength(0);
        else if (sentence.finding === 'cardiomegaly') expect(boxes.map((b) => b.zone)).toEqual(['cardiac']);
        else expect(new Set(boxes.map((b) => b.zone))).toEqual(new Set(sentence.zones));
      });
    }
  }, 30_000);

  it('parseReport agrees with the generated ground truth on negation, uncertainty and zones in over 95% of sentences', () => {
    let n = 0, neg = 0, unc = 0, zones = 0, index = 0;
    for (const s of studies) {
      const parsed = parseReport(s.report).sentences;
      expect(parsed.length).toBe(s.sentences.length);
      s.sentences.forEach((truth, i) => {
        const p = parsed[i];
        n++;
        if (p.index === i && p.text === truth.text) index++;
        if (p.negated === truth.negated) neg++;
        if (p.uncertain === truth.uncertain) unc++;
        if ([...p.zones].sort().join() === [...truth.zones].sort().join()) zones++;
      });
    }
    expect(index / n).toBe(1);
    expect(neg / n).toBeGreaterThan(0.95);
    expect(unc / n).toBeGreaterThan(0.95);
    expect(zones / n).toBeGreaterThan(0.95);
  }, 30_000);

  it('reports vary: several phrasings per finding, FINDINGS and IMPRESSION sections, negated and uncertain sentences', () => {
    const texts = new Map<string, Set<string>>();
    let negated = 0, uncertain = 0, twoPlaces = 0;
    for (const s of studies) {
      expect(s.report).toMatch(/^FINDINGS:\n[\s\S]+\n\nIMPRESSION:\n/);
      for (const t of s.sentences) {
        if (t.negated) negated++;
        if (t.uncertain) uncertain++;
        if (new Set(t.zones.map((z) => z.split('-')[0])).size === 2 && t.finding !== 'edema') twoPlaces++;
        if (t.finding && !t.negated) {
          const skeleton = t.text.replace(/(right|left|upper|middle|mid|lower|small|minor|moderate|moderate-sized|large|sizeable|\d+)/g, '#');
          texts.set(t.finding, (texts.get(t.finding) ?? new Set()).add(skeleton));
        }
      }
    }
    for (const kind of ['consolidation', 'nodule', 'effusion', 'pneumothorax', 'atelectasis', 'edema']) expect(texts.get(kind)?.size ?? 0).toBeGreaterThanOrEqual(3);
    expect(negated).toBeGreaterThan(50);
    expect(uncertain).toBeGreaterThan(3);
    expect(twoPlaces).toBeGreaterThan(0);
  }, 30_000);

  it('cardiomegaly is labelled exactly when the measured cardiothoracic ratio exceeds 0.5', () => {
    let enlarged = 0;
    for (const s of studies) {
      const labelled = s.labels.findings.some((f) => f.finding === 'cardiomegaly');
      expect(labelled).toBe(s.labels.ctr > 0.5);
      if (labelled) enlarged++;
      expect(s.labels.ctr).toBeGreaterThan(0.3);
      expect(s.labels.ctr).toBeLessThan(0.75);
    }
    expect(enlarged).toBeGreaterThan(5);
    expect(enlarged).toBeLessThan(60);
  }, 30_000);

  it('findings are visible: opacities are brighter than the rest of their lung, pneumothoraces darker than the mirror region', () => {
    for (const f of allFindings) {
      if (f.finding === 'edema' && f.study.labels.edema_grade < 2) continue;
      const img = f.study.image;
      const right = f.zones[0].startsWith('right');
      const lung = right ? f.study.masks.right : f.study.masks.left;
      const other = right ? f.study.masks.left : f.study.masks.right;
      const anyFinding = new Uint8Array(img.length);
      for (const o of f.study.masks.findings) for (let i = 0; i < o.mask.length; i++) anyFinding[i] |= o.mask[i];
      let inside = 0, ni = 0, outside = 0, no = 0, mirror = 0, nm = 0;
      for (let y = 0; y < SIZE; y++) {
        for (let x = 0; x < SIZE; x++) {
          const i = y * SIZE + x, m = y * SIZE + (SIZE - 1 - x);
          if (f.mask[i]) {
            inside += img[i]; ni++;
            if (other[m] && !anyFinding[m]) { mirror += img[m]; nm++; }
          } else if (lung[i] && !anyFinding[i]) { outside += img[i]; no++; }
        }
      }
      if (f.finding === 'pneumothorax') {
        if (nm > 20) expect(inside / ni - mirror / nm).toBeLessThan(-0.04);
        continue;
      }
      if (ni === 0 || no === 0) continue;
      const diff = inside / ni - outside / no;
      if (f.finding === 'nodule' || f.finding === 'atelectasis') expect(diff).toBeGreaterThan(0.04);
      else expect(diff).toBeGreaterThan(0.08);
    }
  }, 30_000);

  it('labels list each finding with zones and severity, and the edema grade', () => {
    for (const s of studies) {
      const edema = s.labels.findings.find((f) => f.finding === 'edema');
      expect(s.labels.edema_grade).toBe(edema?.severity ?? 0);
      for (const f of s.labels.findings) {
        expect(f.zones.length).toBeGreaterThan(0);
        for (const z of f.zones) expect([...LUNG_ZONES, 'cardiac']).toContain(z);
        expect(f.severity).toBeGreaterThanOrEqual(1);
      }
    }
    const kinds = new Set(studies.flatMap((s) => s.labels.findings.map((f) => f.finding)));
    expect([...kinds].sort()).toEqual(['atelectasis', 'cardiomegaly', 'consolidation', 'edema', 'effusion', 'nodule', 'pneumothorax']);
  }, 30_000);
});
