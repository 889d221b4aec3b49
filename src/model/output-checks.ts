import type { Problem } from './contract';
import type { ModelManifest, NamedTensor } from './types';

const show = (dims: readonly number[]): string => `[${dims.join(', ')}]`;

/**
 * Checks an image encoder output against the manifest for a batch of `batch` images; returns every
 * problem (empty when it fits). `[B, D, h, w]` for layout BDHW, `[B, h*w, D]` for BND.
 */
export function checkImageOutput(manifest: ModelManifest, t: NamedTensor | undefined, batch: number): Problem[] {
  const file = manifest.image.file;
  const { name, layout, grid } = manifest.image.output;
  const d = manifest.embedding_dim;
  const path = `output "${name}"`;
  if (t === undefined) {
    return [{ file, path, expected: `an output named "${name}"`, got: 'no such output from the run', fix: 'correct image.output.name to one of the graph outputs.' }];
  }
  if (t.type !== 'float32') {
    return [{ file, path, expected: 'a float32 tensor', got: `a ${t.type} tensor`, fix: 'export the image encoder with a float32 output.' }];
  }
  const problems: Problem[] = [];
  const dims = t.dims;
  const add = (expected: string, fix: string): void => {
    problems.push({ file, path, expected, got: `shape ${show(dims)}`, fix });
  };
  if (layout === 'BDHW') {
    const expected = `shape [B, D, h, w] = ${show([batch, d, grid.h, grid.w])}`;
    if (dims.length !== 4) {
      add(expected, dims.length === 3
        ? 'the output has rank 3: if it is [B, h*w, D], set image.output.layout to "BND".'
        : 'export the region-embedding map (before global pooling) as [batch, D, h, w].');
    } else {
      if (dims[0] !== batch) add(expected, `the graph returned batch ${dims[0]} for ${batch} image(s): export with a dynamic batch axis (dynamic_axes on dim 0).`);
      if (dims[1] !== d) {
        add(expected, dims[3] === d && dims[1] === grid.h
          ? 'the output looks channels-last [B, h, w, D]: transpose it to [B, D, h, w] in the export.'
          : `the output has ${dims[1]} channels: set embedding_dim to ${dims[1]} or export the projected embeddings.`);
      }
      if (dims[2] !== grid.h || dims[3] !== grid.w) add(expected, `set image.output.grid to {"h": ${dims[2]}, "w": ${dims[3]}}, or check the input size.`);
    }
  } else {
    const cells = grid.h * grid.w;
    const expected = `shape [B, h*w, D] = ${show([batch, cells, d])}`;
    if (dims.length !== 3) {
      add(expected, dims.length === 4
        ? 'the output has rank 4: if it is [B, D, h, w], set image.output.layout to "BDHW".'
        : 'export the region embeddings as [batch, h*w, D].');
    } else {
      if (dims[0] !== batch) add(expected, `the graph returned batch ${dims[0]} for ${batch} image(s): export with a dynamic batch axis (dynamic_axes on dim 0).`);
      if (dims[1] !== cells) {
        add(expected, dims[1] === cells + 1
          ? 'there is one extra token, likely a class token: drop it in the export so only the h*w region tokens remain.'
          : `the output has ${dims[1]} regions but grid ${grid.h} x ${grid.w} = ${cells}: correct image.output.grid.`);
      }
      if (dims[2] !== d) add(expected, `the regions have ${dims[2]} values: set embedding_dim to ${dims[2]} or export the projected embeddings.`);
    }
  }
  if (problems.length === 0) problems.push(...checkFinite(t, file, path));
  return problems;
}

/** Checks a text encoder output for `sentences` sentences padded to `tokens` tokens. */
export function checkTextOutput(manifest: ModelManifest, t: NamedTensor | undefined, sentences: number, tokens: number): Problem[] {
  const file = manifest.text.file;
  const { name, kind } = manifest.text.output;
  const d = manifest.embedding_dim;
  const path = `output "${name}"`;
  if (t === undefined) {
    return [{ file, path, expected: `an output named "${name}"`, got: 'no such output from the run', fix: 'correct text.output.name to one of the graph outputs.' }];
  }
  if (t.type !== 'float32') {
    return [{ file, path, expected: 'a float32 tensor', got: `a ${t.type} tensor`, fix: 'export the text encoder with a float32 output.' }];
  }
  const problems: Problem[] = [];
  const dims = t.dims;
  const add = (expected: string, fix: string): void => {
    problems.push({ file, path, expected, got: `shape ${show(dims)}`, fix });
  };
  if (kind === 'sentence') {
    const expected = `shape [B, D] = ${show([sentences, d])}`;
    if (dims.length !== 2) {
      add(expected, dims.length === 3
        ? 'the output has rank 3 (token states?): set text.output.kind to "tokens" with a "pooling".'
        : 'export one vector per sentence as [batch, D].');
    } else {
      if (dims[0] !== sentences) add(expected, `the graph returned ${dims[0]} rows for ${sentences} sentence(s): export with a dynamic batch axis.`);
      if (dims[1] !== d) add(expected, `the sentences have ${dims[1]} values: set embedding_dim to ${dims[1]} or export the projected embeddings.`);
    }
  } else {
    const expected = `shape [B, T, D] = ${show([sentences, tokens, d])}`;
    if (dims.length !== 3) {
      add(expected, dims.length === 2
        ? 'the output has rank 2 (one vector per sentence?): set text.output.kind to "sentence" and remove "pooling".'
        : 'export the token states as [batch, tokens, D].');
    } else {
      if (dims[0] !== sentences) add(expected, `the graph returned ${dims[0]} rows for ${sentences} sentence(s): export with a dynamic batch axis.`);
      if (dims[1] !== tokens) add(expected, `the graph returned ${dims[1]} token states for ${tokens} tokens in: export with a dynamic token axis.`);
      if (dims[2] !== d) add(expected, `the tokens have ${dims[2]} values: set embedding_dim to ${dims[2]} or export the projected states.`);
    }
  }
  if (problems.length === 0) problems.push(...checkFinite(t, file, path));
  return problems;
}

function checkFinite(t: NamedTensor, file: string, path: string): Problem[] {
  let bad = 0;
  let first = -1;
  for (let i = 0; i < t.data.length; i++) {
    if (!Number.isFinite(t.data[i] as number)) {
      bad++;
      if (first < 0) first = i;
    }
  }
  if (bad === 0) return [];
  return [{
    file,
    path,
    expected: 'finite values only',
    got: `${bad} of ${t.data.length} values NaN or infinite (first at flat index ${first}, ${String(t.data[first])})`,
    fix: 'check the export (e.g. a division by a zero norm or a fully masked attention row) and the input normalisation in image.input.',
  }];
}
