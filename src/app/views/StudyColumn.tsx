import { useCallback, useLayoutEffect, useMemo, useRef, useState } from 'react';
import type { GridShape, HitRule } from '../../core/types';
import type { AppState, AppStore } from '../state';
import { selectedStudy } from '../state';
import { valueDomain, type RegionFeatureMap, type SentenceMap } from '../draw';
import { MapLegend } from './MapLegend';
import { StudyCanvas } from './StudyCanvas';
import { StudyToolbar } from './StudyToolbar';
import type { ToolMode } from './use-keyboard-shortcuts';
import type { StudyEncoding } from './use-study-encoding';
import type { StudyViewModel } from './use-study-view-model';

export interface StudyColumnProps {
  readonly state: AppState;
  readonly store: AppStore;
  readonly encoding: StudyEncoding;
  readonly vm: StudyViewModel;
  readonly tool: ToolMode;
  readonly onTool: (t: ToolMode) => void;
  readonly mapVisible: boolean;
  readonly features?: RegionFeatureMap;
  readonly onToggleMap: () => void;
  readonly zoomRequest: { how: 'in' | 'out' | 'fit'; n: number };
  readonly onZoom: (how: 'in' | 'out' | 'fit') => void;
  readonly cellCount: number | undefined;
  readonly grid: GridShape | undefined;
  readonly hitRule: HitRule;
  readonly onProblem: (m: string) => void;
}

/** Centre column: toolbar, the study canvas, the legend and a line about the selected sentence. */
export function StudyColumn(p: StudyColumnProps) {
  const study = selectedStudy(p.state);
  const sel = p.vm.selectedAnalysis;
  const [prompt, setPrompt] = useState<string | undefined>();
  const onPrompt = useCallback((s: string | undefined) => setPrompt(s), []);
  const sim = p.vm.similarity;
  const map: SentenceMap | undefined = useMemo(
    () => (sim && sel ? { grid: sim.grid, cells: sim.cells, values: sel.values, grounding: sel.grounding } : undefined),
    [sim, sel],
  );
  const domain = useMemo(() => (map ? valueDomain(map.values) : undefined), [map]);

  // Links start at the canvas's right edge, level with the selected sentence in the report.
  const wrap = useRef<HTMLDivElement>(null);
  const [anchorY, setAnchorY] = useState<number | undefined>();
  useLayoutEffect(() => {
    const canvas = wrap.current?.querySelector('.t-canvas');
    const row = document.querySelector('.t-report [aria-selected="true"]');
    if (!canvas || !row) return setAnchorY(undefined);
    const c = canvas.getBoundingClientRect();
    const r = row.getBoundingClientRect();
    setAnchorY(Math.max(8, Math.min(c.height - 8, r.top + r.height / 2 - c.top)));
  }, [p.state.selection.sentenceIndex, study?.id, sel]);

  const status = p.encoding.status;
  return (
    <section className="t-section t-study" aria-labelledby="t-h-study">
      <h2 id="t-h-study">Study {study && <span className="t-h-note">{study.id}</span>}</h2>
      <StudyToolbar
        state={p.state}
        store={p.store}
        image={p.encoding.image}
        tool={p.tool}
        onTool={p.onTool}
        mapVisible={p.mapVisible}
        onToggleMap={p.onToggleMap}
        onZoom={p.onZoom}
        cellCount={p.cellCount}
      />
      <div className="t-canvas-wrap" ref={wrap}>
        <StudyCanvas
          state={p.state}
          store={p.store}
          image={p.encoding.image}
          map={map}
          mapVisible={p.mapVisible}
          features={p.features}
          tool={p.tool}
          zoomRequest={p.zoomRequest}
          linkAnchorY={anchorY}
          label={study ? `Study ${study.id}${sel ? `, similarity map of sentence ${sel.sentence.index + 1}` : ''}` : 'No study'}
          onPrompt={onPrompt}
          onProblem={p.onProblem}
        />
        {status.kind === 'loading' && <div className="t-canvas-note">{status.stage}…</div>}
        {status.kind === 'failed' && <div className="t-canvas-note t-canvas-note--error">{status.message}</div>}
        {prompt && <div className="t-canvas-prompt">{prompt}</div>}
      </div>
      <div className="t-study__foot">
        {p.mapVisible && p.state.view.overlay === 'map' && <MapLegend domain={domain} />}
        {sel ? (
          <p className="t-bestcell" data-best-cell={`${sel.grounding.bestCell.row},${sel.grounding.bestCell.col}`} data-study={study?.id}>
            Sentence {sel.sentence.index + 1}: best cell row {sel.grounding.bestCell.row + 1}, column {sel.grounding.bestCell.col + 1}
            {sel.boxes.length > 0 && !sel.sentence.negated && (
              <>
                {' '}
                — {sel.outcome === 'hit' ? 'hit' : 'miss'} under the {p.hitRule} rule (chance {(sel.grounding.chance[p.hitRule] * 100).toFixed(0)}%)
              </>
            )}
          </p>
        ) : (
          <p className="t-bestcell t-hint">{p.vm.problem ?? 'Select a sentence to see its map.'}</p>
        )}
      </div>
    </section>
  );
}
