import { describe, expect, it } from 'vitest';
import { readFile } from 'node:fs/promises';
import { join } from 'node:path';
import type { FileSink, SampleSetManifest } from '../dataset/types';
import { writePhantomSet } from './write-phantom-set';

const DIR = join(__dirname, '../../samples/phantom');

describe('samples/phantom', () => {
  it('samples/phantom is marked synthetic and its first studies match a fresh run of its README command', async () => {
    const manifest = JSON.parse(await readFile(join(DIR, 'set.json'), 'utf8')) as SampleSetManifest;
    expect(manifest.synthetic).toBe(true);
    expect(manifest.studies).toHaveLength(48);
    const readme = await readFile(join(DIR, 'README.md'), 'utf8');
    expect(readme).toContain('npm run tessera -- phantom --n 48 --seed 2026 --out samples/phantom --size 448 --format mixed');
    // Study i does not depend on n, so the first five (one of them 16-bit) can be regenerated cheaply.
    const files = new Map<string, Uint8Array | string>();
    const sink: FileSink = { writeFile: async (path, data) => void files.set(path, data) };
    await writePhantomSet({ n: 5, seed: 2026, size: 448, format: 'mixed' }, sink);
    for (let i = 1; i <= 5; i++) {
      const path = `images/phantom-000${i}.png`;
      const committed = await readFile(join(DIR, path));
      expect(committed.equals(Buffer.from(files.get(path) as Uint8Array)), `${path} differs: regenerate samples/phantom`).toBe(true);
    }
    const fresh = JSON.parse(files.get('set.json') as string) as SampleSetManifest;
    expect(fresh.studies).toEqual(manifest.studies.slice(0, 5));
    // The committed reference boxes are the generator's too (a change to how boxes are derived
    // from the masks must regenerate the set).
    const ids = new Set(fresh.studies.map((s) => s.id));
    const boxesOf = (text: string): unknown[] => (JSON.parse(text) as { boxes: { study: string }[] }).boxes.filter((b) => ids.has(b.study));
    const committedBoxes = boxesOf(await readFile(join(DIR, 'annotations.json'), 'utf8'));
    expect(committedBoxes.length).toBeGreaterThan(5);
    expect(boxesOf(files.get('annotations.json') as string), 'annotations.json differs: regenerate samples/phantom').toEqual(committedBoxes);
  }, 60_000);
});
