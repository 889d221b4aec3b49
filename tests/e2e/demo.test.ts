import { afterAll, beforeAll, describe, expect, test } from 'vitest';
import { resolve } from 'node:path';
import type { Page } from 'playwright-core';
import { loadStudy, openSet } from '../../src/batch/study-inputs';
import { scoreStudy } from '../../src/batch/score-set';
import { toStudyEncoder } from '../../src/batch/study-encoder';
import { createNodeFileSource } from '../../src/dataset/node-file-source';
import { createOrtNodeEngine } from '../../src/model/adapters/ort-node';
import { createTokenizerFromJson } from '../../src/model/adapters/hf-tokenizer';
import { openModelFolder } from '../../src/model/model-folder';
import { artifactPath, browserUnavailable, buildAndPreview, launchBrowser, REPO, type LaunchedBrowser, type ServedApp } from './browser';

const unavailable = browserUnavailable();
if (unavailable) console.log(unavailable);

/** The model folder the page opens on: the same preference as src/app/sources/demo-sources.ts. */
async function demoModelDir(page: Page, url: string): Promise<string> {
  const catalogue = (await page.evaluate(async (u) => (await fetch(`${u}demo/catalogue.json`)).json(), url)) as { models: string[] };
  const name = ['demo-local', 'demo-global', 'demo-widefield', 'tiny-model'].find((n) => catalogue.models.includes(n)) ?? catalogue.models[0];
  return name === 'tiny-model' ? resolve(REPO, 'tests/fixtures/tiny-model') : resolve(REPO, 'models', name);
}

/** What the CLI's `score --dump-similarity` computes for the first sentence of the first study, via the same src/batch code. */
async function cliFirstSentence(modelDir: string): Promise<{ study: string; bestCell: { row: number; col: number }; values: readonly number[] }> {
  const engine = await createOrtNodeEngine({ threads: 1 });
  const dual = await openModelFolder(createNodeFileSource(modelDir), engine, { threads: 1, tokenizerFactory: createTokenizerFromJson });
  try {
    const set = await openSet(createNodeFileSource(resolve(REPO, 'samples/phantom')));
    const loaded = await loadStudy(set, set.studies[0]);
    const encoder = toStudyEncoder(dual);
    const { records, dumps } = await scoreStudy(encoder, loaded, await encoder.encodeImage(loaded.image), { dumpSimilarity: true });
    return { study: loaded.study.id, bestCell: records[0].bestCell, values: dumps[0].values };
  } finally {
    await dual.release();
  }
}

describe.skipIf(unavailable !== undefined)('explorer end to end (Chromium)', () => {
  let app: ServedApp;
  let browser: LaunchedBrowser;
  const requests: string[] = [];
  const consoleErrors: string[] = [];

  beforeAll(async () => {
    [app, browser] = await Promise.all([buildAndPreview(), launchBrowser()]);
    const origin = new URL(app.url).origin;
    // Every request of the page and its workers passes here; anything off the origin is refused.
    await browser.context.route('**/*', async (route) => {
      const url = route.request().url();
      requests.push(url);
      if (new URL(url).origin === origin || url.startsWith('blob:') || url.startsWith('data:')) await route.continue();
      else await route.abort('blockedbyclient');
    });
  });

  afterAll(async () => {
    await browser?.close();
    await app?.close();
  });

  test('the demo opens cross-origin isolated, draws the first map with the CLI best cell, and stays on its origin', async () => {
    const page = await browser.context.newPage();
    page.on('console', (m) => {
      // index.html names no icon, so Chromium's own /favicon.ico probe may 404; that is not the app's request.
      if (m.type() === 'error' && !m.location().url.endsWith('/favicon.ico')) consoleErrors.push(`${m.text()} (${m.location().url})`);
    });
    page.on('pageerror', (e) => consoleErrors.push(e.message));
    page.on('request', (r) => requests.push(r.url()));
    const t0 = Date.now();
    await page.goto(app.url);
    expect(await page.evaluate(() => globalThis.crossOriginIsolated)).toBe(true);
    expect(await page.getByRole('note', { name: 'Caution' }).textContent()).toMatch(/not a medical device/i);

    const caption = page.locator('[data-best-cell]').first();
    await caption.waitFor({ timeout: 120_000 });
    const firstMapMs = Date.now() - t0;
    console.log(`first map after ${firstMapMs} ms (uncached)`);
    await page.screenshot({ path: await artifactPath('demo-first-map.png'), fullPage: true });

    const [row, col] = ((await caption.getAttribute('data-best-cell')) ?? '').split(',').map(Number);
    const cli = await cliFirstSentence(await demoModelDir(page, app.url));
    expect(await caption.getAttribute('data-study')).toBe(cli.study);
    expect({ row, col }).toEqual(cli.bestCell);

    const origin = new URL(app.url).origin;
    const offOrigin = requests.filter((u) => !u.startsWith('blob:') && !u.startsWith('data:') && new URL(u).origin !== origin);
    expect(offOrigin).toEqual([]);
    expect(requests.some((u) => u.endsWith('/ort/ort-wasm-simd-threaded.wasm'))).toBe(true);
    expect(consoleErrors).toEqual([]);
    await page.close();
  });

  test('reopening the page reads the embeddings from IndexedDB instead of encoding again', async () => {
    const page = await browser.context.newPage();
    const t0 = Date.now();
    await page.goto(app.url);
    await page.locator('[data-best-cell]').first().waitFor({ timeout: 120_000 });
    console.log(`first map after ${Date.now() - t0} ms (cached)`);
    const entries = await page.evaluate(
      () =>
        new Promise<number>((resolve, reject) => {
          const req = indexedDB.open('tessera-embeddings');
          req.onerror = () => reject(req.error);
          req.onsuccess = () => {
            const count = req.result.transaction('embeddings').objectStore('embeddings').count();
            count.onsuccess = () => resolve(count.result);
            count.onerror = () => reject(count.error);
          };
        }),
    );
    expect(entries).toBeGreaterThanOrEqual(1);
    await page.close();
  });
});
