import type { Size } from '../../core/types';
import type { StudyRecord } from '../../dataset/types';
import { parseReport } from '../../report/parse-report';
import { findStudy } from './queries';
import type { Notice, StudyEntry } from './records';
import type { AppStore } from './store';

/** A study record with its report parsed (parseReport); imageSize when already known. */
export function toStudyEntry(record: StudyRecord, imageSize?: Size): StudyEntry {
  return {
    id: record.id,
    image: record.image,
    report: record.report,
    parsed: parseReport(record.report),
    ...(imageSize ? { imageSize } : {}),
    ...(record.labels ? { labels: record.labels } : {}),
  };
}

/**
 * Opens a sample set: its studies replace the loaded ones; boxes, lung templates, stale and held
 * boxes and undo history start empty (annotations come next, from restore or import); the first
 * study and its first sentence are selected. RangeError for duplicate study ids.
 */
export function loadSet(store: AppStore, { name, studies }: { readonly name: string; readonly studies: readonly StudyRecord[] }): void {
  const seen = new Set<string>();
  const dup = studies.filter((s) => (seen.has(s.id) ? true : (seen.add(s.id), false))).map((s) => s.id);
  if (dup.length) throw new RangeError(`'studies' must have distinct ids; got repeats of ${[...new Set(dup)].join(', ')}`);
  const entries = studies.map((s) => toStudyEntry(s));
  store.update((s) => ({
    ...s,
    setName: name,
    studies: entries,
    boxes: {},
    lungs: {},
    stale: [],
    held: [],
    heldLungs: [],
    notices: [],
    history: { past: [], future: [] },
    selection: entries.length ? { studyId: entries[0].id, sentenceIndex: entries[0].parsed.sentences[0]?.index } : {},
  }));
}

/** Records a study's decoded image size. RangeError for an unknown study or a size that is not positive. */
export function setImageSize(store: AppStore, studyId: string, size: Size): void {
  if (!findStudy(store.get(), studyId)) throw new RangeError(`'studyId' must name a loaded study; got '${studyId}'`);
  if (!(Number.isFinite(size.width) && Number.isFinite(size.height) && size.width > 0 && size.height > 0)) {
    throw new RangeError(`'size' must have finite width and height > 0; got ${size.width} x ${size.height}`);
  }
  store.update((s) => ({
    ...s,
    studies: s.studies.map((e) => (e.id === studyId ? { ...e, imageSize: { width: size.width, height: size.height } } : e)),
  }));
}

export function addNotice(store: AppStore, notice: Notice): void {
  store.update((s) => ({ ...s, notices: [...s.notices, notice] }));
}

/** Removes the notice at `index` (out of range: no change). */
export function dismissNotice(store: AppStore, index: number): void {
  store.update((s) => (index >= 0 && index < s.notices.length ? { ...s, notices: s.notices.filter((_, i) => i !== index) } : s));
}
