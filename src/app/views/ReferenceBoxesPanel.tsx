import { useRef } from 'react';
import type { ZoneLabel } from '../../core/types';
import { ZONE_LABELS } from '../../dataset/sample-set';
import type { AppState, AppStore } from '../state';
import {
  acceptProposal,
  boxesOfSentence,
  deleteBox,
  deleteLungTemplate,
  discardStaleBox,
  importAnnotations,
  proposalsFor,
  selectBox,
  selectedStudy,
  setAnnotator,
  setBoxZone,
} from '../state';
import { zoneName } from './key-bindings';

export interface ReferenceBoxesPanelProps {
  readonly state: AppState;
  readonly store: AppStore;
  readonly onProblem: (message: string) => void;
}

const ROUND = (v: number) => Math.round(v);

/** The selected sentence's reference boxes, its proposals, the study's lung template and stale boxes. */
export function ReferenceBoxesPanel({ state, store, onProblem }: ReferenceBoxesPanelProps) {
  const fileInput = useRef<HTMLInputElement>(null);
  const study = selectedStudy(state);
  const index = state.selection.sentenceIndex;
  const attempt = (fn: () => void) => {
    try {
      fn();
    } catch (err) {
      onProblem((err as Error).message);
    }
  };
  if (!study) return <p className="t-status">No study is selected.</p>;
  const boxes = index === undefined ? [] : boxesOfSentence(state, study.id, index);
  const proposals = proposalsFor(state);
  const lungs = state.lungs[study.id];
  const stale = state.stale.filter((s) => s.box.study === study.id);

  return (
    <div className="t-boxes">
      <p className="t-boxes__head">{index === undefined ? 'Select a sentence to see its boxes.' : `Sentence ${index + 1}: ${boxes.length} box${boxes.length === 1 ? '' : 'es'}`}</p>
      <ul className="t-boxes__list">
        {boxes.map((b) => (
          <li
            key={b.id}
            className={b.id === state.selection.boxId ? 't-boxes__item t-boxes__item--sel' : 't-boxes__item'}
            // The box's exact record (image pixels, unrounded), for tests and scripts reading the page.
            data-box-id={b.id}
            data-study={b.study}
            data-sentence={b.sentence.index}
            data-zone={b.zone}
            data-rect={`${b.box.x},${b.box.y},${b.box.w},${b.box.h}`}
            data-annotator={b.annotator}
            data-created={b.created}
          >
            <button type="button" className="t-linkish" onClick={() => attempt(() => selectBox(store, b.id))} aria-pressed={b.id === state.selection.boxId}>
              {b.id}
            </button>
            <label>
              <span className="t-visually-hidden">Zone of {b.id}</span>
              <select value={b.zone} onChange={(e) => attempt(() => setBoxZone(store, b.id, e.target.value as ZoneLabel))}>
                {ZONE_LABELS.map((z) => (
                  <option key={z} value={z}>
                    {zoneName(z)}
                  </option>
                ))}
              </select>
            </label>
            <span className="t-boxes__rect">
              {ROUND(b.box.x)}, {ROUND(b.box.y)} · {ROUND(b.box.w)} × {ROUND(b.box.h)} px
            </span>
            <button type="button" className="t-button" onClick={() => attempt(() => deleteBox(store, b.id))} aria-label={`Delete box ${b.id}`}>
              Delete
            </button>
          </li>
        ))}
      </ul>
      {proposals.length > 0 && (
        <div className="t-boxes__proposals">
          <span>
            Proposed from the lung template: {proposals.map((p) => zoneName(p.zone)).join(', ')}
          </span>
          <button type="button" className="t-button t-button--primary" onClick={() => attempt(() => void acceptProposal(store))}>
            Accept (Enter)
          </button>
        </div>
      )}
      <p className="t-boxes__lungs">
        Lung template: {lungs ? `marked by ${lungs.annotator || 'unnamed annotator'}` : 'not marked (press L, then drag over the right lung and the left lung)'}
        {lungs && (
          <button type="button" className="t-button" onClick={() => attempt(() => deleteLungTemplate(store, study.id))}>
            Remove lung template
          </button>
        )}
      </p>
      {stale.length > 0 && (
        <div className="t-boxes__stale">
          <p>Stale boxes (their sentence changed; they are not used):</p>
          <ul>
            {stale.map((s) => (
              <li key={s.box.id}>
                {s.box.id} — was “{s.box.sentence.text}”{s.currentText !== undefined ? `, now “${s.currentText}”` : ', sentence missing'}
                <button type="button" className="t-button" onClick={() => attempt(() => discardStaleBox(store, s.box.id))}>
                  Discard
                </button>
              </li>
            ))}
          </ul>
        </div>
      )}
      <div className="t-boxes__io">
        <label>
          Annotator{' '}
          <input type="text" defaultValue={state.view.annotator} onBlur={(e) => attempt(() => setAnnotator(store, e.target.value))} size={12} />
        </label>
        <button type="button" className="t-button" onClick={() => fileInput.current?.click()}>
          Import boxes (annotation file or COCO JSON)…
        </button>
        <input
          ref={fileInput}
          type="file"
          accept=".json,application/json"
          hidden
          aria-hidden="true"
          tabIndex={-1}
          onChange={async (e) => {
            const f = e.target.files?.[0];
            e.target.value = '';
            if (f) attempt(() => void f.text().then((t) => importAnnotations(store, t, f.name)));
          }}
        />
      </div>
    </div>
  );
}
