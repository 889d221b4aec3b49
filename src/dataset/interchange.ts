import { hashSentenceText } from '../core/text-hash';
import type { ZoneLabel } from '../core/types';
import { DatasetError, makeProblem, type Problem } from './errors';
import { ZONE_LABELS } from './sample-set';
import { ANNOTATIONS_SCHEMA, type AnnotationFile, type ReferenceBox } from './types';
import { describeJson, isObject } from './validate-json';

/**
 * Interchange of reference boxes with other tools: COCO-style box JSON (images, annotations with
 * bbox [x, y, w, h] in pixels, categories) and CSV (RFC 4180). Our sentence key and box metadata
 * travel in an extra "tessera" field of each COCO annotation, so a COCO round trip is lossless.
 */

export const COCO_FORMAT = 'tessera.coco/1';

export interface CocoImage {
  readonly id: number;
  readonly file_name: string;
  readonly width: number;
  readonly height: number;
  readonly tessera_study: string;
}

export interface CocoAnnotation {
  readonly id: number;
  readonly image_id: number;
  readonly category_id: number;
  readonly bbox: readonly [number, number, number, number];
  readonly area: number;
  readonly iscrowd: 0;
  readonly tessera: {
    readonly box_id: string;
    readonly sentence: { readonly index: number; readonly text: string; readonly hash: string };
    readonly annotator: string;
    readonly created: string;
  };
}

export interface CocoDocument {
  readonly info: { readonly description: string; readonly format: typeof COCO_FORMAT; readonly tessera_set: string };
  readonly images: readonly CocoImage[];
  readonly annotations: readonly CocoAnnotation[];
  readonly categories: readonly { readonly id: number; readonly name: ZoneLabel; readonly supercategory: string }[];
}

/** Image facts a COCO export needs for each study. */
export interface InterchangeImage {
  readonly file: string;
  readonly width: number;
  readonly height: number;
}

const CATEGORY_IDS = new Map<ZoneLabel, number>(ZONE_LABELS.map((z, i) => [z, i + 1]));

function sortedBoxes(boxes: readonly ReferenceBox[]): ReferenceBox[] {
  const cmp = (a: string, b: string): number => (a < b ? -1 : a > b ? 1 : 0);
  return [...boxes].sort((a, b) => cmp(a.study, b.study) || a.sentence.index - b.sentence.index || cmp(a.id, b.id));
}

/**
 * Exports an annotation file as a COCO-style document. Images are numbered 1.. in study order,
 * annotations 1.. in (study, sentence, box id) order, categories are the nine zone labels.
 * Throws RangeError naming the study when `images` has no entry for a box's study.
 */
export function exportCoco(file: AnnotationFile, images: ReadonlyMap<string, InterchangeImage>): CocoDocument {
  const boxes = sortedBoxes(file.boxes);
  const studies = [...new Set(boxes.map((b) => b.study))].sort();
  const imageIds = new Map<string, number>();
  const cocoImages: CocoImage[] = studies.map((study, i) => {
    const img = images.get(study);
    if (img === undefined) throw new RangeError(`'images' must have an entry for every study with boxes; got none for '${study}'`);
    imageIds.set(study, i + 1);
    return { id: i + 1, file_name: img.file, width: img.width, height: img.height, tessera_study: study };
  });
  return {
    info: { description: `Reference boxes of sample set '${file.set}'`, format: COCO_FORMAT, tessera_set: file.set },
    images: cocoImages,
    annotations: boxes.map((b, i) => ({
      id: i + 1,
      image_id: imageIds.get(b.study) as number,
      category_id: CATEGORY_IDS.get(b.zone) as number,
      bbox: [b.box.x, b.box.y, b.box.w, b.box.h],
      area: b.box.w * b.box.h,
      iscrowd: 0,
      tessera: { box_id: b.id, sentence: { index: b.sentence.index, text: b.sentence.text, hash: b.sentence.hash }, annotator: b.annotator, created: b.created },
    })),
    categories: ZONE_LABELS.map((z) => ({ id: CATEGORY_IDS.get(z) as number, name: z, supercategory: z.includes('-') ? 'lung' : 'other' })),
  };
}

/**
 * Imports a COCO-style document into an annotation file. Each annotation needs our "tessera"
 * field (the sentence key): one without it cannot be tied to a sentence and is reported, as are
 * unknown images or categories and malformed boxes. Geometry and staleness are checked later by
 * loadAnnotations. `file` names the document in messages; `set` overrides info.tessera_set.
 */
