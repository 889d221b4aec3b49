// Measures activation ranges for quantize.py: runs the calibration graph (the float image encoder
// with every Conv input and output as an extra output) in onnxruntime-node over the images of a
// sample set, preprocessed by the tool's own code exactly as scoring does, and writes per-tensor
// min/max and percentile pairs to JSON. Usage (from the repository root):
//   npx tsx models/recipe/calibrate.ts --graph /tmp/calib.onnx --model models/demo-local \
//       --set /tmp/calib-4004 --out /tmp/calib-ranges.json [--n 64]
import { readFileSync, writeFileSync } from 'node:fs';
import { resolve } from 'node:path';
import { parseArgs } from 'node:util';
import { decodeImage, loadSampleSet } from '../../src/dataset';
import { createNodeFileSource } from '../../src/dataset/node-file-source';
import { createOrtNodeEngine } from '../../src/model/adapters/ort-node';
import { readManifest } from '../../src/model/model-folder';
import { preprocessImage } from '../../src/model/preprocess';

/** Percentile pairs written per tensor: [lower, upper], e.g. p99.99 = [0.01 %, 99.99 %]. */
const PERCENTILES = [99.9, 99.99, 99.999];
/** Every SAMPLE_STRIDE-th value of each tensor is kept for the percentiles (min and max see all). */
const SAMPLE_STRIDE = 7;

const { values } = parseArgs({
  options: {
    graph: { type: 'string' }, model: { type: 'string' }, set: { type: 'string' }, out: { type: 'string' },
    n: { type: 'string', default: '64' }, threads: { type: 'string', default: '2' },
  },
});
for (const key of ['graph', 'model', 'set', 'out'] as const) {
  if (values[key] === undefined) throw new TypeError(`--${key} is required (see the comment at the top of calibrate.ts)`);
}
const limit = Number(values.n);
if (!Number.isInteger(limit) || limit < 1) throw new RangeError(`--n must be an integer >= 1; got ${values.n}`);

const manifest = await readManifest(createNodeFileSource(resolve(values.model as string)));
const setSource = createNodeFileSource(resolve(values.set as string));
const { manifest: set, problems } = await loadSampleSet(setSource);
if (problems.length > 0) throw new Error(`${values.set}: ${problems.length} problems in the sample set, first: ${JSON.stringify(problems[0])}`);
const studies = set.studies.slice(0, limit);
if (studies.length < limit) throw new RangeError(`--n ${limit}: the set holds only ${studies.length} studies`);

const engine = await createOrtNodeEngine({ threads: Number(values.threads) });
const session = await engine.createSession(new Uint8Array(readFileSync(resolve(values.graph as string))));

interface Tally { min: number; max: number; sample: number[] }
const tallies = new Map<string, Tally>();
for (const study of studies) {
  const image = decodeImage(await setSource.readBytes(study.image), study.image);
  const { tensor } = preprocessImage(image, manifest.image.input);
  const outputs = await session.run({ [manifest.image.input.name]: tensor });
  for (const [name, t] of Object.entries(outputs)) {
    const data = t.data as Float32Array;
    const tally = tallies.get(name) ?? { min: Infinity, max: -Infinity, sample: [] };
    for (let i = 0; i < data.length; i++) {
      const v = data[i];
      if (v < tally.min) tally.min = v;
      if (v > tally.max) tally.max = v;
      if (i % SAMPLE_STRIDE === 0) tally.sample.push(v);
    }
    tallies.set(name, tally);
  }
}
await session.release();

const quantile = (sorted: Float64Array, q: number): number => {
  const pos = q * (sorted.length - 1);
  const lo = Math.floor(pos);
  const hi = Math.min(sorted.length - 1, lo + 1);
  return sorted[lo] + (sorted[hi] - sorted[lo]) * (pos - lo);
};
const tensors: Record<string, unknown> = {};
for (const [name, t] of tallies) {
  const sorted = Float64Array.from(t.sample).sort();
  const percentiles = Object.fromEntries(PERCENTILES.map((p) => [`p${p}`, [quantile(sorted, 1 - p / 100), quantile(sorted, p / 100)]]));
  tensors[name] = { min: t.min, max: t.max, percentiles };
}
writeFileSync(resolve(values.out as string), `${JSON.stringify({
  schema: 'tessera.calibration/1',
  model: manifest.id,
  set: { folder: values.set, name: set.name, studies: studies.length, first: studies[0].id, last: studies[studies.length - 1].id },
  preprocessing: 'src/model/preprocess.ts preprocessImage with the manifest image.input',
  runtime: 'onnxruntime-node',
  sample_stride_for_percentiles: SAMPLE_STRIDE,
  tensors,
}, null, 1)}\n`);
process.stdout.write(`wrote ${values.out}: ranges of ${tallies.size} tensors over ${studies.length} images\n`);
