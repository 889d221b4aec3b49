import { hashSentenceText } from '../core/text-hash';
import type { ImageRect, Size, ZoneLabel } from '../core/types';
import { DatasetError, makeProblem, type Problem } from './errors';
import { ANNOTATIONS_VERSION_CHECK, migrateAnnotationsV1ToV2 } from './migrations';
import { ZONE_LABELS } from './sample-set';
import { ANNOTATIONS_SCHEMA, type AnnotationFile, type LungTemplate, type ReferenceBox } from './types';
import { describeJson, isObject, unknownKeys } from './validate-json';

/** A report sentence as the loader sees it: its index in the parsed report and its text. */
export interface CurrentSentence {
  readonly index: number;
  readonly text: string;
}

export interface AnnotationContext {
  /** Size of each loaded study's image, in image pixels. */
  readonly imageSizes: ReadonlyMap<string, Size>;
  /** The current sentences of each loaded study's report. */
  readonly sentencesByStudy: ReadonlyMap<string, readonly CurrentSentence[]>;
  /** Studies already reported as skipped: their boxes are left out without a problem of their own. */
  readonly skippedStudies?: ReadonlySet<string>;
}

/** A box whose sentence no longer matches the report; it is never re-attached by itself. */
export interface StaleBox {
  readonly box: ReferenceBox;
  /** 'edited': the sentence at that index changed; 'missing': no sentence has that index. */
  readonly reason: 'edited' | 'missing';
  /** Text now at box.sentence.index, when there is a sentence there. */
  readonly currentText?: string;
  /** Index of a current sentence with the box's hash (the sentence moved), for the user to confirm. */
  readonly suggestedIndex?: number;
}

export interface LoadedAnnotations {
  /** The file in the current version, with every well-formed record (stale and misplaced boxes included, so re-saving loses nothing). */
  readonly file: AnnotationFile;
  /** Boxes that are inside their image, have area and match their sentence: the ones to score. */
  readonly boxes: readonly ReferenceBox[];
  readonly stale: readonly StaleBox[];
  /** Lung templates that lie inside their image. */
  readonly lungs: readonly LungTemplate[];
  readonly problems: readonly Problem[];
  /** Set when the file was migrated from an older version, e.g. 'tessera.annotations/1'. */
  readonly migratedFrom?: string;
}

const BOX_KEYS = ['id', 'study', 'sentence', 'zone', 'box', 'annotator', 'created'] as const;
const LUNG_KEYS = ['study', 'right', 'left', 'annotator', 'created'] as const;
const TOP_KEYS = ['schema', 'set', 'boxes', 'lungs'] as const;

function checkRect(v: unknown): string | undefined {
  if (!isObject(v)) return `must be an object { x, y, w, h }; got ${describeJson(v)}`;
  for (const k of ['x', 'y', 'w', 'h']) {
    if (typeof v[k] !== 'number' || !Number.isFinite(v[k] as number)) return `${k} must be a finite number; got ${describeJson(v[k])}`;
  }
  const extra = unknownKeys(v, ['x', 'y', 'w', 'h']);
  return extra.length ? `has unknown field "${extra[0]}"` : undefined;
}

