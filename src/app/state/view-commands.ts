import { HIT_RULE_ORDER } from '../../batch/export-format';
import { validateAggregator } from '../../core/pool-regions';
import type { Aggregator, HitRule } from '../../core/types';
import type { CellOverlay, ViewSettings, WindowSetting } from './records';
import type { AppStore } from './store';

function setView<K extends keyof ViewSettings>(store: AppStore, key: K, value: ViewSettings[K]): void {
  store.update((s) => (s.view[key] === value ? s : { ...s, view: { ...s.view, [key]: value } }));
}

/** Sets the region pooling; RangeError for an invalid aggregator (validateAggregator). */
export function setAggregator(store: AppStore, aggregator: Aggregator): void {
  validateAggregator(aggregator);
  setView(store, 'aggregator', aggregator);
}

/** Sets the hit rule of the tables, tallies and map caption; RangeError for a name not in HIT_RULE_ORDER. */
export function setHitRule(store: AppStore, rule: HitRule): void {
  if (!HIT_RULE_ORDER.includes(rule)) throw new RangeError(`'rule' must be one of ${HIT_RULE_ORDER.join(', ')}; got ${JSON.stringify(rule)}`);
  setView(store, 'hitRule', rule);
}

const OVERLAYS: readonly CellOverlay[] = ['map', 'features'];

/** Chooses what the canvas draws over the cells: 'map' (the selected sentence's similarity) or 'features'. */
export function setOverlay(store: AppStore, overlay: CellOverlay): void {
  if (!OVERLAYS.includes(overlay)) throw new RangeError(`'overlay' must be one of ${OVERLAYS.join(', ')}; got ${JSON.stringify(overlay)}`);
  setView(store, 'overlay', overlay);
}

export function setOpacity(store: AppStore, opacity: number): void {
  if (!(opacity >= 0 && opacity <= 1)) throw new RangeError(`'opacity' must be a number in [0, 1]; got ${opacity}`);
  setView(store, 'opacity', opacity);
}

/** Sets the display window (DICOM VOI: width >= 1), or undefined for the image's own. */
export function setWindow(store: AppStore, window: WindowSetting | undefined): void {
  if (window !== undefined && !(Number.isFinite(window.centre) && Number.isFinite(window.width) && window.width >= 1)) {
    throw new RangeError(`'window' must have a finite centre and a finite width >= 1; got centre ${window.centre}, width ${window.width}`);
  }
  setView(store, 'window', window === undefined ? undefined : { centre: window.centre, width: window.width });
}

export function setShowGrid(store: AppStore, show: boolean): void {
  setView(store, 'showGrid', show);
}

export function setShowLinks(store: AppStore, show: boolean): void {
  setView(store, 'showLinks', show);
}

export function setTopK(store: AppStore, k: number): void {
  if (!(Number.isInteger(k) && k >= 1)) throw new RangeError(`'k' must be an integer >= 1; got ${k}`);
  setView(store, 'topK', k);
}

/** The name written into new boxes and lung templates. */
export function setAnnotator(store: AppStore, annotator: string): void {
  if (typeof annotator !== 'string') throw new TypeError(`'annotator' must be a string; got ${typeof annotator}`);
  setView(store, 'annotator', annotator.trim());
}
