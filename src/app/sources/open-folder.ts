import { openSet, type OpenedSet } from '../../batch/study-inputs';
import { DatasetError } from '../../dataset/errors';
import { SET_FILE } from '../../dataset/sample-set';
import type { FileSource } from '../../dataset/types';
import { ModelContractError } from '../../model/contract';
import { MANIFEST_FILE } from '../../model/model-folder';
import type { InferenceClient, OpenedModel } from '../inference/inference-client';
import { fromDatasetProblem, fromModelProblem, type ShownProblem } from './shown-problem';

/** What a chosen folder holds: a model (tessera-model.json), a sample set (set.json), or neither. */
export async function classifyFolder(source: FileSource): Promise<{ kind: 'model' | 'set' | undefined; problems: ShownProblem[] }> {
  const [model, set] = await Promise.all([source.exists(MANIFEST_FILE), source.exists(SET_FILE)]);
  if (model && set) {
    return { kind: undefined, problems: [{ kind: 'folder', file: source.label, where: '', what: `the folder holds both ${MANIFEST_FILE} and ${SET_FILE}`, fix: 'keep the model and the sample set in separate folders and open each on its own' }] };
  }
  if (model) return { kind: 'model', problems: [] };
  if (set) return { kind: 'set', problems: [] };
  return {
    kind: undefined,
    problems: [{ kind: 'folder', file: source.label, where: '', what: `the folder holds neither ${MANIFEST_FILE} (a model) nor ${SET_FILE} (a sample set)`, fix: 'choose the model folder itself or the sample-set folder itself, not the folder above it' }],
  };
}

/**
 * Opens a model folder in the inference worker. Every contract problem comes back in `problems`
 * (the model is then undefined); nothing is thrown for a broken folder.
 */
export async function openModelFrom(client: InferenceClient, source: FileSource): Promise<{ model?: OpenedModel; problems: ShownProblem[] }> {
  try {
    return { model: await client.openModel(source), problems: [] };
  } catch (err) {
    if (err instanceof ModelContractError) return { problems: err.problems.map(fromModelProblem) };
    return { problems: [{ kind: 'model', file: source.label, where: '', what: (err as Error).message, fix: 'check the folder and open it again; if it keeps failing, run "npm run tessera -- inspect --model DIR" on it' }] };
  }
}

/**
 * Opens a sample set (src/batch openSet, as the CLI does): `set` holds the studies that can be
 * used, `problems` every problem found, including the studies left out and the stale boxes.
 */
export async function openSetFrom(source: FileSource, { signal }: { signal?: AbortSignal } = {}): Promise<{ set?: OpenedSet; problems: ShownProblem[] }> {
  try {
    const set = await openSet(source, { signal });
    return { set, problems: set.problems.map(fromDatasetProblem) };
  } catch (err) {
    if (signal?.aborted) throw err;
    if (err instanceof DatasetError) return { problems: err.problems.map(fromDatasetProblem) };
    return { problems: [{ kind: 'set', file: source.label, where: '', what: (err as Error).message, fix: 'check the sample-set folder (set.json, annotations.json and the images) and open it again' }] };
  }
}
