/**
 * `npm run bench`: speed and memory figures, printed as one JSON object on stdout.
 * - scoring stage: Tessera's core over 1,000 studies x 10 sentences x 196 cells x D=128, and the same
 *   computation in numpy (Debian python3-numpy) in the same run; ratio = ours / numpy (studies/s).
 * - image encoder throughput: onnxruntime-web (WASM, 2 threads) over onnxruntime-node (2 threads);
 *   and demo-local-int8 over demo-local in each runtime (whole encode path and graph alone).
 * - memory held per 1,000 scored studies.
 * Absolute times on a shared machine are noise; read the ratios.
 */
import { execFileSync } from 'node:child_process';
import { existsSync, mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join, resolve } from 'node:path';
import { createRng } from '../../src/core/seeded-random';
import { computeSimilarityWithNormalisedCells, l2Normalise } from '../../src/core/similarity-matrix';
import { poolRegions } from '../../src/core/pool-regions';
import { groundSentence } from '../../src/core/ground-sentence';
import { computeResizeTransform } from '../../src/core/resize-transform';
import { gridCellRects } from '../../src/core/grid-geometry';
import { bestCellIndex, centreHit, chanceLevels, overlapHit, prepareStudyGeometry } from '../../src/core/hit-rules';
import { coveredAreasInto } from '../../src/core/box-geometry';
import { massInBoxes } from '../../src/core/mass-in-boxes';
import { contrastToNoise } from '../../src/core/contrast-to-noise';
import type { ImageRect } from '../../src/core/types';
import { createNodeFileSource } from '../../src/dataset/node-file-source';
import { openModelFolder } from '../../src/model/model-folder';
import { createOrtNodeEngine } from '../../src/model/adapters/ort-node';
import { createOrtWebEngine } from '../../src/model/adapters/ort-web';
import { createTokenizerFromJson } from '../../src/model/adapters/hf-tokenizer';
import { preprocessImage } from '../../src/model/preprocess';
import type { InferenceEngine } from '../../src/model/types';
import type { DecodedImage } from '../../src/dataset/types';

const STUDIES = 1000;
const SENTENCES = 10;
const GRID = { h: 14, w: 14 };
const CELLS = GRID.h * GRID.w;
const DIM = 128;
const SIZE = 224;
/** demo-local's int8 image-encoder variant (models/recipe/quantize.py), timed against demo-local when present. */
const INT8_DIR = 'models/demo-local-int8';

function makeData(): { cells: Float32Array; sents: Float32Array; boxes: ImageRect[] } {
  const rng = createRng(2024);
  const cells = new Float32Array(STUDIES * CELLS * DIM);
  const sents = new Float32Array(STUDIES * SENTENCES * DIM);
  for (let i = 0; i < cells.length; i++) cells[i] = rng.normal();
  for (let i = 0; i < sents.length; i++) sents[i] = rng.normal();
  const boxes: ImageRect[] = [];
  for (let i = 0; i < STUDIES * SENTENCES; i++) {
    const w = 20 + rng.next() * 80;
    const h = 20 + rng.next() * 80;
    boxes.push({ x: rng.next() * (SIZE - w), y: rng.next() * (SIZE - h), w, h });
  }
  return { cells, sents, boxes };
}

function benchScoringTs(data: ReturnType<typeof makeData>): { studies_per_s: number; seconds: number; hits: number } {
  const transform = computeResizeTransform({ width: SIZE, height: SIZE }, { width: SIZE, height: SIZE }, 'stretch');
  const cellRects = gridCellRects(transform, GRID);
  const imageSize = { width: SIZE, height: SIZE };
  // In a real set every study has its own geometry; prepare it per study as the pipeline does.
  const t0 = performance.now();
  let hits = 0;
  let sink = 0;
  for (let i = 0; i < STUDIES; i++) {
    const cells = l2Normalise(data.cells.subarray(i * CELLS * DIM, (i + 1) * CELLS * DIM), CELLS, DIM);
    const sents = data.sents.subarray(i * SENTENCES * DIM, (i + 1) * SENTENCES * DIM);
    const sim = computeSimilarityWithNormalisedCells(sents, SENTENCES, cells, CELLS, DIM);
    const geometry = prepareStudyGeometry(transform, GRID, cellRects);
    for (let s = 0; s < SENTENCES; s++) {
      const values = sim.data.subarray(s * CELLS, (s + 1) * CELLS);
      sink += poolRegions(values, { kind: 'max' });
      const g = groundSentence({ values, grid: GRID, cells: cellRects, transform, imageSize, boxes: [data.boxes[i * SENTENCES + s]], geometry });
      if (g.hits.centre) hits++;
    }
  }
  const seconds = (performance.now() - t0) / 1000;
  if (!Number.isFinite(sink)) throw new Error('non-finite pooled score in the benchmark');
  return { studies_per_s: STUDIES / seconds, seconds, hits };
}

