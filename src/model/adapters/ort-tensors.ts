import type { InferenceSession, NamedTensor } from '../types';

/** The part of an onnxruntime tensor (web or node) that the adapters read. */
export interface OrtTensorLike {
  readonly type: string;
  readonly data: unknown;
  readonly dims: readonly number[];
}

/**
 * Copies an onnxruntime output tensor into a plain NamedTensor, so no library object (or its
 * WASM-backed memory) reaches the rest of the code. `where` names the graph and output for errors.
 */
export function toNamedTensor(t: OrtTensorLike, where: string): NamedTensor {
  const dims = Array.from(t.dims, Number);
  if (t.type === 'float32' && t.data instanceof Float32Array) return { type: 'float32', data: t.data.slice(), dims };
  if (t.type === 'int64' && t.data instanceof BigInt64Array) return { type: 'int64', data: t.data.slice(), dims };
  if (t.type === 'int32' && t.data instanceof Int32Array) return { type: 'int32', data: t.data.slice(), dims };
  throw new TypeError(`${where}: expected a float32, int64 or int32 tensor on the CPU; got type '${t.type}'. Export the graph with float32 outputs.`);
}

/** Checks a feed before it goes to the runtime: data length must equal the product of dims. */
export function checkFeed(name: string, t: NamedTensor): void {
  const n = t.dims.reduce((a, b) => a * b, 1);
  if (t.data.length !== n) {
    throw new RangeError(`feed '${name}' must hold ${n} values for dims [${t.dims.join(', ')}]; got ${t.data.length}`);
  }
}

/** The part of an onnxruntime session (web or node) that the adapters use. */
export interface OrtSessionLike<T> {
  readonly inputNames: readonly string[];
  readonly outputNames: readonly string[];
  run(feeds: Record<string, T>): Promise<Record<string, OrtTensorLike>>;
  release(): Promise<void>;
}

/**
 * Wraps an onnxruntime session behind the InferenceSession interface: feeds are checked and turned
 * into the runtime's tensors with `makeTensor`, outputs copied into plain NamedTensors.
 */
export function wrapOrtSession<T>(session: OrtSessionLike<T>, makeTensor: (t: NamedTensor) => T): InferenceSession {
  return {
    inputNames: [...session.inputNames],
    outputNames: [...session.outputNames],
    async run(feeds: Readonly<Record<string, NamedTensor>>) {
      const ortFeeds: Record<string, T> = {};
      for (const [name, t] of Object.entries(feeds)) {
        checkFeed(name, t);
        ortFeeds[name] = makeTensor(t);
      }
      const results = await session.run(ortFeeds);
      const out: Record<string, NamedTensor> = {};
      for (const [name, t] of Object.entries(results)) out[name] = toNamedTensor(t, `output '${name}'`);
      return out;
    },
    release: () => session.release(),
  };
}
