import 'fake-indexeddb/auto';
import { afterEach, beforeAll, describe, expect, it, vi } from 'vitest';
import { act } from 'react';
import { encodePng } from '../../dataset/png-codec';
import type { FileSource } from '../../dataset/types';
import type { ModelManifest } from '../../model/types';
import { createRng } from '../../core/seeded-random';
import { addBox, createAppStore, setHitRule, setImageSize, type AppStore } from '../state';
import { createAutosave, type Autosave } from '../state/autosave';
import type { InferenceClient, OpenedModel } from '../inference/inference-client';
import type { DemoSources } from '../sources/demo-sources';
import { recordSource } from '../sources/memory-source.test-util';
import { fakeClient } from '../inference/test-doubles';
import { Workbench } from './Workbench';
import { changeValue, click, renderForTest, type Rendered } from './render-for-test';

// Hit rule and overlay in the store, saved view settings, and the batch panel's model choice.
// The client is a stand-in with seeded embeddings; ONNX Runtime never runs under jsdom.

// jsdom's typed arrays come from another realm than Node's SubtleCrypto accepts; the hash only keys the cache.
vi.mock('../inference/inference-client', () => ({ contentHashOf: async (bytes: Uint8Array) => `len-${bytes.length}` }));

const GRID = { h: 3, w: 3 };
const DIM = 4;
const REPORTS = [
  'FINDINGS:\nConsolidation in the right lower zone. No pneumothorax. Small left pleural effusion.',
  'FINDINGS:\nNodule in the left upper zone. Heart size is normal.',
];

function setSource(): FileSource {
  const image = (seed: number) => encodePng({ width: 30, height: 30, bitDepth: 8, data: new Uint8Array(900).map((_, i) => (i * seed) % 251) });
  const studies = REPORTS.map((report, i) => ({ id: `s${i + 1}`, image: `${i}.png`, report }));
  return recordSource('test-set', {
    'set.json': JSON.stringify({ schema: 'tessera.set/1', name: 'test-set', synthetic: true, studies }),
    '0.png': image(3),
    '1.png': image(7),
  });
}

/** A stand-in for the worker client with one model per source label; counts opens and encodings. */
function mockClient() {
  const rng = createRng(11);
  const modelFor = (id: string): OpenedModel => ({
    manifest: { id, embedding_dim: DIM, image: { input: { width: 30, height: 30, resize: 'stretch' } } } as unknown as ModelManifest,
    hash: `hash-${id}`,
    grid: GRID,
  });
  const openModel = vi.fn(async (s: FileSource) => modelFor(s.label));
  const encodeImage = vi.fn(async () => Float32Array.from({ length: GRID.h * GRID.w * DIM }, () => rng.next() - 0.5));
  const encodeSentences = vi.fn(async (_h: string, texts: readonly string[]) => Float32Array.from({ length: texts.length * DIM }, () => rng.next() - 0.5));
  const client = fakeClient({ openModel, encodeImage, encodeSentences });
  return { client, openModel, encodeImage };
}

function demo(): Promise<DemoSources> {
  return Promise.resolve({
    catalogue: { models: ['model-a', 'model-b'], sets: ['test'] },
    model: recordSource('model-a', {}),
    set: setSource(),
    modelSource: (name: string) => recordSource(name, {}),
  });
}

async function waitFor(check: () => boolean, what: string, page?: HTMLElement): Promise<void> {
  for (let i = 0; i < 400; i++) {
    if (check()) return;
    await act(async () => {
      await new Promise((r) => setTimeout(r, 10));
    });
  }
  throw new Error(`timed out waiting for ${what}; the page says: ${page?.textContent?.slice(0, 800) ?? ''}`);
}

const button = (c: HTMLElement, text: string) => [...c.querySelectorAll('button')].find((b) => b.textContent?.trim() === text) as HTMLButtonElement;
const startButton = (c: HTMLElement) => c.querySelector('.t-batch .t-button--primary') as HTMLButtonElement;
const ruleSelect = (c: HTMLElement) => c.querySelector('.t-settings__rule select') as HTMLSelectElement;

