const HEX = /^[0-9a-f]{8,128}$/;
const PLAIN_TAG = /^[A-Za-z0-9_]{1,40}$/;

/**
 * The key of one cached embedding: model content hash + image content hash + a preprocessing tag
 * (e.g. preprocessingTag(input, window), or any short name). Safe as a file name and an IndexedDB key.
 * Both hashes must be lower-case hex; a tag outside [A-Za-z0-9_]{1,40} is replaced by its FNV-1a 64-bit hash.
 */
export function embeddingCacheKey(modelHash: string, imageContentHash: string, preprocessingTag: string): string {
  if (!HEX.test(modelHash)) throw new TypeError(`'modelHash' must be lower-case hex (8-128 digits); got '${modelHash}'`);
  if (!HEX.test(imageContentHash)) throw new TypeError(`'imageContentHash' must be lower-case hex (8-128 digits); got '${imageContentHash}'`);
  if (typeof preprocessingTag !== 'string' || preprocessingTag === '') {
    throw new TypeError(`'preprocessingTag' must be a non-empty string; got '${String(preprocessingTag)}'`);
  }
  const tag = PLAIN_TAG.test(preprocessingTag) ? preprocessingTag : `h${fnv1a64(preprocessingTag)}`;
  return `m${modelHash}-i${imageContentHash}-p${tag}`;
}

/** FNV-1a 64-bit hash of the UTF-8 bytes of a string, as 16 hex digits (Fowler, Noll, Vo). */
export function fnv1a64(text: string): string {
  const prime = 0x100000001b3n;
  const mask = 0xffffffffffffffffn;
  let h = 0xcbf29ce484222325n;
  for (const b of new TextEncoder().encode(text)) {
    h ^= BigInt(b);
    h = (h * prime) & mask;
  }
  return h.toString(16).padStart(16, '0');
}
