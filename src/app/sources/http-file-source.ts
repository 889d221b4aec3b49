import type { FileSource } from '../../dataset/types';
import { pathSegments } from './source-path';

export interface HttpSourceOptions {
  readonly fetch?: typeof globalThis.fetch;
  readonly label?: string;
}

/**
 * A FileSource over a folder the page itself serves (the bundled demo): files are fetched from
 * `baseUrl` + path, which must be on the page's origin, so nothing leaves the machine.
 */
export function createHttpFileSource(baseUrl: string, { fetch = globalThis.fetch.bind(globalThis), label }: HttpSourceOptions = {}): FileSource {
  const base = new URL(baseUrl.endsWith('/') ? baseUrl : `${baseUrl}/`, globalThis.location?.href);
  const origin = globalThis.location?.origin;
  if (origin !== undefined && origin !== 'null' && base.origin !== origin) {
    throw new RangeError(`'baseUrl' must be on the page's own origin ${origin}; got '${baseUrl}'`);
  }
  const shown = label ?? base.pathname.replace(/\/$/, '');
  const urlOf = (path: string): string => new URL(pathSegments(path).map(encodeURIComponent).join('/'), base).href;
  async function get(path: string): Promise<Response> {
    const url = urlOf(path);
    let res: Response;
    try {
      res = await fetch(url);
    } catch (cause) {
      throw new Error(`${shown}/${path}: the page could not read the file (${(cause as Error).message}); reload the page, or restart the server that serves it.`, { cause });
    }
    if (!res.ok) {
      throw new Error(`${shown}/${path}: the page's server answered ${res.status} ${res.statusText}; check that the file is part of the build (npm run build copies the demo folders).`);
    }
    return res;
  }
  return {
    label: shown,
    readBytes: async (path) => new Uint8Array(await (await get(path)).arrayBuffer()),
    readText: async (path) => (await get(path)).text(),
    async exists(path) {
      const res = await fetch(urlOf(path), { method: 'HEAD' });
      return res.ok;
    },
  };
}
