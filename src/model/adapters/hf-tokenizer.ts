import { PreTrainedTokenizer, env } from '@huggingface/transformers';
import type { SentenceTokenizer } from '../types';

/**
 * A SentenceTokenizer over transformers.js, built from the parsed tokenizer.json (and, if the
 * folder has one, tokenizer_config.json). Fully offline: nothing is fetched from a model hub.
 *
 * Each sentence is encoded with the tokenizer's own special tokens, padded to the longest sentence
 * of the batch (mask 0 on padding). A sentence longer than maxTokens keeps its special tokens and
 * loses words from the end, as the Python tokenizers library truncates; transformers.js alone would
 * cut the closing special token off.
 */
export function createTokenizerFromJson(tokenizerJson: object, config: object = {}): SentenceTokenizer {
  env.allowRemoteModels = false;
  env.allowLocalModels = false;
  // tokenizer.json may declare its own padding; tokenizer_config.json wins when both do.
  const declaredPad = (tokenizerJson as { padding?: { pad_token?: unknown } }).padding?.pad_token;
  const merged: Record<string, unknown> = { ...config };
  if (merged.pad_token === undefined && typeof declaredPad === 'string') merged.pad_token = declaredPad;
  const tokenizer = new PreTrainedTokenizer(tokenizerJson, merged);
  const padId = tokenizer.pad_token_id;
  if (padId === undefined || padId === null) {
    throw new Error(
      'the tokenizer names no padding token: add "pad_token" (e.g. "[PAD]") to tokenizer_config.json beside tokenizer.json, or "padding": {"pad_token": ...} to tokenizer.json.',
    );
  }
  return {
    encode(sentences, maxTokens) {
      if (!Number.isInteger(maxTokens) || maxTokens < 2) {
        throw new RangeError(`'maxTokens' must be an integer >= 2; got ${maxTokens}`);
      }
      const rows = sentences.map((s, i) => encodeOne(tokenizer, s, maxTokens, i));
      const t = rows.reduce((m, r) => Math.max(m, r.length), 0);
      const ids = new BigInt64Array(rows.length * t).fill(BigInt(padId));
      const mask = new BigInt64Array(rows.length * t);
      rows.forEach((row, r) => {
        for (let j = 0; j < row.length; j++) {
          ids[r * t + j] = BigInt(row[j]);
          mask[r * t + j] = 1n;
        }
      });
      return { ids, mask, dims: [rows.length, t] as const };
    },
  };
}

function encodeOne(tokenizer: PreTrainedTokenizer, sentence: string, maxTokens: number, index: number): number[] {
  if (typeof sentence !== 'string') {
    throw new TypeError(`'sentences[${index}]' must be a string; got ${typeof sentence}`);
  }
  const full = tokenizer.encode(sentence);
  if (full.length <= maxTokens) return full;
  const words = tokenizer.encode(sentence, { add_special_tokens: false });
  const specials = full.length - words.length;
  if (specials >= maxTokens) {
    throw new RangeError(`max_tokens ${maxTokens} leaves no room for words after the tokenizer's ${specials} special tokens; raise text.max_tokens.`);
  }
  const start = findRun(full, words);
  if (start < 0) {
    throw new Error(
      `sentence ${index} has ${full.length} tokens, more than max_tokens ${maxTokens}, and the tokenizer's special tokens ` +
        'do not sit only before and after the words, so it cannot be truncated safely. Raise text.max_tokens or shorten the sentence.',
    );
  }
  const keep = maxTokens - specials;
  return [...full.slice(0, start), ...words.slice(0, keep), ...full.slice(start + words.length)];
}

function findRun(haystack: readonly number[], needle: readonly number[]): number {
  for (let s = 0; s + needle.length <= haystack.length; s++) {
    let ok = true;
    for (let j = 0; j < needle.length && ok; j++) ok = haystack[s + j] === needle[j];
    if (ok) return s;
  }
  return -1;
}
