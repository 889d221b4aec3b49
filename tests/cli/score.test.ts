import { afterAll, beforeAll, describe, expect, it } from 'vitest';
import { cp, mkdtemp, readFile, readdir, rm, writeFile } from 'node:fs/promises';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { spawn } from 'node:child_process';
import { runCli } from './run-cli';

const MODEL = 'tests/fixtures/tiny-model';
let root: string;
let set: string;

async function readJson<T>(path: string): Promise<T> {
  return JSON.parse(await readFile(path, 'utf8')) as T;
}

interface SummaryJson {
  schema: string;
  models: { id: string; aggregator: string; hit_rule: string; grounding: { n: number; hits: number; rate: number; wilson95: number[]; bootstrap95: number[]; chance: number }; by_zone: Record<string, unknown>; by_finding: Record<string, unknown>; laterality_swap_rate: number | null; retrieval: Record<string, number> }[];
  comparisons: { a: string; b: string; n_pairs: number; diff: number; bootstrap95: number[]; mcnemar_p: number }[];
  skipped: { study: string; reason: string }[];
}

beforeAll(async () => {
  root = await mkdtemp(join(tmpdir(), 'tessera-cli-'));
  set = join(root, 'set');
  const r = await runCli(['phantom', '--n', '8', '--seed', '77', '--out', set, '--size', '160']);
  expect(r.code, r.stderr).toBe(0);
});

afterAll(async () => {
  await rm(root, { recursive: true, force: true });
});

