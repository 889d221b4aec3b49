import { loadAnnotations, serialiseAnnotations, type AnnotationContext, type LoadedAnnotations } from '../../dataset/annotations';
import { DatasetError, formatProblemMessage, type Problem } from '../../dataset/errors';
import { exportCoco, importCoco, type InterchangeImage } from '../../dataset/interchange';
import { ANNOTATIONS_SCHEMA, type AnnotationFile, type LungTemplate, type ReferenceBox } from '../../dataset/types';
import { nextBoxId } from './box-commands';
import { recordChange } from './history';
import type { AppState, Notice } from './records';
import type { AppStore } from './store';

/**
 * Everything the state holds as one annotation file: current, stale and held boxes and lung
 * templates, so that writing it and reading it back loses nothing.
 */
export function annotationFileOf(state: AppState): AnnotationFile {
  return {
    schema: ANNOTATIONS_SCHEMA,
    set: state.setName,
    boxes: [...Object.values(state.boxes), ...state.stale.map((s) => s.box), ...state.held],
    lungs: [...Object.values(state.lungs), ...state.heldLungs],
  };
}

/** The set's annotation file text (serialiseAnnotations: byte-identical for the same content). */
export function exportAnnotations(state: AppState): string {
  return serialiseAnnotations(annotationFileOf(state));
}

/** COCO-style JSON of the current boxes (exportCoco). RangeError naming the study when a study with boxes has no known image size. */
export function exportCocoJson(state: AppState): string {
  const images = new Map<string, InterchangeImage>();
  for (const s of state.studies) if (s.imageSize) images.set(s.id, { file: s.image, width: s.imageSize.width, height: s.imageSize.height });
  const file: AnnotationFile = { schema: ANNOTATIONS_SCHEMA, set: state.setName, boxes: Object.values(state.boxes) };
  return `${JSON.stringify(exportCoco(file, images), null, 2)}\n`;
}

/**
 * The loader's view of the loaded studies. A study whose image is not decoded yet gets an
 * unbounded size: its boxes are matched to sentences but their placement is not checked.
 */
export function annotationContextOf(state: AppState): AnnotationContext {
  return {
    imageSizes: new Map(state.studies.map((s) => [s.id, s.imageSize ?? { width: Infinity, height: Infinity }])),
    sentencesByStudy: new Map(state.studies.map((s) => [s.id, s.parsed.sentences.map((x) => ({ index: x.index, text: x.text }))])),
  };
}

function sameJson(a: unknown, b: unknown): boolean {
  return JSON.stringify(a) === JSON.stringify(b);
}

function noticeOf(level: Notice['level'], text: string, items: readonly string[]): Notice {
  return { level, text, items };
}

/** Boxes and lung templates the loader kept in the file but could not use (and did not call stale). */
function heldOf(loaded: LoadedAnnotations): { boxes: ReferenceBox[]; lungs: LungTemplate[] } {
  const used = new Set([...loaded.boxes, ...loaded.stale.map((s) => s.box)].map((b) => b.id));
  const lungsUsed = new Set(loaded.lungs);
  return { boxes: loaded.file.boxes.filter((b) => !used.has(b.id)), lungs: (loaded.file.lungs ?? []).filter((l) => !lungsUsed.has(l)) };
}

export interface ImportReport {
  /** False when the file could not be read at all; the state is then unchanged. */
  readonly ok: boolean;
  readonly added: readonly string[]; // box ids now in the store
  readonly unchanged: readonly string[]; // already present with the same content
  readonly renamed: readonly { readonly from: string; readonly to: string }[]; // id taken by a different box
  readonly stale: readonly string[]; // shown apart, not attached
  readonly lungsAdded: readonly string[]; // studies
  readonly lungsKept: readonly string[]; // studies whose existing template was kept
  readonly problems: readonly Problem[];
  readonly notice: Notice;
}

function readDocument(text: string, file: string, format: 'auto' | 'tessera' | 'coco'): { loadedFrom: unknown; problems: Problem[] } {
  let json: unknown;
  try {
    json = JSON.parse(text);
  } catch (cause) {
    throw new DatasetError(`the file is not JSON (${(cause as Error).message})`, { code: 'annotation-schema', file, fix: 'choose an annotation file or a COCO-style JSON export', cause });
  }
  const looksCoco = typeof json === 'object' && json !== null && !('schema' in json) && 'annotations' in json;
  if (format === 'coco' || (format === 'auto' && looksCoco)) {
    const { file: doc, problems } = importCoco(json, file);
    return { loadedFrom: doc, problems };
  }
  return { loadedFrom: json, problems: [] };
}

/**
 * Imports an annotation file (any version loadAnnotations reads) or a COCO-style JSON export into
 * the store, keeping every existing box: boxes of the file that match their sentence are added
 * (one undo step), an id already used by a different box gets a new id, boxes whose sentence
 * changed go to the stale list, boxes for studies that are not loaded or outside their image are
 * listed and left out, existing lung templates are kept. A file of another version or format
 * changes nothing. The outcome is returned and added to the store's notices, every item listed.
 */
