import { hashSentenceText } from '../../core/text-hash';
import type { ImageRect, Size } from '../../core/types';
import type { ReferenceBox, SentenceKey } from '../../dataset/types';
import type { ParsedSentence } from '../../report/types';
import type { AppState, StudyEntry } from './records';

export function findStudy(state: AppState, id: string | undefined): StudyEntry | undefined {
  return id === undefined ? undefined : state.studies.find((s) => s.id === id);
}

export function selectedStudy(state: AppState): StudyEntry | undefined {
  return findStudy(state, state.selection.studyId);
}

export function selectedSentence(state: AppState): ParsedSentence | undefined {
  const i = state.selection.sentenceIndex;
  return i === undefined ? undefined : selectedStudy(state)?.parsed.sentences.find((s) => s.index === i);
}

export function selectedBox(state: AppState): ReferenceBox | undefined {
  const id = state.selection.boxId;
  return id === undefined ? undefined : state.boxes[id];
}

/** The study's boxes in drawing order (creation time, then id). */
export function boxesOfStudy(state: AppState, studyId: string): ReferenceBox[] {
  return Object.values(state.boxes)
    .filter((b) => b.study === studyId)
    .sort((a, b) => (a.created < b.created ? -1 : a.created > b.created ? 1 : a.id < b.id ? -1 : a.id > b.id ? 1 : 0));
}

export function boxesOfSentence(state: AppState, studyId: string, sentenceIndex: number): ReferenceBox[] {
  return boxesOfStudy(state, studyId).filter((b) => b.sentence.index === sentenceIndex);
}

/** The key that ties a box to a sentence: index, text and hashSentenceText(text). */
export function sentenceKeyOf(sentence: { readonly index: number; readonly text: string }): SentenceKey {
  return { index: sentence.index, text: sentence.text, hash: hashSentenceText(sentence.text) };
}

/** What is wrong with a rect as a box in an image of `size` (size unknown: only finiteness and area), or undefined. */
export function rectProblem(rect: ImageRect, size: Size | undefined): string | undefined {
  if (![rect.x, rect.y, rect.w, rect.h].every(Number.isFinite)) return `x, y, w, h must be finite; got ${rect.x}, ${rect.y}, ${rect.w}, ${rect.h}`;
  if (!(rect.w > 0 && rect.h > 0)) return `w and h must be > 0; got ${rect.w}, ${rect.h}`;
  if (size && (rect.x < 0 || rect.y < 0 || rect.x + rect.w > size.width || rect.y + rect.h > size.height)) {
    return `the box [${rect.x}, ${rect.y}, ${rect.w}, ${rect.h}] must lie inside the ${size.width} x ${size.height} image`;
  }
  return undefined;
}

/** The rect moved and cut so that it lies inside the image; undefined when nothing is left. */
export function clampRectToImage(rect: ImageRect, size: Size): ImageRect | undefined {
  const x0 = Math.max(0, Math.min(rect.x, rect.x + rect.w));
  const y0 = Math.max(0, Math.min(rect.y, rect.y + rect.h));
  const x1 = Math.min(size.width, Math.max(rect.x, rect.x + rect.w));
  const y1 = Math.min(size.height, Math.max(rect.y, rect.y + rect.h));
  return x1 > x0 && y1 > y0 ? { x: x0, y: y0, w: x1 - x0, h: y1 - y0 } : undefined;
}
