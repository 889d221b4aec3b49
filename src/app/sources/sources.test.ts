// @vitest-environment node
import { describe, expect, test } from 'vitest';
import { createBlobMapSource } from './blob-map-source';
import { createDirectoryHandleSource, directoryPickerAvailable, pickDirectory, type DirectoryHandleLike } from './directory-handle-source';
import { sourcesFromDrop } from './drop-source';
import { createFileListSource } from './file-list-source';
import { createHttpFileSource } from './http-file-source';
import { memorySource } from './memory-source.test-util';
import { classifyFolder, openSetFrom } from './open-folder';
import { formatShownProblem, fromDatasetProblem, fromModelProblem } from './shown-problem';
import { pathSegments } from './source-path';

const enc = new TextEncoder();

describe('pathSegments', () => {
  test("pathSegments('images/a.png') splits on '/'", () => {
    expect(pathSegments('images/a.png')).toEqual(['images', 'a.png']);
  });
  test.each(['', '/etc/passwd', '../x', 'a/../b', 'a//b', './a'])('pathSegments(%j) refuses a path that is not inside the folder', (p) => {
    expect(() => pathSegments(p)).toThrow(TypeError);
  });
});

describe('createHttpFileSource', () => {
  const served = new Map([['/demo/set/set.json', '{"a":1}'], ['/demo/set/images/a%20b.png', 'PNG']]);
  const fakeFetch = (async (input: string | URL | Request, init?: RequestInit) => {
    const url = new URL(String(input));
    const body = served.get(url.pathname);
    if (body === undefined) return new Response('missing', { status: 404, statusText: 'Not Found' });
    return new Response(init?.method === 'HEAD' ? null : body, { status: 200 });
  }) as typeof fetch;

  test('createHttpFileSource(base) reads text and bytes and answers exists() from the status', async () => {
    const s = createHttpFileSource('http://127.0.0.1:5173/demo/set', { fetch: fakeFetch, label: 'samples/demo' });
    expect(s.label).toBe('samples/demo');
    expect(await s.readText('set.json')).toBe('{"a":1}');
    expect(new TextDecoder().decode(await s.readBytes('images/a b.png'))).toBe('PNG');
    expect(await s.exists('set.json')).toBe(true);
    expect(await s.exists('annotations.json')).toBe(false);
  });

  test('createHttpFileSource(base).readText(missing) names the file and the status', async () => {
    const s = createHttpFileSource('http://127.0.0.1:5173/demo/set/', { fetch: fakeFetch, label: 'demo' });
    await expect(s.readText('nope.json')).rejects.toThrow(/demo\/nope\.json: the page's server answered 404/);
  });

  test("createHttpFileSource(base).readBytes('../x') refuses to leave the folder", async () => {
    const s = createHttpFileSource('http://127.0.0.1:5173/demo/set/', { fetch: fakeFetch });
    await expect(s.readBytes('../x')).rejects.toThrow(TypeError);
  });
});

describe('createFileListSource', () => {
  const file = (rel: string, text: string): File => {
    const f = new File([text], rel.split('/').pop() as string);
    Object.defineProperty(f, 'webkitRelativePath', { value: rel });
    return f;
  };

  test('createFileListSource(files) takes paths relative to the chosen folder', async () => {
    const s = createFileListSource([file('my-set/set.json', '{}'), file('my-set/images/a.png', 'x')]);
    expect(s.label).toBe('my-set');
    expect(await s.exists('images/a.png')).toBe(true);
    expect(await s.exists('my-set/set.json')).toBe(false);
    expect(await s.readText('set.json')).toBe('{}');
  });

  test('createFileListSource([]) and files from two folders are RangeErrors naming files', () => {
    expect(() => createFileListSource([])).toThrow(/'files'.*empty/);
    expect(() => createFileListSource([file('a/x', ''), file('b/y', '')])).toThrow(/'files' must come from one folder/);
  });
});

describe('createBlobMapSource', () => {
  test('createBlobMapSource(label, files).readBytes(missing) says to choose the folder that holds it', async () => {
    const s = createBlobMapSource('dropped', new Map([['a.txt', new Blob(['hi'])]]));
    expect(new TextDecoder().decode(await s.readBytes('a.txt'))).toBe('hi');
    await expect(s.readBytes('b.txt')).rejects.toThrow(/dropped\/b\.txt: no such file/);
  });
});

describe('createDirectoryHandleSource', () => {
  const notFound = (): Error => Object.assign(new Error('A requested file or directory could not be found'), { name: 'NotFoundError' });
  const dir = (name: string, entries: Record<string, string | DirectoryHandleLike>): DirectoryHandleLike => ({
    name,
    async getDirectoryHandle(n) {
      const e = entries[n];
      if (typeof e !== 'object') throw notFound();
      return e;
    },
    async getFileHandle(n) {
      const e = entries[n];
      if (typeof e !== 'string') throw notFound();
      return { getFile: async () => new File([e], n) };
    },
  });
  const root = dir('model-a', { 'tessera-model.json': '{"id":"a"}', sub: dir('sub', { 'tokenizer.json': '{}' }) });

  test('createDirectoryHandleSource(handle) walks sub-folders and reports missing files as absent', async () => {
    const s = createDirectoryHandleSource(root);
    expect(s.label).toBe('model-a');
    expect(await s.readText('tessera-model.json')).toBe('{"id":"a"}');
    expect(await s.readText('sub/tokenizer.json')).toBe('{}');
    expect(await s.exists('sub/missing.json')).toBe(false);
    expect(await s.exists('nodir/x')).toBe(false);
    await expect(s.readBytes('sub/missing.json')).rejects.toThrow(/model-a\/sub\/missing\.json: no such file/);
  });

  test('pickDirectory() resolves undefined when the user closes the picker, and explains a missing picker', async () => {
    const cancelled = { showDirectoryPicker: async () => { throw Object.assign(new Error('closed'), { name: 'AbortError' }); } };
    expect(directoryPickerAvailable(cancelled)).toBe(true);
    expect(await pickDirectory(cancelled)).toBeUndefined();
    expect(directoryPickerAvailable({})).toBe(false);
    await expect(pickDirectory({})).rejects.toThrow(/no folder picker; use "Choose folder"/);
    const picked = await pickDirectory({ showDirectoryPicker: async () => root });
    expect(picked?.label).toBe('model-a');
  });
});

describe('sourcesFromDrop', () => {
  type Node = { name: string; children?: Node[]; text?: string };
  const entry = (n: Node): unknown => ({
    name: n.name,
    isFile: n.children === undefined,
    isDirectory: n.children !== undefined,
    file: (ok: (f: File) => void) => ok(new File([n.text ?? ''], n.name)),
    createReader: () => {
      // Two batches, then an empty one, as Chromium returns long listings.
      const batches = [(n.children ?? []).slice(0, 1), (n.children ?? []).slice(1), []];
      return { readEntries: (ok: (e: unknown[]) => void) => ok((batches.shift() ?? []).map(entry)) };
    },
  });
  const item = (n: Node) => ({ kind: 'file', webkitGetAsEntry: () => entry(n) as never });

  test('sourcesFromDrop(items) gives one source per dropped folder, with nested files, and refuses loose files', async () => {
    const set: Node = { name: 'set-x', children: [{ name: 'set.json', text: '{}' }, { name: 'images', children: [{ name: 'a.png', text: 'A' }, { name: 'b.png', text: 'B' }] }] };
    const { sources, problems } = await sourcesFromDrop([item(set), item({ name: 'loose.png', text: 'x' })]);
    expect(sources.map((s) => s.label)).toEqual(['set-x']);
    expect(await sources[0].readText('images/b.png')).toBe('B');
    expect(await sources[0].exists('set.json')).toBe(true);
    expect(problems).toEqual([expect.stringMatching(/^loose\.png is a file; drop the folder/)]);
  });
});

describe('classifyFolder and openSetFrom', () => {
  test('classifyFolder(source) tells a model folder from a set and explains neither', async () => {
    expect((await classifyFolder(memorySource('m', new Map([['tessera-model.json', enc.encode('{}')]])))).kind).toBe('model');
    expect((await classifyFolder(memorySource('s', new Map([['set.json', enc.encode('{}')]])))).kind).toBe('set');
    const none = await classifyFolder(memorySource('up', new Map()));
    expect(none.kind).toBeUndefined();
    expect(none.problems[0].what).toMatch(/neither tessera-model.json \(a model\) nor set.json/);
  });

  test('openSetFrom(source) of a folder without set.json returns the problem instead of throwing', async () => {
    const { set, problems } = await openSetFrom(memorySource('empty', new Map()));
    expect(set).toBeUndefined();
    expect(problems).toHaveLength(1);
    expect(problems[0]).toMatchObject({ kind: 'set', file: 'empty/set.json', what: 'there is no set.json in the folder' });
  });

  test('openSetFrom(source) keeps the usable studies and lists a missing image as a problem', async () => {
    const manifest = {
      schema: 'tessera.set/1', name: 'two', synthetic: true,
      studies: [{ id: 's1', image: 'a.png', report: 'Left effusion.' }, { id: 's2', image: 'missing.png', report: 'Clear lungs.' }],
    };
    // A 1x1 8-bit grey PNG.
    const png = Uint8Array.from(atob('iVBORw0KGgoAAAANSUhEUgAAAAEAAAABCAAAAAA6fptVAAAACklEQVR4nGNgAAAAAgABSK+kcQAAAABJRU5ErkJggg=='), (c) => c.charCodeAt(0));
    const { set, problems } = await openSetFrom(memorySource('two', new Map([['set.json', enc.encode(JSON.stringify(manifest))], ['a.png', png]])));
    expect(set?.studies.map((s) => s.id)).toEqual(['s1']);
    expect(problems.some((p) => p.where === 's2' && /missing\.png/.test(p.what))).toBe(true);
  });
});

describe('shown problems', () => {
  test('fromModelProblem(p) and fromDatasetProblem(p) say where, what and the fix once', () => {
    const m = fromModelProblem({ file: 'm/tessera-model.json', path: 'image.input.mean', expected: 'one value per channel', got: '2 values', fix: 'give one mean per channel' });
    expect(formatShownProblem(m)).toBe('m/tessera-model.json (image.input.mean): expected one value per channel; got 2 values. Fix: give one mean per channel');
    const d = fromDatasetProblem({ code: 'missing-image', file: 's/set.json', item: 's2', message: 's/set.json (s2): the image "x.png" does not exist. Fix: copy it', fix: 'copy it' });
    expect(d).toEqual({ kind: 'set', file: 's/set.json', where: 's2', what: 'the image "x.png" does not exist', fix: 'copy it' });
  });
});
