import { useMemo } from 'react';
import type { GridShape } from '../../core/types';
import type { AppState } from '../state';
import { selectedStudy } from '../state';
import { cividisHex, normaliseToDomain, valueDomain } from '../draw/colour-scale';
import { BatchPanel, type BatchModelPicker } from './BatchPanel';
import { RegionFeaturesView } from './RegionFeaturesView';
import { ResultsPanel, type ResultsPanelProps } from './ResultsPanel';
import { SimilarityMatrixView } from './SimilarityMatrixView';
import { TabbedPanel } from './TabbedPanel';
import type { BatchResult, BatchStatus } from './use-batch-scoring';
import type { StudyViewModel } from './use-study-view-model';

export interface LowerPanelsProps {
  readonly active: string;
  readonly onActivate: (id: string) => void;
  readonly state: AppState;
  readonly vm: StudyViewModel;
  readonly grid: GridShape | undefined;
  readonly dim: number;
  readonly onSelectSentence: (i: number) => void;
  readonly onHighlightCell: (c: number | undefined) => void;
  readonly scoring: { readonly status: BatchStatus; readonly cancel: () => void };
  readonly batchBlocked: string | undefined;
  readonly batchDescription: string;
  readonly onStartBatch: () => void;
  readonly batch: BatchResult | undefined;
  readonly extraDownloads: ResultsPanelProps['extraDownloads'];
  /** Which models a set run scores; undefined: the open model only. */
  readonly batchModels?: BatchModelPicker;
}

/** The lower tabs: matrix, region features, batch scoring and results. */
export function LowerPanels(p: LowerPanelsProps) {
  const study = selectedStudy(p.state);
  const sim = p.vm.similarity?.sim;
  const domain = useMemo(() => (sim ? valueDomain(sim.data) : undefined), [sim]);
  const colourOf = (v: number) => (domain ? (cividisHex(normaliseToDomain(v, domain)) ?? '#000') : '#000');
  const bestCells = p.vm.analysis?.map((a) => a.grounding.bestCell.index);
  return (
    <section className={`t-bottom${p.active === 'results' ? ' t-bottom--tall' : ''}`} aria-label="Study details and set scoring">
      <TabbedPanel
        label="Views"
        active={p.active}
        onActivate={p.onActivate}
        tabs={[
          {
            id: 'matrix',
            label: 'Sentence × cell matrix',
            render: () => (
              <SimilarityMatrixView
                sim={sim}
                grid={p.grid}
                sentences={study?.parsed.sentences ?? []}
                selectedSentence={p.state.selection.sentenceIndex}
                highlightedCell={p.state.selection.hoverCell}
                bestCells={bestCells}
                colourOf={colourOf}
                onSelectSentence={p.onSelectSentence}
                onHighlightCell={p.onHighlightCell}
              />
            ),
          },
          {
            id: 'features',
            label: 'Region features',
            render: () => (
              <RegionFeaturesView
                cells={p.vm.similarity?.normalisedCells}
                dim={p.dim}
                grid={p.grid}
                highlightedCell={p.state.selection.hoverCell}
                onHighlightCell={p.onHighlightCell}
              />
            ),
          },
          {
            id: 'batch',
            label: 'Score the set',
            render: () => (
              <BatchPanel status={p.scoring.status} blocked={p.batchBlocked} description={p.batchDescription} onStart={p.onStartBatch} onCancel={p.scoring.cancel} picker={p.batchModels} />
            ),
          },
          { id: 'results', label: 'Results', render: () => <ResultsPanel result={p.batch} extraDownloads={p.extraDownloads} /> },
        ]}
      />
    </section>
  );
}