export function importAnnotations(store: AppStore, text: string, file: string, { format = 'auto' }: { readonly format?: 'auto' | 'tessera' | 'coco' } = {}): ImportReport {
  const state = store.get();
  let loaded: LoadedAnnotations;
  let problems: Problem[];
  try {
    const doc = readDocument(text, file, format);
    loaded = loadAnnotations(doc.loadedFrom, file, annotationContextOf(state));
    problems = [...doc.problems, ...loaded.problems];
  } catch (e) {
    if (!(e instanceof DatasetError)) throw e;
    const notice = noticeOf('error', `Nothing was imported from ${file}; the boxes you have are unchanged.`, e.problems.map((p) => p.message));
    store.update((s) => ({ ...s, notices: [...s.notices, notice] }));
    return { ok: false, added: [], unchanged: [], renamed: [], stale: [], lungsAdded: [], lungsKept: [], problems: e.problems, notice };
  }
  if (loaded.file.set !== state.setName) {
    problems.unshift({
      code: 'annotation-schema',
      file,
      item: 'set',
      message: formatProblemMessage(file, 'set', `the file is for set "${loaded.file.set}", not "${state.setName}"; boxes of matching studies are imported`, 'check that you chose the right file'),
      fix: 'check that you chose the right file',
    });
  }
  const added: string[] = [];
  const unchanged: string[] = [];
  const renamed: { from: string; to: string }[] = [];
  const boxPairs: Record<string, readonly [undefined, ReferenceBox]> = {};
  let scratch = state;
  for (const b of loaded.boxes) {
    const existing = state.boxes[b.id];
    if (existing && sameJson(existing, b)) {
      unchanged.push(b.id);
      continue;
    }
    const id = existing || boxPairs[b.id] ? nextBoxId(scratch) : b.id;
    if (id !== b.id) renamed.push({ from: b.id, to: id });
    const box = { ...b, id };
    boxPairs[id] = [undefined, box];
    scratch = { ...scratch, boxes: { ...scratch.boxes, [id]: box } };
    added.push(id);
  }
  const lungPairs: Record<string, readonly [undefined, LungTemplate]> = {};
  const lungsAdded: string[] = [];
  const lungsKept: string[] = [];
  for (const l of loaded.lungs) {
    const existing = state.lungs[l.study];
    if (existing) {
      if (!sameJson(existing, l)) lungsKept.push(l.study);
    } else if (!lungPairs[l.study]) {
      lungPairs[l.study] = [undefined, l];
      lungsAdded.push(l.study);
    }
  }
  const knownStale = new Set(state.stale.map((s) => s.box.id));
  const newStale = loaded.stale.filter((s) => !knownStale.has(s.box.id) && !state.boxes[s.box.id]);
  const items = [
    ...problems.map((p) => p.message),
    ...renamed.map((r) => `${file} (${r.from}): the id is used by another box here; imported as ${r.to}`),
    ...lungsKept.map((s) => `${file} (lungs of ${s}): the lung template already marked here is kept; the file's is not imported`),
  ];
  // Nothing usable but problems (another set's file, unknown studies): the headline says why.
  const headline = added.length === 0 && lungsAdded.length === 0 && unchanged.length === 0 && problems.length > 0 ? `Nothing usable in ${file}: ${problems[0].message}. ` : '';
  const summary = `${headline}Imported ${added.length} box${added.length === 1 ? '' : 'es'} and ${lungsAdded.length} lung template${lungsAdded.length === 1 ? '' : 's'} from ${file}${unchanged.length ? `; ${unchanged.length} already here` : ''}${newStale.length ? `; ${newStale.length} stale, shown apart` : ''}.`;
  const notice = noticeOf(items.length ? 'warning' : 'info', summary, items);
  store.update((s) => {
    const next = recordChange(s, 'importAnnotations', { boxes: boxPairs, lungs: lungPairs });
    return { ...next, stale: [...next.stale, ...newStale], notices: [...next.notices, notice] };
  });
  return { ok: true, added, unchanged, renamed, stale: newStale.map((s) => s.box.id), lungsAdded, lungsKept, problems, notice };
}

/**
 * Replaces the store's annotations with a saved annotation file (restore on load, not undoable):
 * usable boxes and lung templates become records, boxes whose sentence text changed are flagged
 * stale (never re-attached), the rest is held so the next save writes it back. Throws DatasetError
 * as loadAnnotations does; the state is then unchanged.
 */
export function restoreAnnotations(store: AppStore, json: unknown, source: string): LoadedAnnotations {
  const state = store.get();
  const loaded = loadAnnotations(json, source, annotationContextOf(state));
  const held = heldOf(loaded);
  const items = loaded.problems.map((p) => p.message);
  store.update((s) => ({
    ...s,
    boxes: Object.fromEntries(loaded.boxes.map((b) => [b.id, b])),
    lungs: Object.fromEntries(loaded.lungs.map((l) => [l.study, l])),
    stale: loaded.stale,
    held: held.boxes,
    heldLungs: held.lungs,
    history: { past: [], future: [] },
    selection: s.selection.boxId !== undefined && !loaded.boxes.some((b) => b.id === s.selection.boxId) ? { ...s.selection, boxId: undefined } : s.selection,
    notices: items.length ? [...s.notices, noticeOf('warning', `Some saved annotations need attention (${source}).`, items)] : s.notices,
  }));
  return loaded;
}
