import type { ImageRect, Size, ZoneLabel } from '../core/types';
import type { DecodedImage, FileSource, ReferenceBox, SampleSetManifest, StudyRecord } from '../dataset/types';
import type { ParsedReport } from '../report/types';
import { parseReport } from '../report/parse-report';
import { decodeImage, readImageSize } from '../dataset/decode-image';
import { loadSampleSet } from '../dataset/sample-set';
import { loadAnnotations } from '../dataset/annotations';
import type { Problem } from '../dataset/errors';

/** A sample set opened for scoring: the manifest, its studies' parsed reports and their boxes. */
export interface OpenedSet {
  readonly source: FileSource;
  readonly manifest: SampleSetManifest;
  /** Studies in manifest order that passed validation. */
  readonly studies: readonly StudyRecord[];
  readonly reports: ReadonlyMap<string, ParsedReport>;
  /** study id -> sentence index -> its reference boxes. */
  readonly boxes: ReadonlyMap<string, ReadonlyMap<number, readonly ReferenceBox[]>>;
  /** Problems found while opening; studies named in them with a skip are left out of `studies`. */
  readonly problems: readonly Problem[];
  readonly skipped: readonly { readonly study: string; readonly reason: string }[];
}

/** The studies and boxes a scoring run needs, with image sizes read from the images themselves. */
export interface LoadedStudy {
  readonly study: StudyRecord;
  readonly bytes: Uint8Array;
  readonly image: DecodedImage;
  readonly report: ParsedReport;
  readonly boxesBySentence: ReadonlyMap<number, readonly ReferenceBox[]>;
}

export interface BoxView {
  readonly rects: readonly ImageRect[];
  readonly zones: readonly ZoneLabel[];
}

/** Rectangles and distinct zone labels of a sentence's boxes. */
export function viewBoxes(boxes: readonly ReferenceBox[] | undefined): BoxView {
  if (!boxes || boxes.length === 0) return { rects: [], zones: [] };
  const zones: ZoneLabel[] = [];
  for (const b of boxes) if (!zones.includes(b.zone)) zones.push(b.zone);
  return { rects: boxes.map((b) => b.box), zones };
}

/**
 * Opens a sample set: validates set.json, reads each image's size from its header (a study whose
 * image is missing or unreadable is skipped with its reason), parses every report, and loads the
 * annotation file (stale or invalid boxes are listed as problems and left out, never re-attached).
 */
export async function openSet(source: FileSource, { signal }: { signal?: AbortSignal } = {}): Promise<OpenedSet> {
  const { manifest, problems: setProblems } = await loadSampleSet(source);
  const problems: Problem[] = [...setProblems];
  const skipped: { study: string; reason: string }[] = [];
  // loadSampleSet leaves out every study with a problem; each such study is skipped with its reasons.
  const loadedIds = new Set(manifest.studies.map((st) => st.id));
  for (const p of setProblems) {
    if (!p.item || loadedIds.has(p.item)) continue;
    const prior = skipped.find((x) => x.study === p.item);
    if (prior) prior.reason = `${prior.reason}; ${p.message}`;
    else skipped.push({ study: p.item, reason: p.message });
  }
  const studies: StudyRecord[] = [];
  const reports = new Map<string, ParsedReport>();
  const sizes = new Map<string, Size>();
  const seen = new Set<string>();
  for (const study of manifest.studies) {
    signal?.throwIfAborted();
    if (seen.has(study.id)) continue;
    seen.add(study.id);
    try {
      // The header is enough to check boxes; a file damaged past its header fails when scored.
      sizes.set(study.id, readImageSize(await source.readBytes(study.image), study.image));
    } catch (err) {
      const reason = (err as Error).message;
      problems.push({ code: 'unreadable-image', file: study.image, item: study.id, message: reason, fix: 'replace the image with a readable PNG, JPEG or uncompressed DICOM file' });
      skipped.push({ study: study.id, reason });
      continue;
    }
    const report = parseReport(study.report);
    if (report.sentences.length === 0) {
      const reason = `study '${study.id}': the report has no sentences`;
      problems.push({ code: 'empty-report', file: 'set.json', item: study.id, message: `set.json (${study.id}): the report has no sentences. Fix: write the report text into "report"`, fix: 'write the report text into "report"' });
      skipped.push({ study: study.id, reason });
      continue;
    }
    studies.push(study);
    reports.set(study.id, report);
  }

  const boxes = new Map<string, Map<number, ReferenceBox[]>>();
  const annotationPath = manifest.annotations ?? 'annotations.json';
  if (await source.exists(annotationPath)) {
    const json: unknown = JSON.parse(await source.readText(annotationPath));
    const sentencesByStudy = new Map<string, { index: number; text: string }[]>();
    for (const [id, r] of reports) sentencesByStudy.set(id, r.sentences.map((s) => ({ index: s.index, text: s.text })));
    const loaded = loadAnnotations(json, annotationPath, { imageSizes: sizes, sentencesByStudy, skippedStudies: new Set(skipped.map((x) => x.study)) });
    problems.push(...loaded.problems);
    for (const b of loaded.boxes) {
      if (!reports.has(b.study)) continue;
      let m = boxes.get(b.study);
      if (!m) boxes.set(b.study, (m = new Map()));
      const list = m.get(b.sentence.index) ?? [];
      list.push(b);
      m.set(b.sentence.index, list);
    }
  }
  return { source, manifest, studies, reports, boxes, problems, skipped };
}

/** Reads and decodes one study's image for scoring. */
export async function loadStudy(set: OpenedSet, study: StudyRecord): Promise<LoadedStudy> {
  const bytes = await set.source.readBytes(study.image);
  const image = decodeImage(bytes, study.image);
  return {
    study,
    bytes,
    image,
    report: set.reports.get(study.id) as ParsedReport,
    boxesBySentence: set.boxes.get(study.id) ?? new Map(),
  };
}
