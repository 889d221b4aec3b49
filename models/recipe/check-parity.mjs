// Checks an exported model folder against its reference-outputs.json with ONNX Runtime (Node) and
// the tokenizer with transformers.js. Usage (from the repository root):
//   node models/recipe/check-parity.mjs models/demo-local [more folders...]
// Exits non-zero when any output differs from PyTorch by more than the stored tolerance, or when the
// token ids differ.
import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import * as ort from 'onnxruntime-node';
import { PreTrainedTokenizer } from '@huggingface/transformers';

function floats(b64) {
  const bytes = Buffer.from(b64, 'base64');
  return new Float32Array(bytes.buffer, bytes.byteOffset, bytes.byteLength / 4);
}

function maxAbsDiff(a, b) {
  if (a.length !== b.length) return Infinity;
  let worst = 0;
  for (let i = 0; i < a.length; i += 1) worst = Math.max(worst, Math.abs(a[i] - b[i]));
  return worst;
}

async function checkFolder(dir) {
  const manifest = JSON.parse(readFileSync(join(dir, 'tessera-model.json'), 'utf8'));
  const ref = JSON.parse(readFileSync(join(dir, 'reference-outputs.json'), 'utf8'));
  const problems = [];

  const image = await ort.InferenceSession.create(join(dir, manifest.image.file));
  const input = new ort.Tensor('float32', floats(ref.image.input.base64), ref.image.input.dims);
  const imageOut = (await image.run({ [manifest.image.input.name]: input }))[manifest.image.output.name];
  const imageDiff = maxAbsDiff(imageOut.data, floats(ref.image.output.base64));
  if (String(imageOut.dims) !== String(ref.image.output.dims)) problems.push(`image dims ${imageOut.dims}`);
  if (!(imageDiff <= ref.tolerance)) problems.push(`image max |diff| ${imageDiff}`);

  const text = await ort.InferenceSession.create(join(dir, manifest.text.file));
  const toBig = (rows) => BigInt64Array.from(rows.flat(), (v) => BigInt(v));
  const dims = ref.text.input_ids.dims;
  const textOut = (
    await text.run({
      [manifest.text.input.ids]: new ort.Tensor('int64', toBig(ref.text.input_ids.values), dims),
      [manifest.text.input.mask]: new ort.Tensor('int64', toBig(ref.text.attention_mask.values), dims),
    })
  )[manifest.text.output.name];
  const textDiff = maxAbsDiff(textOut.data, floats(ref.text.output.base64));
  if (!(textDiff <= ref.tolerance)) problems.push(`text max |diff| ${textDiff}`);

  // Padding to max_tokens must not change a sentence's embedding (the mask hides the padding).
  const width = manifest.text.max_tokens;
  const padRows = (rows, fill) => rows.map((r) => [...r, ...new Array(width - r.length).fill(fill)]);
  const padded = (
    await text.run({
      [manifest.text.input.ids]: new ort.Tensor('int64', toBig(padRows(ref.text.input_ids.values, 0)), [dims[0], width]),
      [manifest.text.input.mask]: new ort.Tensor('int64', toBig(padRows(ref.text.attention_mask.values, 0)), [dims[0], width]),
    })
  )[manifest.text.output.name];
  const padDiff = maxAbsDiff(padded.data, textOut.data);
  if (!(padDiff <= ref.tolerance)) problems.push(`padding to ${width} changes the embedding by ${padDiff}`);

  const config = JSON.parse(readFileSync(join(dir, 'tokenizer_config.json'), 'utf8'));
  const tokenizer = new PreTrainedTokenizer(JSON.parse(readFileSync(join(dir, manifest.text.tokenizer), 'utf8')), config);
  if (tokenizer.pad_token_id !== 0) problems.push(`pad token id ${tokenizer.pad_token_id}, expected 0 ([PAD])`);
  ref.text.sentences.forEach((sentence, i) => {
    const full = tokenizer.encode(sentence);
    // Truncation keeps [CLS] and [SEP] and drops words from the end, as the Python side does.
    const ids = full.length <= ref.text.max_tokens ? full : [...full.slice(0, ref.text.max_tokens - 1), full[full.length - 1]];
    const expected = ref.text.input_ids.values[i].filter((_, j) => ref.text.attention_mask.values[i][j] === 1);
    if (String(ids) !== String(expected)) problems.push(`tokens of ${JSON.stringify(sentence)}: ${ids} vs ${expected}`);
  });
  console.log(
    `${dir}: image |diff| ${imageDiff.toExponential(2)}, text |diff| ${textDiff.toExponential(2)}, ` +
      `padding |diff| ${padDiff.toExponential(2)}, tokenizer ${problems.some((p) => p.startsWith('tokens')) ? 'DIFFERS' : 'same'}`,
  );
  for (const p of problems) console.log(`  problem: ${p}`);
  return problems.length;
}

let failures = 0;
for (const dir of process.argv.slice(2)) failures += await checkFolder(dir);
process.exit(failures === 0 ? 0 : 1);
