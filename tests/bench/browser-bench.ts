// Browser speed figures, printed as one JSON object (a benchmark, not a test: nothing is asserted
// on time). In the built explorer on a fresh Chromium profile:
// - time to the first map (fresh profile, then a reload that reads the IndexedDB cache);
// - re-pooling after an aggregator change for the study shown: from the select's change event to
//   the selected sentence's pooled score in the page (and to the next painted frame), with the
//   requests the page sent to its inference worker counted before and after (none may be an encode);
// - image-encoding throughput of the page's worker (onnxruntime-web, WASM) while "Score the set"
//   runs, over onnxruntime-node's on the same model in this process: a ratio.
// Run: npx tsx tests/bench/browser-bench.ts   (needs /usr/bin/chromium)
import { resolve } from 'node:path';
import type { Page } from 'playwright-core';
import { loadStudy, openSet } from '../../src/batch/study-inputs';
import { toStudyEncoder } from '../../src/batch/study-encoder';
import { createNodeFileSource } from '../../src/dataset/node-file-source';
import { createOrtNodeEngine } from '../../src/model/adapters/ort-node';
import { createTokenizerFromJson } from '../../src/model/adapters/hf-tokenizer';
import { openModelFolder } from '../../src/model/model-folder';
import { browserUnavailable, buildAndPreview, launchBrowser, REPO } from '../e2e/browser';

/** One request the page posted to a Worker: its protocol type and id, when it was posted and answered (page clock, ms). */
interface WorkerCall {
  readonly type: string;
  readonly id: number;
  readonly posted: number;
  answered?: number;
}

/**
 * Runs in the page before its scripts: wraps Worker.prototype.postMessage so that every request
 * of the inference protocol ({ id, type }) and the time of its 'result' or 'error' answer are kept
 * in globalThis.__tesseraWorkerCalls. The app is not changed; the wrapper only observes.
 */
function watchWorkerRequests(): void {
  const calls: WorkerCall[] = [];
  (globalThis as unknown as { __tesseraWorkerCalls: WorkerCall[] }).__tesseraWorkerCalls = calls;
  const watched = new WeakSet<Worker>();
  const post = Worker.prototype.postMessage as (this: Worker, message: unknown, transfer?: Transferable[]) => void;
  Worker.prototype.postMessage = function (this: Worker, message: unknown, transfer?: Transferable[] | StructuredSerializeOptions) {
    const m = message as { id?: unknown; type?: unknown } | null;
    if (m && typeof m.id === 'number' && typeof m.type === 'string') {
      calls.push({ type: m.type, id: m.id, posted: performance.now() });
      if (!watched.has(this)) {
        watched.add(this);
        this.addEventListener('message', (e: MessageEvent) => {
          const d = e.data as { id?: unknown; type?: unknown } | null;
          if (!d || (d.type !== 'result' && d.type !== 'error')) return;
          const call = calls.find((c) => c.id === d.id && c.answered === undefined && c.type !== 'cancel');
          if (call) call.answered = performance.now();
        });
      }
    }
    return post.call(this, message, transfer as Transferable[]);
  } as typeof Worker.prototype.postMessage;
}

const workerCalls = (page: Page): Promise<WorkerCall[]> => page.evaluate(() => (globalThis as unknown as { __tesseraWorkerCalls: WorkerCall[] }).__tesseraWorkerCalls.map((c) => ({ ...c })));

const countByType = (calls: readonly WorkerCall[]): Record<string, number> => {
  const out: Record<string, number> = {};
  for (const c of calls) out[c.type] = (out[c.type] ?? 0) + 1;
  return out;
};

async function firstMapMs(open: () => Promise<unknown>, waitFor: () => Promise<unknown>): Promise<number> {
  const t0 = performance.now();
  await open();
  await waitFor();
  return performance.now() - t0;
}

/**
 * Switches the region pooling through `kinds` in the page and times each switch: `dom_ms` from the
 * change event to the selected sentence's pooled score showing a new value, `painted_ms` to the
 * frame after it. Times are the page's own clock.
 */
async function repoolTimes(page: Page, kinds: readonly string[]): Promise<{ kind: string; dom_ms: number; painted_ms: number; before: string; after: string }[]> {
  return page.evaluate(async (kinds) => {
    const select = document.querySelector<HTMLSelectElement>('.t-aggregator select');
    if (!select) throw new Error('no region pooling select (.t-aggregator select) on the page');
    const score = () => document.querySelector('.t-sentence[aria-selected="true"] .t-sentence__score')?.textContent ?? '';
    const setValue = Object.getOwnPropertyDescriptor(HTMLSelectElement.prototype, 'value')?.set;
    const frame = () => new Promise<number>((r) => requestAnimationFrame(() => r(performance.now())));
    const out: { kind: string; dom_ms: number; painted_ms: number; before: string; after: string }[] = [];
    for (const kind of kinds) {
      await frame();
      const before = score();
      const t0 = performance.now();
      setValue?.call(select, kind);
      select.dispatchEvent(new Event('change', { bubbles: true }));
      // React handles the change event synchronously; the loop is for an update that comes later.
      let dom = performance.now();
      while (score() === before) {
        if (performance.now() - t0 > 10_000) throw new Error(`the pooled score stayed ${before} for 10 s after switching to ${kind}`);
        dom = await frame();
      }
      const painted = await frame();
      out.push({ kind, dom_ms: dom - t0, painted_ms: painted - t0, before, after: score() });
    }
    return out;
  }, kinds);
}