/** Structural check of one version-2 box; returns what is wrong, or undefined. */
function checkBox(b: unknown): string | undefined {
  if (!isObject(b)) return `the box must be an object; got ${describeJson(b)}`;
  if (typeof b.id !== 'string' || b.id === '') return `"id" must be non-empty text; got ${describeJson(b.id)}`;
  if (typeof b.study !== 'string' || b.study === '') return `"study" must be non-empty text; got ${describeJson(b.study)}`;
  const s = b.sentence;
  if (!isObject(s)) return `"sentence" must be { index, text, hash }; got ${describeJson(s)}`;
  // -1 marks a sentence not resolved when a version-1 file was migrated; such a box is reported stale.
  if (typeof s.index !== 'number' || !Number.isInteger(s.index) || s.index < -1) return `"sentence.index" must be an integer >= 0 (or -1 for unresolved); got ${describeJson(s.index)}`;
  if (typeof s.text !== 'string') return `"sentence.text" must be text; got ${describeJson(s.text)}`;
  if (typeof s.hash !== 'string' || s.hash === '') return `"sentence.hash" must be non-empty text; got ${describeJson(s.hash)}`;
  const sExtra = unknownKeys(s, ['index', 'text', 'hash']);
  if (sExtra.length) return `"sentence" has unknown field "${sExtra[0]}"`;
  if (!ZONE_LABELS.includes(b.zone as ZoneLabel)) return `"zone" must be one of ${ZONE_LABELS.join(', ')}; got ${describeJson(b.zone)}`;
  const r = checkRect(b.box);
  if (r) return `"box" ${r}`;
  if (typeof b.annotator !== 'string') return `"annotator" must be text; got ${describeJson(b.annotator)}`;
  if (typeof b.created !== 'string' || b.created === '') return `"created" must be an ISO 8601 time; got ${describeJson(b.created)}`;
  const extra = unknownKeys(b, BOX_KEYS);
  return extra.length ? `unknown field "${extra[0]}"` : undefined;
}

function checkLungs(l: unknown): string | undefined {
  if (!isObject(l)) return `the lung template must be an object; got ${describeJson(l)}`;
  if (typeof l.study !== 'string' || l.study === '') return `"study" must be non-empty text; got ${describeJson(l.study)}`;
  for (const side of ['right', 'left']) {
    const r = checkRect(l[side]);
    if (r) return `"${side}" ${r}`;
  }
  if (typeof l.annotator !== 'string') return `"annotator" must be text; got ${describeJson(l.annotator)}`;
  if (typeof l.created !== 'string' || l.created === '') return `"created" must be an ISO 8601 time; got ${describeJson(l.created)}`;
  const extra = unknownKeys(l, LUNG_KEYS);
  return extra.length ? `unknown field "${extra[0]}"` : undefined;
}

/** Geometry problem of a rect in an image of `size`, or undefined. */
function placeRect(rect: ImageRect, size: Size): { code: 'box-zero-area' | 'box-outside-image'; what: string } | undefined {
  if (!(rect.w > 0 && rect.h > 0)) return { code: 'box-zero-area', what: `the box has zero or negative size (w ${rect.w}, h ${rect.h})` };
  if (rect.x < 0 || rect.y < 0 || rect.x + rect.w > size.width || rect.y + rect.h > size.height) {
    return {
      code: 'box-outside-image',
      what: `the box [x ${rect.x}, y ${rect.y}, w ${rect.w}, h ${rect.h}] reaches outside the ${size.width} x ${size.height} image`,
    };
  }
  return undefined;
}

/**
 * Loads parsed annotations.json content: checks the version (migrating version 1, see
 * migrations.ts), checks every record, and sorts boxes into usable, stale and problems.
 * A box is usable when its study is loaded, it has positive area inside the image, and the
 * sentence at its index has the box's hash (hashSentenceText). Otherwise it is reported: stale
 * boxes carry the sentence now at that index and, when the same text sits at another index, that
 * index as a suggestion; nothing is re-attached silently. Throws DatasetError for a file that is
 * not an annotation file ('annotation-schema') or of an unknown version ('annotation-version').
 */