// The numpy script's subset (no upsampled hit, IoU, top-k or laterality) through the public core
// functions, for a like-for-like second figure; chanceLevels also counts the upsampled rule's pixels.
function benchScoringTsSubset(data: ReturnType<typeof makeData>): { studies_per_s: number; seconds: number; hits: number } {
  const transform = computeResizeTransform({ width: SIZE, height: SIZE }, { width: SIZE, height: SIZE }, 'stretch');
  const cellRects = gridCellRects(transform, GRID);
  const t0 = performance.now();
  let hits = 0;
  let sink = 0;
  for (let i = 0; i < STUDIES; i++) {
    const cells = l2Normalise(data.cells.subarray(i * CELLS * DIM, (i + 1) * CELLS * DIM), CELLS, DIM);
    const sents = data.sents.subarray(i * SENTENCES * DIM, (i + 1) * SENTENCES * DIM);
    const sim = computeSimilarityWithNormalisedCells(sents, SENTENCES, cells, CELLS, DIM);
    const geometry = prepareStudyGeometry(transform, GRID, cellRects);
    const { covered, fraction, inside } = geometry.scratch;
    for (let s = 0; s < SENTENCES; s++) {
      const values = sim.data.subarray(s * CELLS, (s + 1) * CELLS);
      const boxes = [data.boxes[i * SENTENCES + s]];
      sink += poolRegions(values, { kind: 'max' });
      const best = bestCellIndex(values);
      if (centreHit(geometry.centres[best], boxes, 0)) hits++;
      if (overlapHit(geometry.cells[best], boxes)) sink++;
      const chance = chanceLevels(geometry, boxes, 0);
      coveredAreasInto(geometry.cells, geometry.cellEdges, boxes, covered);
      for (let c = 0; c < CELLS; c++) {
        fraction[c] = covered[c] / geometry.cellAreas[c];
        const p = geometry.centres[c];
        const b = boxes[0];
        inside[c] = p.x >= b.x && p.x <= b.x + b.w && p.y >= b.y && p.y <= b.y + b.h ? 1 : 0;
      }
      sink += chance.centre + chance.overlap + (massInBoxes(values, fraction) ?? 0) + (contrastToNoise(values, inside) ?? 0);
    }
  }
  const seconds = (performance.now() - t0) / 1000;
  if (Number.isNaN(sink)) throw new Error('NaN in the subset benchmark');
  return { studies_per_s: STUDIES / seconds, seconds, hits };
}

function benchScoringNumpy(data: ReturnType<typeof makeData>): Record<string, unknown> | { error: string } {
  const dir = mkdtempSync(join(tmpdir(), 'tessera-bench-'));
  const base = join(dir, 'scoring');
  const all = new Float32Array(data.cells.length + data.sents.length);
  all.set(data.cells, 0);
  all.set(data.sents, data.cells.length);
  writeFileSync(`${base}.bin`, new Uint8Array(all.buffer));
  writeFileSync(`${base}.json`, JSON.stringify({
    studies: STUDIES, sentences: SENTENCES, cells: CELLS, dim: DIM, grid_h: GRID.h, grid_w: GRID.w, image_size: SIZE,
    boxes: data.boxes.flatMap((b) => [b.x, b.y, b.w, b.h]),
  }));
  try {
    const out = execFileSync('/usr/bin/python3', [resolve('tests/bench/scoring-numpy.py'), base], { encoding: 'utf8' });
    return JSON.parse(out) as Record<string, unknown>;
  } catch (err) {
    return { error: `numpy run failed (is Debian python3-numpy installed?): ${(err as Error).message.split('\n')[0]}` };
  } finally {
    rmSync(dir, { recursive: true, force: true });
  }
}

function syntheticImage(seed: number, size = 512): DecodedImage {
  const rng = createRng(seed);
  const data = new Float32Array(size * size);
  for (let i = 0; i < data.length; i++) data[i] = rng.next() * 255;
  return { width: size, height: size, data, format: 'png', bitDepth: 8, valueRange: [0, 255] };
}

