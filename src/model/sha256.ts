/** sha256 of bytes as 64 lower-case hex digits, via Web Crypto (browsers and Node >= 20). */
export async function sha256Hex(bytes: Uint8Array): Promise<string> {
  const subtle = globalThis.crypto?.subtle;
  if (subtle === undefined) {
    throw new Error('Web Crypto (crypto.subtle) is not available: open the page over https or localhost, or use Node 20 or later.');
  }
  // Copy into a fresh ArrayBuffer: digest rejects views over a SharedArrayBuffer.
  const digest = await subtle.digest('SHA-256', bytes.slice().buffer as ArrayBuffer);
  return Array.from(new Uint8Array(digest), (b) => b.toString(16).padStart(2, '0')).join('');
}

/** sha256 of a UTF-8 string as hex. */
export function sha256HexOfText(text: string): Promise<string> {
  return sha256Hex(new TextEncoder().encode(text));
}
