import { createRng } from '../core/seeded-random';
import { serialiseAnnotations } from '../dataset/annotations';
import { encodeDicom } from '../dataset/dicom-writer';
import { encodePng } from '../dataset/png-codec';
import {
  ANNOTATIONS_SCHEMA,
  SET_SCHEMA,
  type AnnotationFile,
  type FileSink,
  type LungTemplate,
  type ReferenceBox,
  type SampleSetManifest,
  type StudyRecord,
} from '../dataset/types';
import { generatePhantomStudy, type PhantomStudy } from './generate-phantom-study';
import { MASK_BITS, phantomSetProblems, type PhantomSetOptions } from './phantom-set-options';

export interface PhantomSetResult {
  readonly name: string;
  readonly studies: number;
  readonly boxes: number;
  readonly files: readonly string[];
}

type ImageKind = { readonly format: 'png'; readonly bitDepth: 8 | 16 } | { readonly format: 'dcm'; readonly photometric: 'MONOCHROME1' | 'MONOCHROME2' };

const DETECTOR_MM = 430; // a 43 cm detector side (common practice for chest cassettes)
const DICOM_BITS = 12;

/** The seed of study i of a set: the set seed mixed with the index, so study i never depends on n. */
export function studySeed(seed: number, index: number): number {
  return ((seed >>> 0) ^ Math.imul(index + 1, 0x9e3779b1)) >>> 0;
}

/** A fixed time stamp derived from the seed (no clock), so reruns give identical files. */
export function createdFromSeed(seed: number): string {
  return new Date(Date.UTC(2020, 0, 1) + ((seed >>> 0) % 31_536_000) * 1000).toISOString();
}

function imageKind(format: 'png' | 'dcm' | 'mixed', bitDepth: 8 | 16, index: number): ImageKind {
  if (format === 'png') return { format: 'png', bitDepth };
  if (format === 'dcm') return { format: 'dcm', photometric: index % 2 === 0 ? 'MONOCHROME2' : 'MONOCHROME1' };
  // Mixed: of every 12 studies, 10 are 8-bit PNG, one 16-bit PNG and one DICOM, MONOCHROME2 and
  // MONOCHROME1 in turn from one block of 12 to the next.
  const k = index % 12;
  if (k === 4) return { format: 'png', bitDepth: 16 };
  if (k === 9) return { format: 'dcm', photometric: Math.floor(index / 12) % 2 === 0 ? 'MONOCHROME2' : 'MONOCHROME1' };
  return { format: 'png', bitDepth: 8 };
}

function encodeStudyImage(study: PhantomStudy, kind: ImageKind, seed: number): { ext: string; bytes: Uint8Array } {
  const { image, size } = study;
  if (kind.format === 'png') {
    const max = kind.bitDepth === 8 ? 255 : 65535;
    const data = kind.bitDepth === 8 ? new Uint8Array(image.length) : new Uint16Array(image.length);
    for (let i = 0; i < image.length; i++) data[i] = Math.round(image[i] * max);
    const text = {
      Title: study.id,
      Software: 'tessera phantom generator',
      Comment: 'Synthetic phantom radiograph - not patient data',
      Synthetic: 'true',
      Seed: String(seed),
    };
    return { ext: 'png', bytes: encodePng({ width: size, height: size, bitDepth: kind.bitDepth, data, text }) };
  }
  const max = (1 << DICOM_BITS) - 1;
  const data = new Uint16Array(image.length);
  const invert = kind.photometric === 'MONOCHROME1';
  for (let i = 0; i < image.length; i++) {
    const v = Math.round(image[i] * max);
    data[i] = invert ? max - v : v;
  }
  const spacing = DETECTOR_MM / size;
  const bytes = encodeDicom({
    width: size,
    height: size,
    data,
    bitsStored: DICOM_BITS,
    photometric: kind.photometric,
    pixelSpacingMm: [spacing, spacing],
    window: { centre: (max + 1) / 2, width: max + 1 },
    studyId: study.id,
    description: `Synthetic phantom chest radiograph (seed ${seed}) - not patient data`,
  });
  return { ext: 'dcm', bytes };
}

/** An 8-bit PNG whose pixels OR together the MASK_BITS of the findings covering them. */
function encodeMask(study: PhantomStudy): Uint8Array {
  const data = new Uint8Array(study.size * study.size);
  for (let i = 0; i < data.length; i++) if (study.masks.heart[i]) data[i] = MASK_BITS.heart;
  for (const f of study.masks.findings) {
    const bit = MASK_BITS[f.finding];
    for (let i = 0; i < data.length; i++) if (f.mask[i]) data[i] |= bit;
  }
  const text = { Title: `${study.id} masks`, Comment: `Synthetic ground-truth masks; bits ${Object.entries(MASK_BITS).map(([k, v]) => `${k}=${v}`).join(' ')}`, Synthetic: 'true' };
  return encodePng({ width: study.size, height: study.size, bitDepth: 8, data, text });
}

/**
 * Generates n synthetic studies and writes a sample set through `sink`: set.json (manifest,
 * synthetic: true, labels per study), annotations.json (reference boxes and lung templates) and
 * images/<id>.png or .dcm (and masks/<id>.png with `masks`). Same options give byte-identical files. Throws RangeError listing
 * every invalid option.
 */
export async function writePhantomSet(options: PhantomSetOptions, sink: FileSink): Promise<PhantomSetResult> {
  const problems = phantomSetProblems(options);
  if (problems.length > 0) throw new RangeError(problems.join('; '));
  const { n, seed, size = 512, format = 'png', bitDepth = 8, masks = false, onProgress } = options;
  const name = options.name ?? `phantom-${seed}`;
  const created = createdFromSeed(seed);
  const studies: StudyRecord[] = [];
  const boxes: ReferenceBox[] = [];
  const lungs: LungTemplate[] = [];
  const files: string[] = [];
  for (let i = 0; i < n; i++) {
    const id = `phantom-${String(i + 1).padStart(Math.max(4, String(n).length), '0')}`;
    const study = generatePhantomStudy(createRng(studySeed(seed, i)), { size, id, created });
    const { ext, bytes } = encodeStudyImage(study, imageKind(format, bitDepth, i), seed);
    const image = `images/${id}.${ext}`;
    await sink.writeFile(image, bytes);
    files.push(image);
    let mask: string | undefined;
    if (masks) {
      mask = `masks/${id}.png`;
      await sink.writeFile(mask, encodeMask(study));
      files.push(mask);
    }
    // Only sentences that speak of a finding go into the manifest; the rest add nothing.
    const labels = { ...study.labels, sentences: study.labels.sentences.filter((s) => s.finding !== ''), ...(mask ? { mask } : {}) };
    studies.push({ id, image, report: study.report, labels });
    boxes.push(...study.boxes);
    lungs.push(study.lungs);
    onProgress?.(i + 1, n);
  }
  const manifest: SampleSetManifest = {
    schema: SET_SCHEMA,
    name,
    synthetic: true,
    description: `Synthetic frontal chest radiographs with reports and reference boxes from the Tessera phantom generator (seed ${seed}, ${size} px). Not patient data.`,
    annotations: 'annotations.json',
    studies,
  };
  const annotations: AnnotationFile = { schema: ANNOTATIONS_SCHEMA, set: name, boxes, lungs };
  await sink.writeFile('set.json', `${JSON.stringify(manifest, null, 2)}\n`);
  await sink.writeFile('annotations.json', serialiseAnnotations(annotations));
  files.push('set.json', 'annotations.json');
  return { name, studies: n, boxes: boxes.length, files };
}
