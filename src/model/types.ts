import type { ResizePolicy } from '../core/types';

export const MODEL_SCHEMA = 'tessera.model/1';

/** tessera-model.json, the manifest of a model folder (the model contract). */
export interface ModelManifest {
  readonly schema: typeof MODEL_SCHEMA;
  readonly id: string;
  readonly description?: string;
  readonly synthetic_demo?: boolean;
  readonly image: {
    readonly file: string; // e.g. 'image-encoder.onnx'
    readonly input: {
      readonly name: string;
      readonly channels: 1 | 3;
      readonly height: number;
      readonly width: number;
      /** Intensities are first mapped to [0, 1] (window or bit depth), then multiplied by scale. */
      readonly scale: number;
      readonly mean: readonly number[]; // one per channel
      readonly std: readonly number[]; // one per channel
      readonly resize: ResizePolicy;
      readonly pad_value?: number; // in [0, 1] units, for letterbox; default 0
    };
    readonly output: {
      readonly name: string;
      readonly layout: 'BDHW' | 'BND'; // [B, D, h, w] or [B, h*w, D]
      readonly grid: { readonly h: number; readonly w: number };
    };
    readonly receptive_field_px?: number; // in input pixels, for the reader's information
  };
  readonly text: {
    readonly file: string; // e.g. 'text-encoder.onnx'
    readonly tokenizer: string; // e.g. 'tokenizer.json'
    readonly input: { readonly ids: string; readonly mask: string; readonly type_ids?: string };
    readonly max_tokens: number;
    readonly output: {
      readonly name: string;
      readonly kind: 'sentence' | 'tokens'; // [B, D] or [B, T, D]
      readonly pooling?: 'cls' | 'mean'; // required when kind is 'tokens'
    };
  };
  readonly embedding_dim: number;
  readonly similarity: 'cosine';
  readonly temperature?: number;
  /** sha256 hex of each file named above, keyed by file name. */
  readonly hashes?: Readonly<Record<string, string>>;
}

/** A tensor crossing the inference interface. */
export interface NamedTensor {
  readonly type: 'float32' | 'int64' | 'int32';
  readonly data: Float32Array | BigInt64Array | Int32Array;
  readonly dims: readonly number[];
}

/** One loaded ONNX graph. */
export interface InferenceSession {
  readonly inputNames: readonly string[];
  readonly outputNames: readonly string[];
  run(feeds: Readonly<Record<string, NamedTensor>>): Promise<Record<string, NamedTensor>>;
  release(): Promise<void>;
}

/** A runtime that turns ONNX bytes into sessions (onnxruntime-web or onnxruntime-node). */
export interface InferenceEngine {
  readonly name: string;
  createSession(model: Uint8Array, options?: { readonly threads?: number }): Promise<InferenceSession>;
}

/** Turns sentences into token ids; implemented over transformers.js, read offline from tokenizer.json. */
export interface SentenceTokenizer {
  encode(
    sentences: readonly string[],
    maxTokens: number,
  ): { readonly ids: BigInt64Array; readonly mask: BigInt64Array; readonly dims: readonly [number, number] };
}

/** Embedding cache keyed by model hash and content hash (IndexedDB in the browser, disk in the CLI). */
export interface EmbeddingCache {
  get(key: string): Promise<Float32Array | undefined>;
  set(key: string, value: Float32Array): Promise<void>;
}
