import { describe, expect, it } from 'vitest';
import { cp, mkdtemp, readFile, rm, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { runCli } from './run-cli';

describe('tessera inspect', () => {
  it('inspect --model passes on the fixture model and reports shapes', async () => {
    const r = await runCli(['inspect', '--model', 'tests/fixtures/tiny-model']);
    expect(r.code, r.stderr + r.stdout).toBe(0);
    expect(r.stdout).toMatch(/7/);
    expect(r.stdout.toLowerCase()).toMatch(/ok|pass/);
  });

  it('inspect --model exits 2 and names the field when the manifest breaks the contract', async () => {
    const dir = await mkdtemp(join(tmpdir(), 'tessera-inspect-'));
    try {
      await cp('tests/fixtures/tiny-model', dir, { recursive: true });
      const manifest = JSON.parse(await readFile(join(dir, 'tessera-model.json'), 'utf8')) as { embedding_dim: number };
      manifest.embedding_dim = 999;
      await writeFile(join(dir, 'tessera-model.json'), JSON.stringify(manifest));
      const r = await runCli(['inspect', '--model', dir]);
      expect(r.code).toBe(2);
      expect(r.stdout + r.stderr).toMatch(/embedding_dim/);
    } finally {
      await rm(dir, { recursive: true, force: true });
    }
  });
});
