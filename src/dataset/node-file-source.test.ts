import { describe, expect, it } from 'vitest';
import { mkdtempSync, readFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { createNodeFileSink, createNodeFileSource } from './node-file-source';

describe('node-file-source', () => {
  it('createNodeFileSink(dir).writeFile creates parent folders; createNodeFileSource reads it back', async () => {
    const dir = mkdtempSync(join(tmpdir(), 'tessera-fs-'));
    const sink = createNodeFileSink(dir);
    await sink.writeFile('a/b/c.txt', 'héllo');
    await sink.writeFile('img/x.bin', Uint8Array.of(1, 2, 3));
    expect(readFileSync(join(dir, 'a/b/c.txt'), 'utf8')).toBe('héllo');
    const source = createNodeFileSource(dir);
    expect(source.label).toBe(dir);
    expect(await source.readText('a/b/c.txt')).toBe('héllo');
    expect(Array.from(await source.readBytes('img/x.bin'))).toEqual([1, 2, 3]);
    expect(await source.exists('img/x.bin')).toBe(true);
    expect(await source.exists('img/missing.bin')).toBe(false);
  });

  it('createNodeFileSource(dir) refuses paths that escape the folder', async () => {
    const source = createNodeFileSource(mkdtempSync(join(tmpdir(), 'tessera-fs-')));
    await expect(source.readText('../etc/passwd')).rejects.toThrow(RangeError);
    await expect(source.exists('/etc/passwd')).rejects.toThrow(/relative/);
    await expect(createNodeFileSink('/tmp/x').writeFile('', 'a')).rejects.toThrow(TypeError);
  });
});
