import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { mkdtemp, readdir, readFile, rm } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { runPhantom } from '../../src/cli/commands/phantom';
import { runCli } from './run-cli';

let root: string;

function capture(): { io: { stdout: (s: string) => void; stderr: (s: string) => void }; out: string[]; err: string[] } {
  const out: string[] = [], err: string[] = [];
  return { io: { stdout: (s) => void out.push(s), stderr: (s) => void err.push(s) }, out, err };
}

beforeAll(async () => {
  root = await mkdtemp(join(tmpdir(), 'tessera-phantom-'));
});

afterAll(async () => {
  await rm(root, { recursive: true, force: true });
});

describe('tessera phantom', () => {
  it('runPhantom(--n 4 --seed 3 --out DIR --size 128) writes a sample set and reports progress on stderr', async () => {
    const out = join(root, 'set-a');
    const c = capture();
    const code = await runPhantom(['--n', '4', '--seed', '3', '--out', out, '--size', '128'], c.io);
    expect(code).toBe(0);
    expect((await readdir(out)).sort()).toEqual(['annotations.json', 'images', 'set.json']);
    expect(await readdir(join(out, 'images'))).toHaveLength(4);
    expect(c.err.some((l) => l.includes('4/4'))).toBe(true);
    expect(c.out.join('\n')).toMatch(/wrote 4 synthetic studies/);
    const set = JSON.parse(await readFile(join(out, 'set.json'), 'utf8')) as { schema: string; synthetic: boolean };
    expect(set.schema).toBe('tessera.set/1');
    expect(set.synthetic).toBe(true);
  });

  it('runPhantom with --format dcm --masks writes DICOM files and mask images', async () => {
    const out = join(root, 'set-dcm');
    const code = await runPhantom(['--n', '2', '--seed', '1', '--out', out, '--size', '128', '--format', 'dcm', '--masks'], capture().io);
    expect(code).toBe(0);
    expect((await readdir(join(out, 'images'))).sort()).toEqual(['phantom-0001.dcm', 'phantom-0002.dcm']);
    expect((await readdir(join(out, 'masks'))).sort()).toEqual(['phantom-0001.png', 'phantom-0002.png']);
  });

  it('runPhantom rejects n < 1, size < 128, an unknown format and a missing --out with one line and exit code 2', async () => {
    const cases: [string[], RegExp][] = [
      [['--n', '0', '--seed', '1', '--out', join(root, 'x')], /--n must be an integer in \[1, /],
      [['--n', '2', '--seed', '1', '--out', join(root, 'x'), '--size', '100'], /--size must be an integer in \[128, 2048\]; got '100'/],
      [['--n', '2', '--seed', '1', '--out', join(root, 'x'), '--format', 'jpg'], /--format must be one of png, dcm, mixed; got 'jpg'/],
      [['--n', '2', '--seed', '1'], /--out is required/],
      [['--seed', '1', '--out', join(root, 'x')], /--n is required/],
      [['--n', 'many', '--out', join(root, 'x')], /--n must be an integer/],
    ];
    for (const [argv, message] of cases) {
      const c = capture();
      expect(await runPhantom(argv, c.io)).toBe(2);
      expect(c.err).toHaveLength(1);
      expect(c.err[0]).toMatch(message);
      expect(c.err[0]).not.toContain('\n');
    }
  });

  it('tessera phantom run as a process gives byte-identical sets for one seed, and exit code 2 for bad input', async () => {
    const a = join(root, 'proc-a'), b = join(root, 'proc-b');
    for (const out of [a, b]) {
      const r = await runCli(['phantom', '--n', '3', '--seed', '42', '--out', out, '--size', '128', '--format', 'mixed']);
      expect(r.code, r.stderr).toBe(0);
    }
    for (const file of ['set.json', 'annotations.json', 'images/phantom-0001.png', 'images/phantom-0002.png', 'images/phantom-0003.png']) {
      expect((await readFile(join(a, file))).equals(await readFile(join(b, file))), file).toBe(true);
    }
    const bad = await runCli(['phantom', '--n', '0', '--seed', '1', '--out', join(root, 'never')]);
    expect(bad.code).toBe(2);
    expect(bad.stderr.trim().split('\n')).toHaveLength(1);
  });
});