async function benchEncoders(): Promise<Record<string, unknown>> {
  const dir = ['models/demo-local', 'tests/fixtures/tiny-model'].find((d) => existsSync(join(d, 'tessera-model.json')));
  if (!dir) return { error: 'no model folder found' };
  const int8Dir = existsSync(join(INT8_DIR, 'tessera-model.json')) ? INT8_DIR : undefined;
  const images = Array.from({ length: 8 }, (_, i) => syntheticImage(i));
  // Float and int8 take turns round by round on one engine, so drift on a shared machine hits both alike.
  const timeEngine = async (engine: InferenceEngine): Promise<{ encode: number[]; graph: number[] }> => {
    const folders = int8Dir ? [dir, int8Dir] : [dir];
    const duals = await Promise.all(folders.map((d) => openModelFolder(createNodeFileSource(resolve(d)), engine, { threads: 2, tokenizerFactory: createTokenizerFromJson })));
    const manifest = duals[0].manifest;
    const feed = { [manifest.image.input.name]: preprocessImage(images[0], manifest.image.input).tensor };
    const sessions = await Promise.all(folders.map((d) => engine.createSession(new Uint8Array(readFileSync(join(d, manifest.image.file))), { threads: 2 })));
    for (const dual of duals) for (const im of images.slice(0, 2)) await dual.encodeImage(im); // warm-up
    for (const session of sessions) for (let i = 0; i < 2; i++) await session.run(feed);
    const rounds = 6;
    const encodeSecs = folders.map(() => 0);
    const graphSecs = folders.map(() => 0);
    for (let r = 0; r < rounds; r++) {
      for (let m = 0; m < folders.length; m++) {
        let t0 = performance.now();
        for (const im of images) await duals[m].encodeImage(im);
        encodeSecs[m] += (performance.now() - t0) / 1000;
        t0 = performance.now();
        for (let i = 0; i < images.length; i++) await sessions[m].run(feed);
        graphSecs[m] += (performance.now() - t0) / 1000;
      }
    }
    await Promise.all([...duals.map((d) => d.release()), ...sessions.map((s) => s.release())]);
    const rate = (secs: number): number => (rounds * images.length) / secs;
    return { encode: encodeSecs.map(rate), graph: graphSecs.map(rate) };
  };
  const node = await timeEngine(await createOrtNodeEngine({ threads: 2 }));
  const web = await timeEngine(await createOrtWebEngine({ threads: 2, wasmPaths: `${resolve('node_modules/onnxruntime-web/dist')}/` }));
  const result: Record<string, unknown> = {
    model: dir, images_per_s_ort_node: node.encode[0], images_per_s_ort_web: web.encode[0], ratio_web_over_node: web.encode[0] / node.encode[0],
  };
  if (int8Dir) {
    result.int8 = {
      model: int8Dir,
      note: 'encode = encodeImage on a 512 x 512 image (preprocessing, the graph, the copy to cells); graph = the image encoder session alone on a preprocessed [1, 1, 224, 224] input. ratio = int8 images/s over float images/s, float and int8 timed in alternating rounds in this run.',
      images_per_s_ort_node: { float_encode: node.encode[0], int8_encode: node.encode[1], float_graph: node.graph[0], int8_graph: node.graph[1] },
      images_per_s_ort_web: { float_encode: web.encode[0], int8_encode: web.encode[1], float_graph: web.graph[0], int8_graph: web.graph[1] },
      ratio_int8_over_float_ort_node: { encode: node.encode[1] / node.encode[0], graph: node.graph[1] / node.graph[0] },
      ratio_int8_over_float_ort_web: { encode: web.encode[1] / web.encode[0], graph: web.graph[1] / web.graph[0] },
    };
  }
  return result;
}

function benchMemory(data: ReturnType<typeof makeData>): Record<string, unknown> {
  globalThis.gc?.();
  const before = process.memoryUsage();
  // What a run holds per study: normalised cell embeddings for retrieval and one record per sentence.
  const held: { cells: Float32Array; records: object[] }[] = [];
  for (let i = 0; i < STUDIES; i++) {
    const cells = l2Normalise(data.cells.subarray(i * CELLS * DIM, (i + 1) * CELLS * DIM), CELLS, DIM);
    const records = Array.from({ length: SENTENCES }, (_, s) => ({ study: `s${i}`, sentenceIndex: s, text: `sentence ${s} of study ${i}`, hits: { centre: false, overlap: false, upsampled: false }, chance: { centre: 0.1, overlap: 0.2, upsampled: 0.1 }, boxes: [data.boxes[i * SENTENCES + s]] }));
    held.push({ cells, records });
  }
  const after = process.memoryUsage();
  const mb = (b: number): number => Math.round((b / 2 ** 20) * 10) / 10;
  return {
    studies_held: held.length,
    heap_plus_buffers_mb_per_1000_studies: mb(after.heapUsed + after.arrayBuffers - before.heapUsed - before.arrayBuffers),
    rss_mb: mb(after.rss),
  };
}

async function main(): Promise<void> {
  const data = makeData();
  // The first pass pays JIT compilation; a scoring run over a real set is long enough to be warm,
  // so the headline is the second pass and the cold one is reported beside it.
  const cold = benchScoringTs(data);
  const ours = benchScoringTs(data);
  const numpy = benchScoringNumpy(data);
  const subset = benchScoringTsSubset(data);
  const numpyRate = (numpy as { studies_per_s?: number }).studies_per_s;
  const result = {
    scoring: {
      workload: `${STUDIES} studies x ${SENTENCES} sentences x ${CELLS} cells x D=${DIM}`,
      tessera: ours,
      tessera_cold_first_pass: cold,
      numpy,
      ratio_tessera_over_numpy: numpyRate ? ours.studies_per_s / numpyRate : undefined,
      tessera_numpy_subset: subset,
      ratio_tessera_subset_over_numpy: numpyRate ? subset.studies_per_s / numpyRate : undefined,
      note: 'Tessera (the headline ratio) computes every metric of groundSentence (also upsampled hit, top-k, IoU, laterality); numpy computes the listed subset, and tessera_numpy_subset times that same subset through the public core functions, run after numpy.',
    },
    encoders: await benchEncoders(),
    memory: benchMemory(data),
  };
  process.stdout.write(`${JSON.stringify(result, null, 2)}\n`);
}

main().catch((err: unknown) => {
  process.stderr.write(`bench failed: ${(err as Error).stack ?? String(err)}\n`);
  process.exitCode = 1;
});