/** Image encodings per second of busy worker time: encode-image requests over the union of their [posted, answered] spans. */
function pageEncodeRate(calls: readonly WorkerCall[]): { images: number; busy_s: number; images_per_s: number } {
  const spans = calls
    .filter((c) => c.type === 'encode-image' && c.answered !== undefined)
    .map((c) => [c.posted, c.answered as number] as const)
    .sort((a, b) => a[0] - b[0]);
  let busy = 0;
  let end = -Infinity;
  for (const [a, b] of spans) {
    if (a >= end) busy += b - a;
    else if (b > end) busy += b - end;
    end = Math.max(end, b);
  }
  return { images: spans.length, busy_s: busy / 1000, images_per_s: spans.length / (busy / 1000) };
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

const median = (xs: readonly number[]): number => {
  const s = [...xs].sort((a, b) => a - b);
  return s.length % 2 ? s[(s.length - 1) / 2] : (s[s.length / 2 - 1] + s[s.length / 2]) / 2;
};
const round = (x: number, digits = 1): number => Number(x.toFixed(digits));

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
    // tsx (esbuild, keepNames) wraps named functions in __name(...); functions sent to the page need it there.
    await page.addInitScript({ content: 'globalThis.__name ??= (f) => f;' });
    await page.addInitScript(watchWorkerRequests);
    const wait = () => page.locator('[data-best-cell]').first().waitFor({ timeout: 180_000 });
    const uncached = await firstMapMs(() => page.goto(app.url), wait);
    const cached = await firstMapMs(() => page.reload(), wait);
    const catalogue = (await page.evaluate(async () => (await fetch('/demo/catalogue.json')).json())) as { models: string[] };
    const name = ['demo-local', 'demo-global', 'demo-widefield', 'tiny-model'].find((m) => catalogue.models.includes(m)) as string;
    const dir = name === 'tiny-model' ? resolve(REPO, 'tests/fixtures/tiny-model') : resolve(REPO, 'models', name);

    // (a) Re-pooling: the page must answer from the kept similarities, with no request to encode.
    await page.waitForFunction(() => document.querySelector('.t-statusline')?.getAttribute('data-status') === 'ready', undefined, { timeout: 60_000 });
    const callsBefore = await workerCalls(page);
    const switches = await repoolTimes(page, ['topk', 'lse', 'softmax', 'max', 'topk', 'lse', 'softmax', 'max']);
    await page.waitForTimeout(500);
    const during = (await workerCalls(page)).slice(callsBefore.length);
    const encodeRequests = during.filter((c) => c.type.startsWith('encode-')).length;

    // (b) Encoding throughput of the page's worker while the set is scored with the open model.
    await page.getByRole('tab', { name: 'Score the set' }).click();
    const runStart = (await workerCalls(page)).length;
    const tRun = performance.now();
    await page.locator('.t-batch .t-button--primary').click();
    await page.locator('.t-batch [role="status"]', { hasText: 'Finished' }).waitFor({ timeout: 1_800_000 });
    const runSeconds = (performance.now() - tRun) / 1000;
    const page_rate = pageEncodeRate((await workerCalls(page)).slice(runStart));
    // The worker asks onnxruntime-web for 2 threads when the page is cross-origin isolated, else it runs on 1 (src/app/inference/inference-worker.ts).
    const runtime = await page.evaluate(() => ({ crossOriginIsolated: globalThis.crossOriginIsolated, hardwareConcurrency: navigator.hardwareConcurrency }));

    const nodeRate = await nodeThroughput(dir, 12);
    console.log(
      JSON.stringify(
        {
          model: name,
          first_map_ms: { uncached: Math.round(uncached), cached: Math.round(cached) },
          repool_after_aggregator_change: {
            switches: switches.length,
            dom_ms_median: round(median(switches.map((s) => s.dom_ms))),
            dom_ms_max: round(Math.max(...switches.map((s) => s.dom_ms))),
            painted_ms_median: round(median(switches.map((s) => s.painted_ms))),
            painted_ms_max: round(Math.max(...switches.map((s) => s.painted_ms))),
            scores_seen: switches.map((s) => `${s.kind} ${s.before}->${s.after}`),
            worker_requests_during: countByType(during),
            encode_requests_during: encodeRequests,
          },
          encoding: {
            page_worker: { ...page_rate, busy_s: round(page_rate.busy_s, 2), images_per_s: round(page_rate.images_per_s, 2), run_s: round(runSeconds, 1), ...runtime, threads: runtime.crossOriginIsolated ? 2 : 1 },
            node_images_per_s: round(nodeRate, 2),
            node_threads: 2,
            page_over_node: round(page_rate.images_per_s / nodeRate, 3),
          },
        },
        null,
        2,
      ),
    );
  } finally {
    await browser.close();
    await app.close();
  }
}

await main();