export function loadAnnotations(json: unknown, file: string, { imageSizes, sentencesByStudy, skippedStudies = new Set<string>() }: AnnotationContext): LoadedAnnotations {
  if (!isObject(json)) {
    throw new DatasetError(`the file must hold a JSON object; got ${describeJson(json)}`, { code: 'annotation-schema', file, fix: `write it as { "schema": "${ANNOTATIONS_SCHEMA}", "set", "boxes": [...] }` });
  }
  const version = ANNOTATIONS_VERSION_CHECK(json.schema);
  if (version.kind === 'foreign') {
    throw new DatasetError(`"schema" must be "${ANNOTATIONS_SCHEMA}" (or an older Tessera annotation version); got ${describeJson(json.schema)}`, {
      code: 'annotation-version',
      file,
      item: 'schema',
      fix: 'choose a Tessera annotation file, or import other formats with the COCO-style JSON or CSV import',
    });
  }
  if (version.kind === 'newer') {
    throw new DatasetError(`the annotations are in version ${version.version}, newer than this Tessera reads (${ANNOTATIONS_SCHEMA})`, { code: 'annotation-version', file, item: 'schema', fix: 'update Tessera to a version that reads this file' });
  }
  let migratedFrom: string | undefined;
  let doc = json;
  if (version.kind === 'older') {
    if (version.version !== 1) {
      throw new DatasetError(`no migration exists from annotation version ${version.version}`, { code: 'annotation-version', file, item: 'schema', fix: 'update Tessera' });
    }
    migratedFrom = json.schema as string;
    const resolve = (study: string, text: string): number | undefined => {
      const h = hashSentenceText(text);
      return sentencesByStudy.get(study)?.find((s) => hashSentenceText(s.text) === h)?.index;
    };
    doc = migrateAnnotationsV1ToV2(json, resolve, hashSentenceText);
  }

  const problems: Problem[] = [];
  for (const k of unknownKeys(doc, TOP_KEYS)) problems.push(makeProblem('annotation-schema', file, k, `unknown field "${k}" is ignored`, `remove "${k}"`));
  if (typeof doc.set !== 'string') {
    throw new DatasetError(`"set" must be the name of the sample set; got ${describeJson(doc.set)}`, { code: 'annotation-schema', file, item: 'set', fix: 'set "set" to the name in set.json' });
  }
  if (!Array.isArray(doc.boxes)) {
    throw new DatasetError(`"boxes" must be a list; got ${describeJson(doc.boxes)}`, { code: 'annotation-schema', file, item: 'boxes', fix: 'write "boxes": [] when there are none' });
  }
  if (doc.lungs !== undefined && !Array.isArray(doc.lungs)) {
    throw new DatasetError(`"lungs" must be a list; got ${describeJson(doc.lungs)}`, { code: 'annotation-schema', file, item: 'lungs', fix: 'write "lungs": [] or remove it' });
  }

  const kept: ReferenceBox[] = [];
  const usable: ReferenceBox[] = [];
  const stale: StaleBox[] = [];
  const ids = new Set<string>();
  const hashCache = new Map<string, string[]>();
  const currentHashes = (study: string): string[] => {
    let h = hashCache.get(study);
    if (!h) hashCache.set(study, (h = (sentencesByStudy.get(study) ?? []).map((s) => hashSentenceText(s.text))));
    return h;
  };
  doc.boxes.forEach((raw: unknown, i: number) => {
    const wrong = checkBox(raw);
    const rawId = isObject(raw) && typeof raw.id === 'string' && raw.id !== '' ? raw.id : `boxes[${i}]`;
    if (wrong) {
      problems.push(makeProblem('annotation-schema', file, rawId, `${wrong}; the box is left out`, 'correct the box in the file, or draw it again'));
      return;
    }
    const box = raw as unknown as ReferenceBox;
    if (ids.has(box.id)) {
      problems.push(makeProblem('duplicate-box', file, box.id, 'the box id is used more than once; the later box is left out', 'give every box its own id'));
      return;
    }
    ids.add(box.id);
    kept.push(box);
    if (hashSentenceText(box.sentence.text) !== box.sentence.hash) {
      problems.push(makeProblem('annotation-schema', file, box.id, "the sentence hash does not match the sentence text stored with the box (edited by hand?); the box is left out", 'draw the box again on the sentence'));
      return;
    }
    const size = imageSizes.get(box.study);
    const sentences = sentencesByStudy.get(box.study);
    if (size === undefined || sentences === undefined) {
      if (skippedStudies.has(box.study)) return;
      problems.push(makeProblem('box-unknown-study', file, box.id, `study "${box.study}" is not in the set or was not loaded; the box is not checked`, `add study "${box.study}" to set.json or fix its problems, or delete the box`));
      return;
    }
    const place = placeRect(box.box, size);
    if (place) {
      problems.push(makeProblem(place.code, file, box.id, `${place.what} (study "${box.study}")`, 'redraw the box inside the image'));
      return;
    }
    const hashes = currentHashes(box.study);
    const at = sentences.findIndex((s) => s.index === box.sentence.index);
    if (at >= 0 && hashes[at] === box.sentence.hash) {
      usable.push(box);
      return;
    }
    const moved = hashes.findIndex((h) => h === box.sentence.hash);
    const entry: StaleBox = {
      box,
      reason: at >= 0 ? 'edited' : 'missing',
      ...(at >= 0 ? { currentText: sentences[at].text } : {}),
      ...(moved >= 0 ? { suggestedIndex: sentences[moved].index } : {}),
    };
    stale.push(entry);
    const now =
      box.sentence.index < 0
        ? 'no sentence of the report has that text now'
        : at >= 0
          ? `sentence ${box.sentence.index} now reads ${JSON.stringify(sentences[at].text)}`
          : `the report has no sentence ${box.sentence.index}`;
    const hint = moved >= 0 ? `; the same text is now sentence ${sentences[moved].index}` : '';
    problems.push(
      makeProblem('stale-annotation', file, box.id, `the box was drawn on ${JSON.stringify(box.sentence.text)} but ${now}${hint} (study "${box.study}")`, moved >= 0 ? `confirm the box belongs to sentence ${sentences[moved].index}, or delete it` : 'draw the box again on the edited sentence, or delete it'),
    );
  });

  const lungsKept: LungTemplate[] = [];
  const lungsUsable: LungTemplate[] = [];
  ((doc.lungs as unknown[] | undefined) ?? []).forEach((raw, i) => {
    const wrong = checkLungs(raw);
    const item = isObject(raw) && typeof raw.study === 'string' ? `lungs of ${raw.study}` : `lungs[${i}]`;
    if (wrong) {
      problems.push(makeProblem('annotation-schema', file, item, `${wrong}; the lung template is left out`, 'mark the lungs again'));
      return;
    }
    const lung = raw as LungTemplate;
    lungsKept.push(lung);
    const size = imageSizes.get(lung.study);
    if (size === undefined) return;
    for (const side of ['right', 'left'] as const) {
      const place = placeRect(lung[side], size);
      if (place) {
        problems.push(makeProblem(place.code, file, item, `${side} lung: ${place.what}`, 'mark the lungs again inside the image'));
        return;
      }
    }
    lungsUsable.push(lung);
  });

  const out: AnnotationFile = {
    schema: ANNOTATIONS_SCHEMA,
    set: doc.set,
    boxes: kept,
    ...(doc.lungs !== undefined ? { lungs: lungsKept } : {}),
  };
  return { file: out, boxes: usable, stale, lungs: lungsUsable, problems, ...(migratedFrom ? { migratedFrom } : {}) };
}

