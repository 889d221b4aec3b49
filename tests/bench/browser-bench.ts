// Browser speed figures: time to the first map in the built explorer (fresh profile, then a reload
// that reads the IndexedDB cache), beside onnxruntime-node's image-encoding throughput on the same
// model. Run: npx tsx tests/bench/browser-bench.ts   (needs /usr/bin/chromium)
import { resolve } from 'node:path';
import { loadStudy, openSet } from '../../src/batch/study-inputs';
import { toStudyEncoder } from '../../src/batch/study-encoder';
import { createNodeFileSource } from '../../src/dataset/node-file-source';
import { createOrtNodeEngine } from '../../src/model/adapters/ort-node';
import { createTokenizerFromJson } from '../../src/model/adapters/hf-tokenizer';
import { openModelFolder } from '../../src/model/model-folder';
import { browserUnavailable, buildAndPreview, launchBrowser, REPO } from '../e2e/browser';

async function firstMapMs(open: () => Promise<unknown>, waitFor: () => Promise<unknown>): Promise<number> {
  const t0 = performance.now();
  await open();
  await waitFor();
  return performance.now() - t0;
}

async function nodeThroughput(modelDir: string, n: number): Promise<number> {
  const engine = await createOrtNodeEngine({ threads: 2 });
  const dual = await openModelFolder(createNodeFileSource(modelDir), engine, { threads: 2, tokenizerFactory: createTokenizerFromJson });
  const set = await openSet(createNodeFileSource(resolve(REPO, 'samples/phantom')));
  const enc = toStudyEncoder(dual);
  const studies = await Promise.all(set.studies.slice(0, n).map((s) => loadStudy(set, s)));
  await enc.encodeImage(studies[0].image);
  const t0 = performance.now();
  for (const s of studies) await enc.encodeImage(s.image);
  const seconds = (performance.now() - t0) / 1000;
  await dual.release();
  return studies.length / seconds;
}

async function main(): Promise<void> {
  const skip = browserUnavailable();
  if (skip) {
    console.log(skip);
    return;
  }
  const app = await buildAndPreview();
  const browser = await launchBrowser();
  try {
    const page = await browser.context.newPage();
    const wait = () => page.locator('[data-best-cell]').first().waitFor({ timeout: 180_000 });
    const uncached = await firstMapMs(() => page.goto(app.url), wait);
    const cached = await firstMapMs(() => page.reload(), wait);
    const catalogue = (await page.evaluate(async () => (await fetch('/demo/catalogue.json')).json())) as { models: string[] };
    const name = ['demo-local', 'demo-global', 'demo-widefield', 'tiny-model'].find((m) => catalogue.models.includes(m)) as string;
    const dir = name === 'tiny-model' ? resolve(REPO, 'tests/fixtures/tiny-model') : resolve(REPO, 'models', name);
    const nodeRate = await nodeThroughput(dir, 12);
    console.log(JSON.stringify({ model: name, first_map_ms: { uncached: Math.round(uncached), cached: Math.round(cached) }, node_images_per_s: Number(nodeRate.toFixed(2)) }, null, 2));
  } finally {
    await browser.close();
    await app.close();
  }
}

await main();
