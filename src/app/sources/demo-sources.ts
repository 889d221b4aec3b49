import type { FileSource } from '../../dataset/types';
import { createHttpFileSource } from './http-file-source';

/** Models the build may bundle, in the order the page prefers them. */
export const DEMO_MODEL_PREFERENCE = ['demo-local', 'demo-global', 'demo-widefield', 'demo-local-int8', 'tiny-model'] as const;

/** demo/catalogue.json, written by the build (and served by the dev server): what is bundled. */
export interface DemoCatalogue {
  readonly models: readonly string[];
  readonly sets: readonly string[];
}

export interface DemoSources {
  readonly catalogue: DemoCatalogue;
  /** The model the page opens on: demo-local when bundled, else the first bundled one. */
  readonly model: FileSource;
  readonly set: FileSource;
  modelSource(name: string): FileSource;
}

/**
 * The bundled demo over same-origin fetch: reads demo/catalogue.json under `base` (the app's base
 * URL) and returns sources for the preferred model and the phantom set.
 */
export async function openDemoSources({ base = '/', fetch = globalThis.fetch.bind(globalThis) }: { base?: string; fetch?: typeof globalThis.fetch } = {}): Promise<DemoSources> {
  const root = `${base.endsWith('/') ? base : `${base}/`}demo/`;
  const res = await fetch(`${root}catalogue.json`);
  if (!res.ok) throw new Error(`${root}catalogue.json: the page's server answered ${res.status}; run "npm run build" again (it copies the demo into the build) or start "npm run dev".`);
  const catalogue = (await res.json()) as DemoCatalogue;
  const name = DEMO_MODEL_PREFERENCE.find((n) => catalogue.models.includes(n)) ?? catalogue.models[0];
  if (name === undefined) throw new Error(`${root}catalogue.json lists no model; add a model folder under models/ (see models/recipe/) or keep tests/fixtures/tiny-model.`);
  const setName = catalogue.sets.includes('phantom') ? 'phantom' : catalogue.sets[0];
  if (setName === undefined) throw new Error(`${root}catalogue.json lists no sample set; keep samples/phantom in the repository.`);
  const modelSource = (n: string): FileSource => createHttpFileSource(`${root}models/${n}/`, { fetch, label: n });
  return { catalogue, model: modelSource(name), set: createHttpFileSource(`${root}samples/${setName}/`, { fetch, label: `samples/${setName}` }), modelSource };
}
