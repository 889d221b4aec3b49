/// <reference types="vite/client" />
// Composition root: creates the store, the inference worker and its client, and the demo sources
// once, and passes them down. No component creates a worker or a session.
import { StrictMode } from 'react';
import { createRoot } from 'react-dom/client';
import { App } from './App';
import { createAppStore } from './state';
import { createAutosave, type Autosave } from './state/autosave';
import { createInferenceClient } from './inference/inference-client';
import { openIdbEmbeddingCache } from './inference/idb-embedding-cache';
import type { AppServices } from './inference/app-services';
import { openDemoSources } from './sources/demo-sources';
import type { EmbeddingCache } from '../model/types';
import './styles/app.css';

async function start(): Promise<void> {
  const setupProblems: string[] = [];
  let cache: EmbeddingCache | undefined;
  try {
    cache = await openIdbEmbeddingCache();
  } catch (err) {
    setupProblems.push(`Embeddings will be computed again on each visit: ${(err as Error).message}`);
  }
  if (!globalThis.crossOriginIsolated) {
    setupProblems.push('The page is not cross-origin isolated, so the model runs on one thread; serve it with "npm run dev" or "npm run preview", which send the isolation headers.');
  }
  const worker = new Worker(new URL('./inference/inference-worker.ts', import.meta.url), { type: 'module', name: 'tessera-inference' });
  const store = createAppStore();
  let autosave: Autosave | undefined;
  try {
    autosave = createAutosave(store, { dbName: 'tessera-annotations' });
  } catch (err) {
    setupProblems.push(`Boxes will not be saved automatically (export them before you leave): ${(err as Error).message}`);
  }
  // Unsaved edits are written before the page goes away.
  addEventListener('pagehide', () => void autosave?.flush());
  const services: AppServices = {
    store,
    autosave,
    client: createInferenceClient(worker, { cache }),
    demo: openDemoSources({ base: import.meta.env.BASE_URL }),
    setupProblems,
  };
  const root = document.getElementById('root');
  if (!root) throw new Error('index.html lacks the <div id="root"> the app mounts on');
  createRoot(root).render(
    <StrictMode>
      <App services={services} />
    </StrictMode>,
  );
}

void start();
