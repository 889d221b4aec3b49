import { describe, expect, it } from 'vitest';
import { createRng } from '../core/seeded-random';
import { loadAnnotations } from '../dataset/annotations';
import { decodeImage } from '../dataset/decode-image';
import { validateSampleSetManifest } from '../dataset/sample-set';
import type { AnnotationFile, FileSink, SampleSetManifest } from '../dataset/types';
import { parseReport } from '../report/parse-report';
import { generatePhantomStudy } from './generate-phantom-study';
import { MASK_BITS, phantomSetProblems } from './phantom-set-options';
import { createdFromSeed, studySeed, writePhantomSet } from './write-phantom-set';

function memorySink(): FileSink & { files: Map<string, Uint8Array | string> } {
  const files = new Map<string, Uint8Array | string>();
  return { files, writeFile: async (path, data) => void files.set(path, data) };
}

const asText = (v: Uint8Array | string | undefined): string => (typeof v === 'string' ? v : new TextDecoder().decode(v));

describe('writePhantomSet', () => {
  it('writePhantomSet(options, sink) writes set.json, annotations.json and one image per study', async () => {
    const sink = memorySink();
    const progress: number[] = [];
    const result = await writePhantomSet({ n: 5, seed: 3, size: 128, onProgress: (done, total) => progress.push(done / total) }, sink);
    expect(result.studies).toBe(5);
    expect([...sink.files.keys()].sort()).toEqual(['annotations.json', 'images/phantom-0001.png', 'images/phantom-0002.png', 'images/phantom-0003.png', 'images/phantom-0004.png', 'images/phantom-0005.png', 'set.json']);
    expect(progress).toEqual([0.2, 0.4, 0.6, 0.8, 1]);
    const manifest = JSON.parse(asText(sink.files.get('set.json'))) as SampleSetManifest;
    const checked = validateSampleSetManifest(manifest, 'set.json');
    expect(checked.problems).toEqual([]);
    expect(manifest.synthetic).toBe(true);
    expect(manifest.studies.map((s) => s.image)).toEqual([1, 2, 3, 4, 5].map((i) => `images/phantom-000${i}.png`));
    for (const s of manifest.studies) expect(typeof s.labels?.edema_grade).toBe('number');
  }, 60_000);

  it('writePhantomSet gives byte-identical files for the same options and different ones for another seed', async () => {
    const a = memorySink(), b = memorySink(), c = memorySink();
    await writePhantomSet({ n: 3, seed: 9, size: 128, format: 'mixed' }, a);
    await writePhantomSet({ n: 3, seed: 9, size: 128, format: 'mixed' }, b);
    await writePhantomSet({ n: 3, seed: 10, size: 128, format: 'mixed' }, c);
    for (const [path, data] of a.files) expect(Buffer.from(b.files.get(path) as Uint8Array).equals(Buffer.from(data as Uint8Array)), path).toBe(true);
    expect(asText(c.files.get('set.json'))).not.toBe(asText(a.files.get('set.json')));
  }, 60_000);

  it('study i of a set does not depend on n', async () => {
    const small = memorySink(), large = memorySink();
    await writePhantomSet({ n: 2, seed: 4, size: 128 }, small);
    await writePhantomSet({ n: 4, seed: 4, size: 128 }, large);
    expect(Buffer.from(small.files.get('images/phantom-0002.png') as Uint8Array).equals(Buffer.from(large.files.get('images/phantom-0002.png') as Uint8Array))).toBe(true);
  }, 60_000);

  it('annotations.json loads with every box matching its sentence, inside its image, with fixed time stamps', async () => {
    const sink = memorySink();
    await writePhantomSet({ n: 12, seed: 21, size: 128 }, sink);
    const manifest = JSON.parse(asText(sink.files.get('set.json'))) as SampleSetManifest;
    const json = JSON.parse(asText(sink.files.get('annotations.json'))) as AnnotationFile;
    const imageSizes = new Map(manifest.studies.map((s) => [s.id, { width: 128, height: 128 }]));
    const sentencesByStudy = new Map(manifest.studies.map((s) => [s.id, parseReport(s.report).sentences.map((p) => ({ index: p.index, text: p.text }))]));
    const loaded = loadAnnotations(json, 'annotations.json', { imageSizes, sentencesByStudy });
    expect(loaded.stale).toEqual([]);
    expect(loaded.boxes.length).toBe(json.boxes.length);
    expect(json.boxes.length).toBeGreaterThan(5);
    expect(loaded.lungs.length).toBe(12);
    for (const box of json.boxes) {
      expect(box.annotator).toBe('phantom-generator');
      expect(box.created).toBe(createdFromSeed(21));
    }
  }, 60_000);

  it("writePhantomSet({ format: 'dcm' }) alternates MONOCHROME2 and MONOCHROME1 with the same displayed image", async () => {
    const sink = memorySink();
    await writePhantomSet({ n: 2, seed: 5, size: 128, format: 'dcm' }, sink);
    const first = decodeImage(sink.files.get('images/phantom-0001.dcm') as Uint8Array, 'a.dcm');
    const second = decodeImage(sink.files.get('images/phantom-0002.dcm') as Uint8Array, 'b.dcm');
    for (const d of [first, second]) {
      expect(d.format).toBe('dicom');
      expect(d.synthetic).toBe(true);
      expect(d.pixelSpacingMm?.[0]).toBeCloseTo(430 / 128, 6);
      expect(d.window).toBeDefined();
    }
    // Decoded DICOM is "higher = brighter" for both photometries, so it must match the generator's image.
    for (const [index, decoded] of [[0, first], [1, second]] as const) {
      const study = generatePhantomStudy(createRng(studySeed(5, index)), { size: 128 });
      let maxErr = 0;
      const max = Math.max(...decoded.valueRange);
      const min = Math.min(...decoded.valueRange);
      for (let i = 0; i < study.image.length; i++) maxErr = Math.max(maxErr, Math.abs((decoded.data[i] - min) / (max - min) - study.image[i]));
      expect(maxErr).toBeLessThan(1 / 4095 + 1e-6);
    }
  }, 60_000);

  it("writePhantomSet PNGs carry the synthetic marker; bitDepth 16 writes 16-bit files; 'mixed' uses all three kinds", async () => {
    const sink = memorySink();
    await writePhantomSet({ n: 24, seed: 6, size: 128, format: 'mixed' }, sink);
    const names = [...sink.files.keys()].filter((k) => k.startsWith('images/'));
    const dicom = names.filter((k) => k.endsWith('.dcm'));
    expect(dicom).toEqual(['images/phantom-0010.dcm', 'images/phantom-0022.dcm']);
    const photometry = dicom.map((k) => new TextDecoder('latin1').decode(sink.files.get(k) as Uint8Array).match(/MONOCHROME[12]/)?.[0]);
    expect(photometry).toEqual(['MONOCHROME2', 'MONOCHROME1']);
    const depths = names.filter((k) => k.endsWith('.png')).map((k) => decodeImage(sink.files.get(k) as Uint8Array, k));
    expect(depths.every((d) => d.synthetic === true)).toBe(true);
    expect(depths.filter((d) => d.bitDepth === 16)).toHaveLength(2);
    const sixteen = memorySink();
    await writePhantomSet({ n: 1, seed: 6, size: 128, bitDepth: 16 }, sixteen);
    expect(decodeImage(sixteen.files.get('images/phantom-0001.png') as Uint8Array, 'x.png').bitDepth).toBe(16);
  }, 60_000);

  it('writePhantomSet({ masks: true }) writes bit masks that match the labels and the heart', async () => {
    const sink = memorySink();
    await writePhantomSet({ n: 6, seed: 8, size: 128, masks: true }, sink);
    const manifest = JSON.parse(asText(sink.files.get('set.json'))) as SampleSetManifest;
    manifest.studies.forEach((s, index) => {
      expect(s.labels?.mask).toBe(`masks/${s.id}.png`);
      const decoded = decodeImage(sink.files.get(`masks/${s.id}.png`) as Uint8Array, 'm.png');
      const study = generatePhantomStudy(createRng(studySeed(8, index)), { size: 128, id: s.id });
      const bits = new Set<number>();
      for (const v of decoded.data) for (let b = 1; b <= 64; b <<= 1) if (v & b) bits.add(b);
      const expected = new Set([MASK_BITS.heart, ...study.masks.findings.map((f) => MASK_BITS[f.finding])]);
      expect(bits).toEqual(expected);
    });
  }, 60_000);

  it('writePhantomSet rejects bad options, naming every problem at once', async () => {
    await expect(writePhantomSet({ n: 0, seed: 1, size: 100 }, memorySink())).rejects.toThrow(/'n' must be an integer >= 1; got 0; 'size' must be an integer in \[128, 2048\]; got 100/);
    expect(phantomSetProblems({ n: 1.5, seed: -1, size: 128, format: 'jpg' as 'png', bitDepth: 12 as 8 })).toHaveLength(4);
    expect(phantomSetProblems({ n: 1, seed: 0 })).toEqual([]);
    expect(phantomSetProblems({ n: Number.NaN, seed: Number.NaN })).toHaveLength(2);
  }, 60_000);
});
