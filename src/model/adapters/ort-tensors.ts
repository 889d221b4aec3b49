import type { NamedTensor } from '../types';

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