export function importCoco(json: unknown, file: string, { set }: { set?: string } = {}): { file: AnnotationFile; problems: Problem[] } {
  if (!isObject(json) || !Array.isArray(json.images) || !Array.isArray(json.annotations) || !Array.isArray(json.categories)) {
    throw new DatasetError('the file is not a COCO-style box document (it needs "images", "annotations" and "categories" lists)', { code: 'interchange-format', file, fix: 'export the boxes as COCO-style JSON, or use the CSV import' });
  }
  const problems: Problem[] = [];
  const studies = new Map<number, string>();
  for (const img of json.images) {
    if (isObject(img) && typeof img.id === 'number') {
      const study = typeof img.tessera_study === 'string' ? img.tessera_study : typeof img.file_name === 'string' ? img.file_name.replace(/^.*\//, '').replace(/\.[^.]*$/, '') : undefined;
      if (study) studies.set(img.id, study);
    }
  }
  const zones = new Map<number, ZoneLabel>();
  for (const c of json.categories) {
    if (isObject(c) && typeof c.id === 'number' && ZONE_LABELS.includes(c.name as ZoneLabel)) zones.set(c.id, c.name as ZoneLabel);
  }
  const boxes: ReferenceBox[] = [];
  json.annotations.forEach((a: unknown, i: number) => {
    const item = isObject(a) && typeof a.id === 'number' ? `annotation ${a.id}` : `annotations[${i}]`;
    const bad = (what: string, fix: string): void => {
      problems.push(makeProblem('interchange-format', file, item, `${what}; the annotation is left out`, fix));
    };
    if (!isObject(a)) return bad(`must be an object; got ${describeJson(a)}`, 'correct the annotation');
    const study = studies.get(a.image_id as number);
    if (study === undefined) return bad(`image_id ${describeJson(a.image_id)} names no image`, 'add the image to "images"');
    const zone = zones.get(a.category_id as number);
    if (zone === undefined) return bad(`category_id ${describeJson(a.category_id)} is not one of our zone labels (${ZONE_LABELS.join(', ')})`, 'map the category to a zone label');
    const bbox = a.bbox;
    if (!Array.isArray(bbox) || bbox.length !== 4 || !bbox.every((v) => typeof v === 'number' && Number.isFinite(v))) return bad(`bbox must be [x, y, w, h] numbers; got ${JSON.stringify(bbox)}`, 'correct the bbox');
    const t = a.tessera;
    if (!isObject(t) || !isObject(t.sentence) || typeof t.sentence.text !== 'string' || typeof t.sentence.index !== 'number') {
      return bad('has no "tessera" sentence key, so it cannot be tied to a report sentence', 'draw the box in Tessera, or add "tessera": { "sentence": { "index", "text" } }');
    }
    boxes.push({
      id: typeof t.box_id === 'string' && t.box_id !== '' ? t.box_id : `coco-${String(a.id ?? i)}`,
      study,
      sentence: { index: t.sentence.index, text: t.sentence.text, hash: typeof t.sentence.hash === 'string' ? t.sentence.hash : hashSentenceText(t.sentence.text) },
      zone,
      box: { x: bbox[0], y: bbox[1], w: bbox[2], h: bbox[3] },
      annotator: typeof t.annotator === 'string' ? t.annotator : '',
      created: typeof t.created === 'string' ? t.created : '',
    });
  });
  const info = isObject(json.info) ? json.info : {};
  const setName = set ?? (typeof info.tessera_set === 'string' ? info.tessera_set : '');
  return { file: { schema: ANNOTATIONS_SCHEMA, set: setName, boxes }, problems };
}

export const CSV_HEADER = ['study', 'sentence_index', 'sentence_hash', 'sentence_text', 'zone', 'x', 'y', 'w', 'h', 'annotator', 'created'] as const;

/** Quotes a CSV field when it holds a comma, a double quote, CR or LF (RFC 4180 section 2). */
function csvField(value: string): string {
  return /[",\r\n]/.test(value) ? `"${value.replace(/"/g, '""')}"` : value;
}

/**
 * Exports boxes as CSV (RFC 4180: CRLF line ends, quoted fields where needed) with the header
 * study,sentence_index,sentence_hash,sentence_text,zone,x,y,w,h,annotator,created, rows in
 * (study, sentence, box id) order. Numbers are written in their shortest exact form. Box ids are
 * not part of the CSV; importCsv makes them from the row's content.
 */
export function exportCsv(file: AnnotationFile): string {
  const rows = [CSV_HEADER.join(',')];
  for (const b of sortedBoxes(file.boxes)) {
    rows.push(
      [b.study, String(b.sentence.index), b.sentence.hash, b.sentence.text, b.zone, String(b.box.x), String(b.box.y), String(b.box.w), String(b.box.h), b.annotator, b.created]
        .map(csvField)
        .join(','),
    );
  }
  return rows.join('\r\n') + '\r\n';
}

/** Parses RFC 4180 CSV into rows of fields; accepts LF or CRLF line ends. Throws on an unclosed quote. */
export function parseCsv(text: string): string[][] {
  const rows: string[][] = [];
  let row: string[] = [];
  let field = '';
  let i = 0;
  let quoted = false;
  let fieldStarted = false;
  while (i < text.length) {
    const c = text[i];
    if (quoted) {
      if (c === '"') {
        if (text[i + 1] === '"') {
          field += '"';
          i += 2;
          continue;
        }
        quoted = false;
        i++;
        continue;
      }
      field += c;
      i++;
      continue;
    }
    if (c === '"' && !fieldStarted) {
      quoted = true;
      fieldStarted = true;
      i++;
    } else if (c === ',') {
      row.push(field);
      field = '';
      fieldStarted = false;
      i++;
    } else if (c === '\r' || c === '\n') {
      row.push(field);
      rows.push(row);
      row = [];
      field = '';
      fieldStarted = false;
      i += c === '\r' && text[i + 1] === '\n' ? 2 : 1;
    } else {
      field += c;
      fieldStarted = true;
      i++;
    }
  }
  if (quoted) throw new SyntaxError('a quoted field is not closed before the end of the text');
  if (fieldStarted || row.length > 0) {
    row.push(field);
    rows.push(row);
  }
  return rows;
}

/**
 * Imports boxes from CSV with the exportCsv header (columns may come in any order; all are
 * required). Each row becomes a box with id 'csv-<study>-<sentence index>-<8 hex digits of the
 * row's hash>', so importing the same rows gives the same ids. A missing hash is computed from the
 * text. Malformed rows are reported by line number and left out.
 */
export function importCsv(text: string, file: string, { set }: { set: string }): { file: AnnotationFile; problems: Problem[] } {
  let rows: string[][];
  try {
    rows = parseCsv(text.replace(/^\uFEFF/, ''));
  } catch (cause) {
    throw new DatasetError(`the CSV cannot be read (${(cause as Error).message})`, { code: 'interchange-format', file, fix: 'close the quoted field, or export the CSV again', cause });
  }
  const header = rows[0] ?? [];
  const missing = CSV_HEADER.filter((h) => !header.includes(h));
  if (missing.length) {
    throw new DatasetError(`the header lacks ${missing.join(', ')}`, { code: 'interchange-format', file, item: 'line 1', fix: `start the file with the header ${CSV_HEADER.join(',')}` });
  }
  const col = new Map(CSV_HEADER.map((h) => [h, header.indexOf(h)]));
  const problems: Problem[] = [];
  const boxes: ReferenceBox[] = [];
  const ids = new Map<string, number>();
  rows.slice(1).forEach((r, k) => {
    const line = `line ${k + 2}`;
    if (r.length === 1 && r[0] === '') return;
    const get = (h: (typeof CSV_HEADER)[number]): string => r[col.get(h) as number] ?? '';
    const bad = (what: string): void => {
      problems.push(makeProblem('interchange-format', file, line, `${what}; the row is left out`, 'correct the row'));
    };
    if (r.length !== header.length) return bad(`the row has ${r.length} fields, the header ${header.length}`);
    const num = (h: 'x' | 'y' | 'w' | 'h'): number => (get(h).trim() === '' ? NaN : Number(get(h)));
    const [x, y, w, h] = [num('x'), num('y'), num('w'), num('h')];
    if (![x, y, w, h].every(Number.isFinite)) return bad(`x, y, w, h must be numbers; got ${[get('x'), get('y'), get('w'), get('h')].join(', ')}`);
    const index = Number(get('sentence_index'));
    if (get('sentence_index').trim() === '' || !Number.isInteger(index) || index < -1) return bad(`sentence_index must be an integer >= 0; got '${get('sentence_index')}'`);
    const zone = get('zone') as ZoneLabel;
    if (!ZONE_LABELS.includes(zone)) return bad(`zone must be one of ${ZONE_LABELS.join(', ')}; got '${get('zone')}'`);
    const study = get('study');
    if (study === '') return bad('study is empty');
    const sentenceText = get('sentence_text');
    const hash = get('sentence_hash') || hashSentenceText(sentenceText);
    const base = `csv-${study}-${index}-${hashSentenceText(r.join('\u001f')).slice(0, 8)}`;
    const n = (ids.get(base) ?? 0) + 1;
    ids.set(base, n);
    boxes.push({
      id: n === 1 ? base : `${base}-${n}`,
      study,
      sentence: { index, text: sentenceText, hash },
      zone,
      box: { x, y, w, h },
      annotator: get('annotator'),
      created: get('created'),
    });
  });
  return { file: { schema: ANNOTATIONS_SCHEMA, set, boxes }, problems };
}
