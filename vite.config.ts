import { existsSync, readdirSync, readFileSync, statSync } from 'node:fs';
import { extname, join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { defineConfig, type Plugin } from 'vitest/config';
import react from '@vitejs/plugin-react';

const ROOT = fileURLToPath(new URL('.', import.meta.url));

// Cross-origin isolation lets onnxruntime-web use WASM threads (SharedArrayBuffer).
const isolationHeaders = {
  'Cross-Origin-Opener-Policy': 'same-origin',
  'Cross-Origin-Embedder-Policy': 'require-corp',
};

/** The runtime files the page loads, served from our build under /ort/ (never a CDN). */
const ORT_DIR = join(ROOT, 'node_modules/onnxruntime-web/dist');
const ORT_FILES = ['ort-wasm-simd-threaded.wasm', 'ort-wasm-simd-threaded.mjs'];

/**
 * The bundled demo: the demo models that exist (tests/fixtures/tiny-model until one does) and
 * samples/phantom, as URL folder -> disk folder. Read at server start and at build time.
 */
function demoFolders(): { models: Record<string, string>; sets: Record<string, string> } {
  const models: Record<string, string> = {};
  for (const name of ['demo-local', 'demo-global', 'demo-widefield', 'demo-local-int8']) {
    const dir = join(ROOT, 'models', name);
    if (existsSync(join(dir, 'tessera-model.json'))) models[name] = dir;
  }
  if (Object.keys(models).length === 0) models['tiny-model'] = join(ROOT, 'tests/fixtures/tiny-model');
  const sets: Record<string, string> = {};
  if (existsSync(join(ROOT, 'samples/phantom/set.json'))) sets.phantom = join(ROOT, 'samples/phantom');
  return { models, sets };
}

/** Files of a model folder the page reads: the manifest, the files it names, the tokenizer config. */
function modelFiles(dir: string): string[] {
  const m = JSON.parse(readFileSync(join(dir, 'tessera-model.json'), 'utf8')) as { image: { file: string }; text: { file: string; tokenizer: string } };
  const tokDir = m.text.tokenizer.includes('/') ? m.text.tokenizer.slice(0, m.text.tokenizer.lastIndexOf('/') + 1) : '';
  return ['tessera-model.json', m.image.file, m.text.file, m.text.tokenizer, `${tokDir}tokenizer_config.json`].filter((f) => existsSync(join(dir, f)));
}

function filesBelow(dir: string, prefix = ''): string[] {
  return readdirSync(dir).flatMap((name) => {
    if (name.startsWith('.')) return [];
    const full = join(dir, name);
    return statSync(full).isDirectory() ? filesBelow(full, `${prefix}${name}/`) : [`${prefix}${name}`];
  });
}

/** URL path (under the base) -> file on disk, for every file the demo serves. */
function demoFileMap(): Map<string, string> {
  const { models, sets } = demoFolders();
  const map = new Map<string, string>();
  map.set('demo/catalogue.json', '');
  for (const [name, dir] of Object.entries(models)) for (const f of modelFiles(dir)) map.set(`demo/models/${name}/${f}`, join(dir, f));
  for (const [name, dir] of Object.entries(sets)) for (const f of filesBelow(dir)) map.set(`demo/samples/${name}/${f}`, join(dir, f));
  for (const f of ORT_FILES) map.set(`ort/${f}`, join(ORT_DIR, f));
  return map;
}

function catalogueJson(): string {
  const { models, sets } = demoFolders();
  return `${JSON.stringify({ models: Object.keys(models), sets: Object.keys(sets) }, null, 2)}\n`;
}

const CONTENT_TYPES: Record<string, string> = {
  '.json': 'application/json', '.png': 'image/png', '.jpg': 'image/jpeg', '.jpeg': 'image/jpeg', '.dcm': 'application/dicom',
  '.wasm': 'application/wasm', '.mjs': 'text/javascript', '.onnx': 'application/octet-stream', '.md': 'text/markdown',
};

/** Serves the demo and the runtime files in dev, and copies them into the build output. */
function demoAssets(): Plugin {
  let base = '/';
  return {
    name: 'tessera-demo-assets',
    configResolved(config) {
      base = config.base;
    },
    configureServer(server) {
      server.middlewares.use((req, res, next) => {
        const url = decodeURIComponent((req.url ?? '').split('?')[0]);
        if (!url.startsWith(`${base}demo/`) && !url.startsWith(`${base}ort/`)) return next();
        const rel = url.slice(base.length);
        // Read per request, so a demo model added while the server runs is served.
        const file = demoFileMap().get(rel);
        const send = (status: number, body: Buffer | string, type: string): void => {
          res.statusCode = status;
          res.setHeader('Content-Type', type);
          for (const [k, v] of Object.entries(isolationHeaders)) res.setHeader(k, v);
          res.setHeader('Cross-Origin-Resource-Policy', 'same-origin');
          res.setHeader('Cache-Control', 'no-cache');
          res.end(req.method === 'HEAD' ? undefined : body);
        };
        // Only files listed in the map are served, so no path can reach outside the demo folders.
        if (file === undefined) {
          send(404, `not part of the demo: ${rel}`, 'text/plain');
          return;
        }
        if (file === '') send(200, catalogueJson(), 'application/json');
        else send(200, readFileSync(file), CONTENT_TYPES[extname(file)] ?? 'application/octet-stream');
      });
    },
    generateBundle() {
      for (const [rel, file] of demoFileMap()) {
        this.emitFile({ type: 'asset', fileName: rel, source: file === '' ? catalogueJson() : readFileSync(file) });
      }
    },
  };
}

/**
 * The runtime's fallback `new URL('ort-wasm-simd-threaded.wasm', import.meta.url)` would make the
 * bundler emit a second 14 MB copy of the file we already serve under /ort/; wasmPaths is always
 * set (src/app/inference/inference-worker.ts), so the fallback is left as a plain runtime URL.
 */
function ortSingleWasm(): Plugin {
  return {
    name: 'tessera-ort-single-wasm',
    transform(code, id) {
      if (!/onnxruntime-web[\\/]dist[\\/]ort\.[a-z.]*\.mjs$/.test(id.split('?')[0])) return null;
      return { code: code.replaceAll('new URL("ort-wasm-simd-threaded.wasm",import.meta.url)', 'new URL("ort-wasm-simd-threaded.wasm",""+import.meta.url)'), map: null };
    },
  };
}

export default defineConfig({
  plugins: [react(), demoAssets(), ortSingleWasm()],
  resolve: {
    // transformers.js (tokenizer only here) shares the page's one onnxruntime-web copy, instead of
    // pulling in a second runtime whose defaults point at a CDN.
    alias: [{ find: /^onnxruntime-web\/webgpu$/, replacement: 'onnxruntime-web/wasm' }],
  },
  // No fallback to index.html: a missing demo file must answer 404, not a page.
  appType: 'mpa',
  server: { headers: isolationHeaders },
  preview: { headers: isolationHeaders },
  optimizeDeps: { exclude: ['onnxruntime-web'] },
  worker: { format: 'es', plugins: () => [ortSingleWasm()] },
  test: {
    projects: [
      {
        extends: true,
        test: {
          name: 'core',
          environment: 'node',
          include: [
            'src/core/**/*.test.ts',
            'src/report/**/*.test.ts',
            'src/dataset/**/*.test.ts',
            'src/phantom/**/*.test.ts',
            'src/batch/**/*.test.ts',
          ],
        },
      },
      {
        extends: true,
        test: { name: 'app', environment: 'jsdom', include: ['src/app/**/*.test.{ts,tsx}'], testTimeout: 30_000 },
      },
      {
        extends: true,
        test: {
          name: 'inference',
          environment: 'node',
          include: ['src/model/**/*.test.ts'],
          testTimeout: 60_000,
        },
      },
      {
        extends: true,
        test: { name: 'cli', environment: 'node', include: ['tests/cli/**/*.test.ts'], testTimeout: 300_000, hookTimeout: 300_000 },
      },
      {
        extends: true,
        test: {
          name: 'e2e',
          environment: 'node',
          include: ['tests/e2e/**/*.test.ts'],
          testTimeout: 300_000,
          hookTimeout: 300_000,
          fileParallelism: false,
        },
      },
    ],
  },
});
