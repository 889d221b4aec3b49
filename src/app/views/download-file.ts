import type { FileSink } from '../../dataset/types';

const TYPES: Readonly<Record<string, string>> = {
  json: 'application/json',
  csv: 'text/csv',
  md: 'text/markdown',
  tex: 'application/x-tex',
  png: 'image/png',
  jsonl: 'application/jsonl',
};

/** Offers bytes or text to the researcher as a file download (nothing leaves the machine). */
export function downloadFile(name: string, data: Uint8Array | string): void {
  const ext = name.slice(name.lastIndexOf('.') + 1);
  const part: BlobPart = typeof data === 'string' ? data : new Uint8Array(data);
  const url = URL.createObjectURL(new Blob([part], { type: TYPES[ext] ?? 'application/octet-stream' }));
  const a = document.createElement('a');
  a.href = url;
  a.download = name.split('/').pop() ?? name;
  document.body.appendChild(a);
  a.click();
  a.remove();
  // The click has handed the URL to the browser's download; release it on the next turn.
  setTimeout(() => URL.revokeObjectURL(url), 0);
}

/** A FileSink that keeps written files in memory, so src/batch writeScoreOutputs feeds the page's downloads. */
export function createMemorySink(): FileSink & { readonly files: Map<string, Uint8Array | string> } {
  const files = new Map<string, Uint8Array | string>();
  return {
    files,
    writeFile(path, data) {
      files.set(path, data);
      return Promise.resolve();
    },
  };
}
