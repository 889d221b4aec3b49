import { useCallback, useEffect, useMemo, useState } from 'react';
import type { AppServices } from '../inference/app-services';
import type { Autosave } from '../state/autosave';
import { dismissNotice, exportAnnotations, exportCocoJson, hoverCell, selectSentence, selectStudy, setAggregator, setHitRule, setImageSize } from '../state';
import { regionFeatureColours, type RegionFeatureMap } from '../draw';
import type { BatchModelPicker } from './BatchPanel';
import { CautionBanner } from './CautionBanner';
import { HelpOverlay } from './HelpOverlay';
import { MessagesBar } from './MessagesBar';
import { SourcesBar } from './SourcesBar';
import { StudyNavigator } from './StudyNavigator';
import { ReportColumn } from './ReportColumn';
import { StudyColumn } from './StudyColumn';
import { LowerPanels } from './LowerPanels';
import { useAppState } from './use-app-state';
import { useExplorerSession } from './use-explorer-session';
import { useStudyEncoding } from './use-study-encoding';
import { useStudyViewModel } from './use-study-view-model';
import { useBatchModelChoices, useBatchScoring, type BatchResult } from './use-batch-scoring';
import { useKeyboardShortcuts, type ToolMode } from './use-keyboard-shortcuts';
import { useFolderDrop } from './use-folder-drop';
import { setWithStoreBoxes } from './set-with-store-boxes';

export interface WorkbenchProps {
  readonly services: AppServices & { readonly autosave?: Autosave };
}

