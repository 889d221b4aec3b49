// End-to-end support: the system Chromium through playwright-core (never a downloaded browser),
// and the app built and served by Vite's preview server on a free loopback port.
import { existsSync } from 'node:fs';
import { mkdir, mkdtemp, rm } from 'node:fs/promises';
import { createServer as createNetServer } from 'node:net';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { fileURLToPath } from 'node:url';
import { chromium, type BrowserContext } from 'playwright-core';
import { build, preview } from 'vite';

export const CHROMIUM = '/usr/bin/chromium';
export const REPO = fileURLToPath(new URL('../..', import.meta.url));
export const ARTIFACTS = join(REPO, 'tests/e2e/artifacts');

/** The flags every e2e browser runs with: headless, no sandbox, and nothing that calls out. */
export const CHROMIUM_ARGS = [
  '--headless',
  '--no-sandbox',
  '--disable-gpu',
  '--disable-quic',
  '--disable-background-networking',
  '--disable-component-update',
  '--disable-sync',
  '--no-first-run',
];

/**
 * Why the e2e tests cannot run here, or undefined when they can. Throws when CI=true, where a
 * missing browser is a failure rather than a skip.
 */
export function browserUnavailable(): string | undefined {
  if (existsSync(CHROMIUM)) return undefined;
  const reason = `e2e skipped: no Chromium at ${CHROMIUM} (install the Debian package "chromium")`;
  if (process.env.CI === 'true') throw new Error(`${reason}; CI=true, so this is a failure`);
  return reason;
}

export interface LaunchedBrowser {
  readonly context: BrowserContext;
  close(): Promise<void>;
}

/** Launches Chromium with a fresh profile (--user-data-dir, passed as Playwright's userDataDir). */
export async function launchBrowser(): Promise<LaunchedBrowser> {
  const profile = await mkdtemp(join(tmpdir(), 'tessera-e2e-profile-'));
  const context = await chromium.launchPersistentContext(profile, {
    executablePath: CHROMIUM,
    headless: true,
    args: CHROMIUM_ARGS,
    viewport: { width: 1280, height: 900 },
  });
  return {
    context,
    async close() {
      await context.close();
      await rm(profile, { recursive: true, force: true });
    },
  };
}

/** A free TCP port on 127.0.0.1. */
export function freePort(): Promise<number> {
  return new Promise((resolve, reject) => {
    const srv = createNetServer();
    srv.once('error', reject);
    srv.listen(0, '127.0.0.1', () => {
      const address = srv.address();
      const port = typeof address === 'object' && address ? address.port : 0;
      srv.close(() => resolve(port));
    });
  });
}

export interface ServedApp {
  readonly url: string;
  close(): Promise<void>;
}

/** Builds the app into a temporary folder and serves it with `vite preview` (the COOP/COEP headers included). */
export async function buildAndPreview(): Promise<ServedApp> {
  const outDir = await mkdtemp(join(tmpdir(), 'tessera-e2e-dist-'));
  await build({ root: REPO, logLevel: 'warn', build: { outDir, emptyOutDir: true } });
  const port = await freePort();
  const server = await preview({ root: REPO, logLevel: 'warn', build: { outDir }, preview: { host: '127.0.0.1', port, strictPort: true } });
  return {
    url: `http://127.0.0.1:${port}/`,
    async close() {
      await new Promise<void>((resolve, reject) => server.httpServer.close((err) => (err ? reject(err) : resolve())));
      await rm(outDir, { recursive: true, force: true });
    },
  };
}

export async function artifactPath(name: string): Promise<string> {
  await mkdir(ARTIFACTS, { recursive: true });
  return join(ARTIFACTS, name);
}
