import { afterEach, beforeAll, describe, expect, it, vi } from 'vitest';
import { act } from 'react';
import { encodePng } from '../../dataset/png-codec';
import type { FileSource } from '../../dataset/types';
import type { ModelManifest } from '../../model/types';
import { createAppStore } from '../state';
import type { OpenedModel } from '../inference/inference-client';
import type { DemoSources } from '../sources/demo-sources';
import { createRng } from '../../core/seeded-random';
import { recordSource } from '../sources/memory-source.test-util';
import { fakeClient } from '../inference/test-doubles';
import { Workbench } from './Workbench';
import { changeValue, renderForTest, type Rendered } from './render-for-test';

// jsdom's typed arrays come from another realm than Node's SubtleCrypto accepts; the hash only keys the cache.
vi.mock('../inference/inference-client', () => ({ contentHashOf: async (bytes: Uint8Array) => `len-${bytes.length}` }));

const GRID = { h: 3, w: 3 };
const DIM = 4;
const REPORT = 'FINDINGS:\nConsolidation in the right lower zone. No pneumothorax. Small left pleural effusion.';

function demoSet(): FileSource {
  const image = encodePng({ width: 30, height: 30, bitDepth: 8, data: new Uint8Array(900).map((_, i) => i % 251) });
  const set = { schema: 'tessera.set/1', name: 'test-set', synthetic: true, studies: [{ id: 's1', image: 'a.png', report: REPORT }] };
  return recordSource('test-set', { 'set.json': JSON.stringify(set), 'a.png': image });
}

/** A stand-in for the worker client: seeded embeddings, counted calls; ONNX Runtime never runs here. */
function mockClient() {
  const rng = createRng(7);
  const model = {
    manifest: { id: 'mock-model', embedding_dim: DIM, image: { input: { width: 30, height: 30, resize: 'stretch' } } } as unknown as ModelManifest,
    hash: 'mock-hash',
    grid: GRID,
  } satisfies OpenedModel;
  const encodeImage = vi.fn(async () => Float32Array.from({ length: GRID.h * GRID.w * DIM }, () => rng.next() - 0.5));
  const encodeSentences = vi.fn(async (_h: string, texts: readonly string[]) => Float32Array.from({ length: texts.length * DIM }, () => rng.next() - 0.5));
  const client = fakeClient({ openModel: vi.fn(async () => model), encodeImage, encodeSentences });
  return { client, encodeImage, encodeSentences };
}

async function waitFor(check: () => boolean, what: string, page?: HTMLElement): Promise<void> {
  for (let i = 0; i < 200; i++) {
    if (check()) return;
    await act(async () => {
      await new Promise((r) => setTimeout(r, 10));
    });
  }
  throw new Error(`timed out waiting for ${what}; the page says: ${page?.textContent?.slice(0, 600) ?? ''}`);
}

const scores = (c: HTMLElement) => [...c.querySelectorAll('.t-sentence__score')].map((e) => e.textContent);

describe('Workbench', () => {
  let r: Rendered | undefined;
  beforeAll(() => {
    globalThis.ResizeObserver ??= class {
      observe() {}
      unobserve() {}
      disconnect() {}
    } as unknown as typeof ResizeObserver;
  });
  afterEach(() => r?.unmount());

  it('Workbench re-pools on an aggregator change without encoding again', async () => {
    const { client, encodeImage, encodeSentences } = mockClient();
    const demo: Promise<DemoSources> = Promise.resolve({
      catalogue: { models: ['mock'], sets: ['test'] },
      model: recordSource('mock', {}),
      set: demoSet(),
      modelSource: () => recordSource('mock', {}),
    });
    r = renderForTest(<Workbench services={{ store: createAppStore(), client, demo, setupProblems: [] }} />);
    const c = r.container;
    await waitFor(() => c.querySelector('[data-best-cell]') !== null, 'the first map', c);
    expect(c.querySelector('[data-best-cell]')?.getAttribute('data-study')).toBe('s1');
    expect(c.querySelector('[role="note"]')?.textContent).toContain('not a medical device');
    const before = scores(c);
    expect(before).toHaveLength(3);
    expect(before.every((s) => s !== '—')).toBe(true);
    expect(encodeImage).toHaveBeenCalledTimes(1);
    expect(encodeSentences).toHaveBeenCalledTimes(1);

    changeValue(c.querySelector('.t-aggregator select') as HTMLSelectElement, 'topk', 'change');
    await waitFor(() => scores(c).join() !== before.join(), 'new pooled scores', c);
    expect(scores(c).every((s) => s !== '—')).toBe(true);
    expect(encodeImage).toHaveBeenCalledTimes(1);
    expect(encodeSentences).toHaveBeenCalledTimes(1);
  });
});