function orderRect(r: ImageRect): ImageRect {
  return { x: r.x, y: r.y, w: r.w, h: r.h };
}

/**
 * Serialises an annotation file as JSON with a fixed key order, boxes sorted by (study, sentence
 * index, id) and lung templates by study, two-space indent and a final newline, so the same
 * content always gives byte-identical text. Fields outside the format are not written.
 */
export function serialiseAnnotations(file: AnnotationFile): string {
  const cmp = (a: string, b: string): number => (a < b ? -1 : a > b ? 1 : 0);
  const boxes = [...file.boxes]
    .sort((a, b) => cmp(a.study, b.study) || a.sentence.index - b.sentence.index || cmp(a.id, b.id))
    .map((b) => ({
      id: b.id,
      study: b.study,
      sentence: { index: b.sentence.index, text: b.sentence.text, hash: b.sentence.hash },
      zone: b.zone,
      box: orderRect(b.box),
      annotator: b.annotator,
      created: b.created,
    }));
  const doc: Record<string, unknown> = { schema: ANNOTATIONS_SCHEMA, set: file.set, boxes };
  if (file.lungs !== undefined) {
    doc.lungs = [...file.lungs]
      .sort((a, b) => cmp(a.study, b.study) || cmp(a.created, b.created))
      .map((l) => ({ study: l.study, right: orderRect(l.right), left: orderRect(l.left), annotator: l.annotator, created: l.created }));
  }
  return `${JSON.stringify(doc, null, 2)}\n`;
}