describe('Workbench view settings and batch models', () => {
  let r: Rendered | undefined;
  const saves: Autosave[] = [];
  let dbCount = 0;
  beforeAll(() => {
    globalThis.ResizeObserver ??= class {
      observe() {}
      unobserve() {}
      disconnect() {}
    } as unknown as typeof ResizeObserver;
  });
  afterEach(async () => {
    r?.unmount();
    r = undefined;
    for (const a of saves.splice(0)) await a.dispose();
  });

  function mount(store: AppStore, client: InferenceClient, autosave?: Autosave): HTMLElement {
    r = renderForTest(<Workbench services={{ store, client, demo: demo(), setupProblems: [], autosave }} />);
    return r.container;
  }

  it('the hit rule select runs setHitRule on the store; a rule set in the store shows in the select and the batch text', async () => {
    const store = createAppStore();
    const c = mount(store, mockClient().client);
    await waitFor(() => c.querySelector('[data-best-cell]') !== null, 'the first map', c);
    expect(ruleSelect(c).value).toBe('centre');
    changeValue(ruleSelect(c), 'overlap', 'change');
    expect(store.get().view.hitRule).toBe('overlap');
    act(() => setHitRule(store, 'upsampled'));
    expect(ruleSelect(c).value).toBe('upsampled');
    click([...c.querySelectorAll('[role="tab"]')].find((t) => t.textContent === 'Score the set') as Element);
    expect(c.querySelector('.t-batch')?.textContent).toContain('the upsampled hit rule');
  });

  it('the hit rule and overlay chosen on one visit are saved and come back on the next', async () => {
    const dbName = `wb-${++dbCount}`;
    const first = createAppStore();
    const saveFirst = createAutosave(first, { dbName, delayMs: 5 });
    saves.push(saveFirst);
    let c = mount(first, mockClient().client, saveFirst);
    await waitFor(() => c.querySelector('[data-best-cell]') !== null, 'the first map', c);
    changeValue(ruleSelect(c), 'overlap', 'change');
    click(button(c, 'Region features'));
    expect(first.get().view.overlay).toBe('features');
    expect(button(c, 'Region features').getAttribute('aria-pressed')).toBe('true');
    expect(c.querySelector('.t-canvas')?.getAttribute('aria-label')).toMatch(/overlay: region features/);
    await act(async () => saveFirst.flush());
    r?.unmount();

    const second = createAppStore();
    const saveSecond = createAutosave(second, { dbName, delayMs: 5 });
    saves.push(saveSecond);
    c = mount(second, mockClient().client, saveSecond);
    await waitFor(() => second.get().view.hitRule === 'overlap', 'the saved hit rule', c);
    expect(second.get().view.overlay).toBe('features');
    expect(ruleSelect(c).value).toBe('overlap');
    expect(button(c, 'Region features').getAttribute('aria-pressed')).toBe('true');
    expect(button(c, 'Similarity map').getAttribute('aria-pressed')).toBe('false');
  });

  it('ticking a second demo model scores both and Results shows their paired comparison', async () => {
    const { client, openModel } = mockClient();
    const store = createAppStore();
    const c = mount(store, client);
    await waitFor(() => c.querySelector('[data-best-cell]') !== null, 'the first map', c);
    // A box on the first sentence of each study, so the run has scored sentences to pair.
    act(() => {
      setImageSize(store, 's2', { width: 30, height: 30 });
      addBox(store, { study: 's1', sentenceIndex: 0, rect: { x: 2, y: 2, w: 12, h: 12 } });
      addBox(store, { study: 's2', sentenceIndex: 0, rect: { x: 15, y: 2, w: 12, h: 12 } });
    });
    // The second box selects study s2, which is encoded for the canvas.
    await waitFor(() => c.querySelector('[data-best-cell]')?.getAttribute('data-study') === 's2', 'the map of s2', c);
    click([...c.querySelectorAll('[role="tab"]')].find((t) => t.textContent === 'Score the set') as Element);
    const boxes = () => [...c.querySelectorAll<HTMLInputElement>('.t-batch__models input[type="checkbox"]')];
    await waitFor(() => boxes().length === 2, 'the model choices', c);
    expect([...c.querySelectorAll('.t-batch__model')].map((l) => l.textContent?.trim())).toEqual(['model-a (open)', 'model-b']);
    expect(boxes().map((b) => b.checked)).toEqual([true, false]);
    expect(openModel).toHaveBeenCalledTimes(1);

    click(boxes()[1]);
    expect(boxes()[1].checked).toBe(true);
    expect(c.querySelector('.t-batch')?.textContent).toContain('with model-a (open), model-b through');
    // The run continues after the click's own act(); the async act covers its first steps.
    await act(async () => {
      startButton(c).dispatchEvent(new MouseEvent('click', { bubbles: true }));
    });
    await waitFor(() => /Finished/.test(c.querySelector('.t-batch')?.textContent ?? ''), 'the run to finish', c.querySelector('.t-batch') as HTMLElement);
    expect(openModel).toHaveBeenCalledTimes(2);
    expect(openModel.mock.calls[1][0].label).toBe('model-b');

    click([...c.querySelectorAll('[role="tab"]')].find((t) => t.textContent === 'Results') as Element);
    await waitFor(() => button(c, 'Download summary.json') !== undefined, 'the score files', c.querySelector('.t-results') as HTMLElement);
    const comparisons = [...c.querySelectorAll('.t-table')].find((t) => t.textContent?.includes('Paired comparisons'));
    const rows = [...(comparisons?.querySelectorAll('tbody tr') ?? [])].map((tr) => tr.textContent);
    expect(rows).toHaveLength(1);
    expect(rows[0]).toMatch(/model-a.*model-b/);

    // Unticking every model leaves nothing to score.
    click([...c.querySelectorAll('[role="tab"]')].find((t) => t.textContent === 'Score the set') as Element);
    click(boxes()[0]);
    click(boxes()[1]);
    expect(startButton(c).disabled).toBe(true);
    expect(c.querySelector('.t-batch')?.textContent).toContain('Tick at least one model to score.');
  });
});
