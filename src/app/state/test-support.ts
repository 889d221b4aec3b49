import type { StudyRecord } from '../../dataset/types';
import { loadSet, setImageSize } from './commands';
import { createAppStore, type AppStore } from './store';

// Shared by the state and tool tests: a small synthetic set with two studies.

export const REPORT_A =
  'FINDINGS: Patchy opacity in the right lower zone. No pleural effusion. Nodule in the left upper lobe and right upper zone. Heart size is normal.';
export const REPORT_B = 'FINDINGS: Left lower zone consolidation. The lungs are otherwise clear.';

export const STUDIES: readonly StudyRecord[] = [
  { id: 'study-a', image: 'images/a.png', report: REPORT_A },
  { id: 'study-b', image: 'images/b.png', report: REPORT_B },
];

export const FIXED_TIME = '2024-05-01T10:00:00.000Z';

/** A store with the two studies loaded (400 x 300 images), study-a selected, annotator 'tester'. */
export function makeTestStore(now: () => string = () => FIXED_TIME): AppStore {
  const store = createAppStore({ view: { annotator: 'tester' } }, { now });
  loadSet(store, { name: 'test-set', studies: STUDIES });
  setImageSize(store, 'study-a', { width: 400, height: 300 });
  setImageSize(store, 'study-b', { width: 400, height: 300 });
  return store;
}

export const LUNGS = { right: { x: 40, y: 30, w: 120, h: 210 }, left: { x: 240, y: 30, w: 120, h: 210 } };
