import type { OpenedSet } from '../../batch/study-inputs';
import type { ReferenceBox } from '../../dataset/types';
import type { AppState } from '../state';

/**
 * Adapter: the opened set with its reference boxes replaced by the store's current boxes, so
 * batch scoring in the page uses the boxes as they stand after editing (stale ones stay out).
 */
export function setWithStoreBoxes(set: OpenedSet, state: AppState): OpenedSet {
  const boxes = new Map<string, Map<number, ReferenceBox[]>>();
  for (const b of Object.values(state.boxes)) {
    if (!set.reports.has(b.study)) continue;
    let m = boxes.get(b.study);
    if (!m) boxes.set(b.study, (m = new Map()));
    const list = m.get(b.sentence.index) ?? [];
    list.push(b);
    m.set(b.sentence.index, list);
  }
  return { ...set, boxes };
}