describe('tessera score', () => {
  it('score --dump-similarity writes every output file of the design with the summary fields', async () => {
    const out = join(root, 'out-full');
    const r = await runCli(['score', '--model', MODEL, '--set', set, '--out', out, '--dump-similarity', '--no-cache']);
    expect(r.code, r.stderr).toBe(0);
    const files = await readdir(out);
    for (const f of ['summary.json', 'sentences.csv', 'summary.csv', 'tables.md', 'tables.tex', 'similarity.jsonl', 'figures']) expect(files).toContain(f);
    expect((await readdir(join(out, 'figures'))).some((f) => f.endsWith('.png'))).toBe(true);
    const s = await readJson<SummaryJson>(join(out, 'summary.json'));
    expect(s.schema).toBe('tessera.summary/1');
    const m = s.models[0];
    expect(m.hit_rule).toBe('centre');
    expect(m.aggregator).toBe('max');
    expect(m.grounding.n).toBeGreaterThan(0);
    expect(m.grounding.hits).toBeLessThanOrEqual(m.grounding.n);
    expect(m.grounding.wilson95[0]).toBeLessThanOrEqual(m.grounding.rate);
    expect(m.grounding.wilson95[1]).toBeGreaterThanOrEqual(m.grounding.rate);
    expect(m.grounding.chance).toBeGreaterThan(0);
    expect(Object.keys(m.by_zone).length).toBeGreaterThan(0);
    for (const k of ['image_to_report_r1', 'image_to_report_r5', 'report_to_image_r1', 'report_to_image_r5']) expect(typeof m.retrieval[k]).toBe('number');
    const lines = (await readFile(join(out, 'similarity.jsonl'), 'utf8')).trim().split('\n');
    const first = JSON.parse(lines[0]) as { grid: { h: number; w: number }; values: number[]; cells: number[][]; boxes: number[][] };
    expect(first.values.length).toBe(first.grid.h * first.grid.w);
    expect(first.cells.length).toBe(first.grid.h * first.grid.w);
    const csv = (await readFile(join(out, 'sentences.csv'), 'utf8')).trim().split('\n');
    expect(csv.length - 1).toBe(lines.length);
    expect((await readFile(join(out, 'tables.tex'), 'utf8'))).toContain('\\toprule');
  });

  it('score gives byte-identical summary.json for the same inputs and seed, and two models are compared', async () => {
    const a = join(root, 'det-a');
    const b = join(root, 'det-b');
    const args = ['score', '--model', MODEL, '--model', 'tests/fixtures/tiny-model-bnd', '--set', set, '--seed', '5'];
    const ra = await runCli([...args, '--out', a, '--no-cache']);
    const rb = await runCli([...args, '--out', b, '--cache', join(root, 'cache')]);
    expect(ra.code, ra.stderr).toBe(0);
    expect(rb.code, rb.stderr).toBe(0);
    expect(rb.stderr).toMatch(/image embeddings: 16 encoded, 0 read from the cache/);
    // A second run over the same set reads every image embedding from the cache.
    const rc = await runCli([...args, '--out', join(root, 'det-c'), '--cache', join(root, 'cache')]);
    expect(rc.stderr).toMatch(/image embeddings: 0 encoded, 16 read from the cache/);
    expect(await readFile(join(root, 'det-c', 'summary.json'), 'utf8')).toBe(await readFile(join(a, 'summary.json'), 'utf8'));
    const sa = await readFile(join(a, 'summary.json'), 'utf8');
    expect(await readFile(join(b, 'summary.json'), 'utf8')).toBe(sa);
    const s = JSON.parse(sa) as SummaryJson;
    expect(s.models.length).toBe(2);
    expect(s.comparisons.length).toBe(1);
    expect(s.comparisons[0].n_pairs).toBe(s.models[0].grounding.n);
    expect(s.comparisons[0].mcnemar_p).toBeGreaterThan(0);
  });

  it('score --shard K/N then merge writes the same files as one run', async () => {
    const whole = join(root, 'whole');
    const base = ['score', '--model', MODEL, '--set', set, '--dump-similarity', '--no-cache'];
    expect((await runCli([...base, '--out', whole])).code).toBe(0);
    const r1 = await runCli([...base, '--shard', '1/2', '--out', join(root, 'sh1')]);
    const r2 = await runCli([...base, '--shard', '2/2', '--out', join(root, 'sh2')]);
    expect(r1.code, r1.stderr).toBe(0);
    expect(r2.code, r2.stderr).toBe(0);
    const merged = join(root, 'merged');
    const rm2 = await runCli(['merge', join(root, 'sh1'), join(root, 'sh2'), '--out', merged]);
    expect(rm2.code, rm2.stderr).toBe(0);
    for (const f of ['summary.json', 'sentences.csv', 'summary.csv', 'tables.md', 'tables.tex', 'similarity.jsonl']) {
      expect(await readFile(join(merged, f), 'utf8'), f).toBe(await readFile(join(whole, f), 'utf8'));
    }
    const incomplete = await runCli(['merge', join(root, 'sh1'), '--out', join(root, 'merged-bad')]);
    expect(incomplete.code).not.toBe(0);
    expect(incomplete.stderr).toMatch(/in no shard/);
  });

  it('score on a damaged set names each bad item on one line, scores the rest and lists the skipped', async () => {
    const bad = join(root, 'bad');
    await cp(set, bad, { recursive: true });
    const manifest = JSON.parse(await readFile(join(bad, 'set.json'), 'utf8')) as { studies: { id: string; image: string; report: string }[] };
    const ann = JSON.parse(await readFile(join(bad, 'annotations.json'), 'utf8')) as { boxes: { study: string; box: { x: number; y: number; w: number; h: number }; sentence: { text: string } }[] };
    const [s0, s1, s2, s3] = manifest.studies;
    await rm(join(bad, s0.image)); // missing image
    await writeFile(join(bad, s1.image), (await readFile(join(bad, s1.image))).subarray(0, 60)); // truncated image
    s2.report = '   '; // empty report
    manifest.studies.push({ ...s3 }); // duplicate id
    const others = ann.boxes.filter((b) => ![s0.id, s1.id, s2.id, s3.id].includes(b.study));
    if (others[2]) others[2].box = { x: 9000, y: 9000, w: 10, h: 10 }; // outside the image
    if (others[0]) others[0].box = { ...others[0].box, w: 0 }; // zero area
    // Stale: the report is edited after the box was drawn on one of its sentences.
    const edited = others[1] ? manifest.studies.find((st) => st.id === others[1].study) : undefined;
    if (edited && others[1]) edited.report = edited.report.replace(others[1].sentence.text, 'An edited sentence that says something else.');
    await writeFile(join(bad, 'set.json'), JSON.stringify(manifest));
    await writeFile(join(bad, 'annotations.json'), JSON.stringify(ann));
    const out = join(root, 'bad-out');
    const r = await runCli(['score', '--model', MODEL, '--set', bad, '--out', out, '--no-cache']);
    expect(r.code, r.stderr).toBe(0);
    expect(r.stderr).toMatch(new RegExp(`${s0.image}`));
    expect(r.stderr).toMatch(/more than once|duplicate/i);
    expect(r.stderr).toMatch(/empty|no report sentences/i);
    expect(r.stderr).toMatch(/outside/i);
    expect(r.stderr).toMatch(/zero|area/i);
    expect(r.stderr).toMatch(/was drawn on .* but sentence \d+ now reads/);
    const s = await readJson<SummaryJson>(join(out, 'summary.json'));
    const skipped = s.skipped.map((x) => x.study);
    for (const id of [s0.id, s1.id, s2.id]) expect(skipped).toContain(id);
    expect(s.models[0].grounding.n).toBeGreaterThan(0);
  });

  it('score exits 1 when nothing could be scored and 2 on a model that breaks the contract', async () => {
    const empty = join(root, 'nothing');
    await cp(set, empty, { recursive: true });
    const manifest = JSON.parse(await readFile(join(empty, 'set.json'), 'utf8')) as { studies: { report: string }[] };
    for (const st of manifest.studies) st.report = '';
    await writeFile(join(empty, 'set.json'), JSON.stringify(manifest));
    const r = await runCli(['score', '--model', MODEL, '--set', empty, '--out', join(root, 'nothing-out'), '--no-cache']);
    expect(r.code).toBe(1);
    const broken = join(root, 'broken-model');
    await cp(MODEL, broken, { recursive: true });
    await rm(join(broken, 'text-encoder.onnx'));
    const rb = await runCli(['score', '--model', broken, '--set', set, '--out', join(root, 'broken-out')]);
    expect(rb.code).toBe(2);
    expect(rb.stderr).toMatch(/text-encoder\.onnx/);
  });

  it('score stops cleanly on Ctrl-C (SIGINT): exit 130 and no outputs written', async () => {
    const big = join(root, 'big');
    const made = await runCli(['phantom', '--n', '60', '--seed', '78', '--out', big, '--size', '256']);
    expect(made.code, made.stderr).toBe(0);
    const out = join(root, 'interrupted');
    const child = spawn(process.execPath, ['--import', 'tsx', 'src/cli/main.ts', 'score', '--model', MODEL, '--set', big, '--out', out, '--no-cache'], { stdio: ['ignore', 'pipe', 'pipe'] });
    let stderr = '';
    const code = await new Promise<number>((done) => {
      child.stderr.on('data', (d: Buffer) => {
        stderr += d.toString();
        if (/scoring: \d+\/60/.test(stderr) && !child.killed) child.kill('SIGINT');
      });
      child.on('close', (c) => done(c ?? -1));
    });
    expect(code, stderr).toBe(130);
    expect(stderr).toMatch(/cancelled; nothing was written/);
    await expect(readdir(out)).rejects.toThrow();
  });

  it('score rejects bad options with a usage message and exit code 2', async () => {
    const r = await runCli(['score', '--model', MODEL, '--set', set, '--out', join(root, 'x'), '--aggregator', 'softmax:-1']);
    expect(r.code).toBe(2);
    expect(r.stderr).toMatch(/aggregator/);
    const r2 = await runCli(['score', '--model', MODEL, '--set', set, '--out', join(root, 'x'), '--shard', '3/2']);
    expect(r2.code).toBe(2);
    expect(r2.stderr).toMatch(/--shard/);
  });
});
