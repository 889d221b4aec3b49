import type { Aggregator, GridShape, HitRule } from '../../core/types';
import type { AppState, AppStore } from '../state';
import { selectedStudy } from '../state';
import { AggregatorControl } from './AggregatorControl';
import { CellSentenceList } from './CellSentenceList';
import { ReferenceBoxesPanel } from './ReferenceBoxesPanel';
import { ReportPanel } from './ReportPanel';
import type { StudyViewModel } from './use-study-view-model';

export interface ReportColumnProps {
  readonly state: AppState;
  readonly store: AppStore;
  readonly vm: StudyViewModel;
  readonly grid: GridShape | undefined;
  readonly hitRule: HitRule;
  readonly onHitRule: (r: HitRule) => void;
  readonly cellCount: number | undefined;
  readonly onAggregator: (a: Aggregator) => void;
  readonly onSelectSentence: (index: number) => void;
  readonly onProblem: (m: string) => void;
}

const RULES: readonly { id: HitRule; label: string }[] = [
  { id: 'centre', label: "Best cell's centre in a box" },
  { id: 'overlap', label: 'Best cell overlaps a box' },
  { id: 'upsampled', label: 'Upsampled map peak in a box' },
];

/** Right column: pooling and hit rule, the report's sentences, the hovered cell's ranking, the boxes. */
export function ReportColumn(p: ReportColumnProps) {
  const study = selectedStudy(p.state);
  return (
    <section className="t-section t-report-col" aria-labelledby="t-h-report">
      <h2 id="t-h-report">Report {study && <span className="t-h-note">{study.id}</span>}</h2>
      <div className="t-settings">
        <AggregatorControl value={p.state.view.aggregator} onChange={p.onAggregator} cellCount={p.cellCount} />
        <label className="t-settings__rule">
          Hit rule{' '}
          <select value={p.hitRule} onChange={(e) => p.onHitRule(e.target.value as HitRule)}>
            {RULES.map((r) => (
              <option key={r.id} value={r.id}>
                {r.label}
              </option>
            ))}
          </select>
        </label>
      </div>
      <div className="t-scroll">
        <ReportPanel rows={p.vm.rows} selectedIndex={p.state.selection.sentenceIndex} onSelect={p.onSelectSentence} />
        <h3 className="t-subhead">Cell under the pointer</h3>
        <CellSentenceList
          cell={p.state.selection.hoverCell}
          grid={p.grid}
          sim={p.vm.similarity?.sim}
          sentences={study?.parsed.sentences ?? []}
          onSelect={p.onSelectSentence}
        />
        <h3 className="t-subhead">Reference boxes</h3>
        <ReferenceBoxesPanel state={p.state} store={p.store} onProblem={p.onProblem} />
      </div>
    </section>
  );
}