/** The explorer's screen: navigator, study canvas, report, and the lower panels. */
export function Workbench({ services }: WorkbenchProps) {
  const { store, client } = services;
  const state = useAppState(store);
  const session = useExplorerSession({ store, client, demo: services.demo, setupProblems: services.setupProblems, autosave: services.autosave });
  const [helpOpen, setHelpOpen] = useState(false);
  const [tool, setTool] = useState<ToolMode>('inspect');
  const [mapVisible, setMapVisible] = useState(true);
  const [zoomRequest, setZoomRequest] = useState<{ how: 'in' | 'out' | 'fit'; n: number }>({ how: 'fit', n: 0 });
  const [lowerTab, setLowerTab] = useState('matrix');
  const [batch, setBatch] = useState<BatchResult>();
  const { addProblem } = session;
  const { hitRule } = state.view;
  const { autosave } = services;
  useEffect(() => {
    // Saved view settings (aggregator, hit rule, overlay, ...) come back once, unless changed first.
    // A storage failure is already a notice in the store.
    autosave?.restoreView().catch(() => undefined);
  }, [autosave]);

  const study = state.studies.find((s) => s.id === state.selection.studyId);
  const texts = useMemo(() => study?.parsed.sentences.map((s) => s.text) ?? [], [study]);
  const onImageSize = useCallback(
    (id: string, size: { width: number; height: number }) => {
      const known = store.get().studies.find((s) => s.id === id)?.imageSize;
      if (!known || known.width !== size.width || known.height !== size.height) setImageSize(store, id, size);
    },
    [store],
  );
  const encoding = useStudyEncoding({ source: session.setSource, studyId: study?.id, imagePath: study?.image, texts, client, model: session.model, onImageSize });
  // The navigator's tallies are the open model's; the tables keep every model of the run.
  const openModelBatch = useMemo(() => {
    const id = batch?.models.find((m) => m.hash === session.model?.hash)?.id;
    return batch && id !== undefined ? { ...batch, records: batch.records.filter((r) => r.model === id) } : undefined;
  }, [batch, session.model]);
  const vm = useStudyViewModel(state, encoding, session.model, hitRule, openModelBatch);
  const scoring = useBatchScoring(useCallback((r: BatchResult) => setBatch(r), []));
  const models = useBatchModelChoices({ client, demo: services.demo, model: session.model, modelLabel: session.modelLabel });
  const picker: BatchModelPicker = useMemo(
    () => ({ choices: models.choices.map((c) => ({ key: c.key, label: c.label, ticked: models.ticked.has(c.key) })), onToggle: models.toggle }),
    [models.choices, models.ticked, models.toggle],
  );

  const sim = vm.similarity;
  const showFeatures = state.view.overlay === 'features';
  const features = useMemo((): RegionFeatureMap | { error: string } | undefined => {
    if (!showFeatures || !sim) return undefined;
    try {
      return { grid: sim.grid, cells: sim.cells, colours: regionFeatureColours(sim.normalisedCells, sim.grid.h * sim.grid.w, sim.dim) };
    } catch (err) {
      return { error: (err as Error).message };
    }
  }, [showFeatures, sim]);
  const featuresError = features && 'error' in features ? features.error : undefined;
  useEffect(() => {
    if (featuresError !== undefined) addProblem(`Region features cannot be shown: ${featuresError}`);
  }, [featuresError, addProblem]);

  const zoom = useCallback((how: 'in' | 'out' | 'fit') => setZoomRequest((z) => ({ how, n: z.n + 1 })), []);
  useKeyboardShortcuts(store, {
    openHelp: () => setHelpOpen(true),
    escape: () => setHelpOpen(false),
    setTool,
    toggleMap: () => setMapVisible((v) => !v),
    zoom,
    onProblem: addProblem,
  });
  const drop = useFolderDrop((s) => void session.openFolder(s), addProblem);
  useEffect(() => zoom('fit'), [study?.id, zoom]);

  const attempt = (fn: () => void) => {
    try {
      fn();
    } catch (err) {
      addProblem((err as Error).message);
    }
  };
  const cellCount = session.model ? session.model.grid.h * session.model.grid.w : undefined;
  const status = session.busy ?? (encoding.status.kind === 'loading' ? encoding.status.stage : encoding.status.kind === 'failed' ? 'failed' : 'ready');

  return (
    <div className={`t-app${drop.over ? ' t-app--drop' : ''}`} {...drop.handlers}>
      <CautionBanner synthetic={session.set?.manifest.synthetic} />
      <header className="t-header">
        <h1>Tessera</h1>
        <span className="t-sub">region–sentence alignment explorer</span>
        <SourcesBar modelLabel={session.modelLabel} setLabel={session.setSource?.label} onModel={(s) => void session.openModel(s)} onSet={(s) => void session.openSampleSet(s)} onProblem={addProblem} />
        <span className="t-spacer" />
        <span className="t-statusline" role="status" data-status={status}>
          {status}
        </span>
        <button type="button" className="t-button" onClick={() => setHelpOpen(true)} aria-keyshortcuts="?">
          Keys (?)
        </button>
      </header>
      <MessagesBar notices={state.notices} problems={session.problems} onDismissNotice={(i) => dismissNotice(store, i)} onClearProblems={session.clearProblems} />
      <main className="t-main">
        <section className="t-section" aria-labelledby="t-h-studies">
          <h2 id="t-h-studies">Studies {state.setName && <span className="t-h-note">{state.setName}</span>}</h2>
          <div className="t-scroll">
            <StudyNavigator studies={vm.navigator} selectedId={state.selection.studyId} onSelect={(id) => attempt(() => selectStudy(store, id))} />
          </div>
        </section>
        <StudyColumn
            state={state}
            store={store}
            encoding={encoding}
            vm={vm}
            tool={tool}
            onTool={setTool}
            mapVisible={mapVisible}
            onToggleMap={() => setMapVisible((v) => !v)}
            zoomRequest={zoomRequest}
            onZoom={zoom}
            cellCount={cellCount}
            grid={session.model?.grid}
            hitRule={hitRule}
            onProblem={addProblem}
            features={features && !('error' in features) ? features : undefined}
          />
        <ReportColumn
          state={state}
          store={store}
          vm={vm}
          grid={session.model?.grid}
          hitRule={hitRule}
          onHitRule={(r) => attempt(() => setHitRule(store, r))}
          cellCount={cellCount}
          onAggregator={(a) => attempt(() => setAggregator(store, a))}
          onSelectSentence={(i) => attempt(() => selectSentence(store, i))}
          onProblem={addProblem}
        />
      </main>
        <LowerPanels
          active={lowerTab}
          onActivate={setLowerTab}
          state={state}
          vm={vm}
          grid={session.model?.grid}
          dim={session.model?.manifest.embedding_dim ?? 0}
          onSelectSentence={(i) => attempt(() => selectSentence(store, i))}
          onHighlightCell={(c) => attempt(() => hoverCell(store, c))}
          scoring={scoring}
          batchBlocked={!session.model ? 'Open a model first.' : !session.set ? 'Open a sample set first.' : undefined}
          batchDescription={`Scores every study of ${session.set?.manifest.name ?? 'the set'} with ${models.chosen.length > 0 ? models.chosen.map((m) => m.label).join(', ') : 'the ticked models'} through the same pipeline as the command line (tessera score), pooling by ${state.view.aggregator.kind} and the ${hitRule} hit rule, using the reference boxes as they stand now.`}
          onStartBatch={() => {
            if (session.set && session.model) void scoring.start({ client, set: setWithStoreBoxes(session.set, store.get()), models: models.chosen, aggregator: state.view.aggregator, hitRule, topK: state.view.topK });
          }}
          batch={batch}
          extraDownloads={[
            { label: 'Download annotation file', file: 'annotations.json', make: () => exportAnnotations(store.get()) },
            { label: 'Download COCO JSON', file: 'boxes-coco.json', make: () => exportCocoJson(store.get()) },
          ]}
          batchModels={picker}
        />
      <HelpOverlay open={helpOpen} onClose={() => setHelpOpen(false)} />
    </div>
  );
}
