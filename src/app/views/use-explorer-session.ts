import { useCallback, useEffect, useState } from 'react';
import type { OpenedSet } from '../../batch/study-inputs';
import type { FileSource } from '../../dataset/types';
import type { AppStore } from '../state';
import { loadSet, restoreAnnotations } from '../state';
import type { Autosave } from '../state/autosave';
import type { InferenceClient, OpenedModel } from '../inference/inference-client';
import type { DemoSources } from '../sources/demo-sources';
import { classifyFolder, openModelFrom, openSetFrom } from '../sources/open-folder';
import { formatShownProblem } from '../sources/shown-problem';

export interface ExplorerSession {
  readonly model?: OpenedModel;
  readonly modelLabel?: string;
  readonly set?: OpenedSet;
  readonly setSource?: FileSource;
  /** What is being opened, for the status line. */
  readonly busy?: string;
  readonly problems: readonly string[];
  openModel(source: FileSource): Promise<void>;
  openSampleSet(source: FileSource): Promise<void>;
  /** A dropped or picked folder of either kind. */
  openFolder(source: FileSource): Promise<void>;
  addProblem(message: string): void;
  clearProblems(): void;
}

export interface SessionArgs {
  readonly store: AppStore;
  readonly client: InferenceClient;
  readonly demo: Promise<DemoSources>;
  readonly setupProblems: readonly string[];
  readonly autosave?: Autosave;
}

/**
 * The opened model and sample set, through the sources helper's openModelFrom / openSetFrom.
 * Opening a set loads its studies into the store, then the annotations: the copy autosaved in
 * this browser when there is one, else the set's own annotation file.
 */
export function useExplorerSession({ store, client, demo, setupProblems, autosave }: SessionArgs): ExplorerSession {
  const [model, setModel] = useState<{ model: OpenedModel; label: string }>();
  const [set, setSet] = useState<{ set: OpenedSet; source: FileSource }>();
  const [busy, setBusy] = useState<string | undefined>('opening the demo');
  const [problems, setProblems] = useState<readonly string[]>(setupProblems);
  const addProblems = useCallback((more: readonly string[]) => {
    if (more.length) setProblems((p) => [...p, ...more]);
  }, []);

  const openModel = useCallback(
    async (source: FileSource) => {
      setBusy(`opening the model ${source.label}`);
      const r = await openModelFrom(client, source);
      addProblems(r.problems.map(formatShownProblem));
      if (r.model) setModel({ model: r.model, label: source.label });
      setBusy(undefined);
    },
    [client, addProblems],
  );

  const openSampleSet = useCallback(
    async (source: FileSource) => {
      setBusy(`opening the sample set ${source.label}`);
      const r = await openSetFrom(source);
      addProblems(r.problems.map(formatShownProblem));
      if (r.set) {
        const opened = r.set;
        loadSet(store, { name: opened.manifest.name, studies: opened.studies });
        const restored = autosave ? await autosave.restore() : undefined;
        const path = opened.manifest.annotations ?? 'annotations.json';
        if (!restored && (await source.exists(path))) {
          try {
            restoreAnnotations(store, JSON.parse(await source.readText(path)), `${source.label}/${path}`);
          } catch (err) {
            addProblems([`${source.label}/${path}: ${(err as Error).message}`]);
          }
        }
        setSet({ set: opened, source });
      }
      setBusy(undefined);
    },
    [store, autosave, addProblems],
  );

  const openFolder = useCallback(
    async (source: FileSource) => {
      const c = await classifyFolder(source);
      addProblems(c.problems.map(formatShownProblem));
      if (c.kind === 'model') await openModel(source);
      else if (c.kind === 'set') await openSampleSet(source);
    },
    [openModel, openSampleSet, addProblems],
  );

  useEffect(() => {
    let live = true;
    demo
      .then(async (d) => {
        if (!live) return;
        await Promise.all([openModel(d.model), openSampleSet(d.set)]);
      })
      .catch((err: unknown) => {
        if (!live) return;
        addProblems([`The bundled demo could not be opened: ${(err as Error).message}`]);
        setBusy(undefined);
      });
    return () => {
      live = false;
    };
  }, [demo, openModel, openSampleSet, addProblems]);

  const addProblem = useCallback((m: string) => addProblems([m]), [addProblems]);
  const clearProblems = useCallback(() => setProblems([]), []);
  return {
    model: model?.model,
    modelLabel: model?.label,
    set: set?.set,
    setSource: set?.source,
    busy,
    problems,
    openModel,
    openSampleSet,
    openFolder,
    addProblem,
    clearProblems,
  };
}
