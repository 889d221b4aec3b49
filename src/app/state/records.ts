import type { Aggregator, HitRule, ImageRect, LungZone, Size } from '../../core/types';
import type { LungTemplate, ReferenceBox, SentenceKey, StudyRecord } from '../../dataset/types';
import type { StaleBox } from '../../dataset/annotations';
import type { ParsedReport } from '../../report/types';

/** One study as the explorer holds it: the set's record plus its parsed report. */
export interface StudyEntry {
  readonly id: string;
  readonly image: string; // path relative to the set folder
  readonly report: string;
  readonly parsed: ParsedReport; // parseReport(report)
  /** Size of the decoded image, image pixels; unknown until the image is decoded. */
  readonly imageSize?: Size;
  readonly labels?: StudyRecord['labels'];
}

/** What the researcher is looking at; changing it never touches undo history. */
export interface Selection {
  readonly studyId?: string;
  readonly sentenceIndex?: number;
  readonly boxId?: string;
  /** Row-major index of the grid cell under the pointer. */
  readonly hoverCell?: number;
}

/** Display window in the units of the decoded image's values (DICOM VOI centre / width). */
export interface WindowSetting {
  readonly centre: number;
  readonly width: number;
}

/** What the study canvas draws over the cells: the selected sentence's similarity map, or the region features. */
export type CellOverlay = 'map' | 'features';

export interface ViewSettings {
  readonly aggregator: Aggregator;
  /** How a sentence's best cell is judged against its boxes (tables, tallies, the map caption). */
  readonly hitRule: HitRule;
  /** What the canvas draws over the cells; both use `opacity`. */
  readonly overlay: CellOverlay;
  readonly opacity: number; // of the cell overlay (map or features), [0, 1]
  readonly showGrid: boolean;
  readonly showLinks: boolean;
  readonly topK: number; // outlines drawn for the k best cells
  /** undefined: the image's own window or value range. */
  readonly window?: WindowSetting;
  readonly annotator: string; // written into new boxes and lung templates
}

/** A message for the researcher after an import, a restore or a refused edit. */
export interface Notice {
  readonly level: 'info' | 'warning' | 'error';
  readonly text: string;
  /** The items the message is about (box ids, studies, file problems), one line each. */
  readonly items: readonly string[];
}

/** One undoable change: for each touched record, its value before and after (undefined = absent). */
export interface RecordDiff {
  readonly boxes: Readonly<Record<string, readonly [ReferenceBox | undefined, ReferenceBox | undefined]>>;
  readonly lungs: Readonly<Record<string, readonly [LungTemplate | undefined, LungTemplate | undefined]>>;
}

export interface HistoryStep {
  readonly label: string; // the command's name, e.g. 'moveBox'
  readonly diff: RecordDiff;
}

export interface HistoryState {
  readonly past: readonly HistoryStep[];
  readonly future: readonly HistoryStep[];
  /** An open drag: its changes gather here and become one step when it ends. */
  readonly drag?: HistoryStep;
}

/** A proposed reference box: a zone of the study's lung template, for a sentence naming that zone. */
export interface Proposal {
  readonly study: string;
  readonly sentence: SentenceKey;
  readonly zone: LungZone;
  readonly box: ImageRect;
}

export interface AppState {
  readonly setName: string;
  readonly studies: readonly StudyEntry[];
  /** Reference boxes by id. */
  readonly boxes: Readonly<Record<string, ReferenceBox>>;
  /** Lung templates by study id. */
  readonly lungs: Readonly<Record<string, LungTemplate>>;
  /** Boxes whose sentence changed since they were drawn: shown apart, never re-attached. */
  readonly stale: readonly StaleBox[];
  /** Boxes kept only so that saving loses nothing (study not loaded, box outside its image). */
  readonly held: readonly ReferenceBox[];
  /** Lung templates kept for the same reason (study not loaded, outside its image). */
  readonly heldLungs: readonly LungTemplate[];
  readonly selection: Selection;
  readonly view: ViewSettings;
  readonly notices: readonly Notice[];
  readonly history: HistoryState;
}

export const DEFAULT_VIEW: ViewSettings = {
  aggregator: { kind: 'max' },
  hitRule: 'centre',
  overlay: 'map',
  opacity: 0.5,
  showGrid: true,
  showLinks: true,
  topK: 5,
  annotator: '',
};

/** Fields to start a store with; view settings may be given in part. */
export type InitialState = Partial<Omit<AppState, 'view'>> & { readonly view?: Partial<ViewSettings> };

/** An empty state with every field present; `initial` overrides fields. */
export function createInitialState(initial: InitialState = {}): AppState {
  return {
    setName: '',
    studies: [],
    boxes: {},
    lungs: {},
    stale: [],
    held: [],
    heldLungs: [],
    selection: {},
    notices: [],
    history: { past: [], future: [] },
    ...initial,
    view: { ...DEFAULT_VIEW, ...initial.view },
  };
}
