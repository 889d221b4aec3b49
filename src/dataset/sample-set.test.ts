import { describe, expect, it } from 'vitest';
import Ajv2020 from 'ajv/dist/2020';
import setSchema from './schemas/set.schema.json';
import { loadSampleSet, validateSampleSetManifest } from './sample-set';
import { DatasetError } from './errors';
import type { FileSource } from './types';

function memorySource(files: Record<string, string | Uint8Array>, label = 'sets/demo'): FileSource {
  return {
    label,
    async readBytes(p) {
      const v = files[p];
      if (v === undefined) throw new Error(`no ${p}`);
      return typeof v === 'string' ? new TextEncoder().encode(v) : v;
    },
    async readText(p) {
      const v = files[p];
      if (v === undefined) throw new Error(`no ${p}`);
      return typeof v === 'string' ? v : new TextDecoder().decode(v);
    },
    async exists(p) {
      return p in files;
    },
  };
}

const valid = {
  schema: 'tessera.set/1',
  name: 'demo',
  synthetic: true,
  description: 'two synthetic studies',
  studies: [
    { id: 's1', image: 'images/s1.png', report: 'Right lower lobe consolidation.', labels: { findings: [{ finding: 'consolidation', zones: ['right-lower'] }], edema_grade: 0 } },
    { id: 's2', image: 'images/s2.dcm', report: 'No acute findings.' },
  ],
};

const validate = new Ajv2020({ allErrors: true }).compile(setSchema);

describe('sample-set', () => {
  it('validateSampleSetManifest(valid) has no problems and agrees with set.schema.json', () => {
    const { manifest, problems } = validateSampleSetManifest(valid, 'set.json');
    expect(problems).toEqual([]);
    expect(manifest?.studies.map((s) => s.id)).toEqual(['s1', 's2']);
    expect(validate(valid)).toBe(true);
    expect(validate({ ...valid, studies: [] })).toBe(true);
    expect(validateSampleSetManifest({ ...valid, studies: [] }, 'set.json').problems).toEqual([]);
  });

  const invalid: Array<[string, unknown]> = [
    ['not an object', [1, 2]],
    ['wrong schema', { ...valid, schema: 'other/1' }],
    ['newer version', { ...valid, schema: 'tessera.set/2' }],
    ['missing name', { ...valid, name: undefined }],
    ['synthetic not boolean', { ...valid, synthetic: 'yes' }],
    ['unknown top field', { ...valid, extra: 1 }],
    ['studies not a list', { ...valid, studies: {} }],
    ['study missing image', { ...valid, studies: [{ id: 'a', report: 'x' }] }],
    ['image escapes folder', { ...valid, studies: [{ id: 'a', image: '../a.png', report: 'x' }] }],
    ['absolute image path', { ...valid, studies: [{ id: 'a', image: '/a.png', report: 'x' }] }],
    ['backslash path', { ...valid, studies: [{ id: 'a', image: 'img\\a.png', report: 'x' }] }],
    ['empty report', { ...valid, studies: [{ id: 'a', image: 'a.png', report: '  ' }] }],
    ['id with spaces around', { ...valid, studies: [{ id: ' a', image: 'a.png', report: 'x' }] }],
    ['unknown study field', { ...valid, studies: [{ id: 'a', image: 'a.png', report: 'x', reprot: 'y' }] }],
    ['bad zone in findings', { ...valid, studies: [{ id: 'a', image: 'a.png', report: 'x', labels: { findings: [{ finding: 'f', zones: ['upper'] }] } }] }],
    ['edema grade 4', { ...valid, studies: [{ id: 'a', image: 'a.png', report: 'x', labels: { edema_grade: 4 } }] }],
    ['annotations path absolute', { ...valid, annotations: '/tmp/a.json' }],
  ];
  for (const [title, json] of invalid) {
    it(`validateSampleSetManifest(${title}) reports a problem, as set.schema.json (ajv) rejects it`, () => {
      const clean = JSON.parse(JSON.stringify(json));
      expect(validate(clean)).toBe(false);
      const { problems } = validateSampleSetManifest(clean, 'sets/demo/set.json');
      expect(problems.length).toBeGreaterThan(0);
      for (const p of problems) {
        expect(p.message).toContain('sets/demo/set.json');
        expect(p.fix.length).toBeGreaterThan(0);
      }
    });
  }

  it('validateSampleSetManifest(duplicate ids) reports duplicate-study naming the id; the schema cannot express it', () => {
    const json = { ...valid, studies: [valid.studies[0], { ...valid.studies[1], id: 's1' }, { id: 's3', image: 'c.png', report: 'Clear.' }] };
    expect(validate(json)).toBe(true);
    const { manifest, problems } = validateSampleSetManifest(json, 'set.json');
    expect(problems.map((p) => [p.code, p.item])).toEqual([['duplicate-study', 's1']]);
    expect(problems[0].message).toMatch(/studies\[0\] and studies\[1\]/);
    expect(manifest?.studies.map((s) => s.id)).toEqual(['s3']);
  });

  it('validateSampleSetManifest(...) collects every problem at once and keeps the good studies', () => {
    const json = {
      ...valid,
      studies: [
        { id: 'ok', image: 'ok.png', report: 'Fine.' },
        { id: 'empty', image: 'e.png', report: '' },
        { id: 'noimg', report: 'x' },
        42,
      ],
    };
    const { manifest, problems } = validateSampleSetManifest(json, 'set.json');
    expect(problems.map((p) => [p.code, p.item])).toEqual([
      ['empty-report', 'empty'],
      ['set-schema', 'noimg'],
      ['set-schema', 'studies[3]'],
    ]);
    expect(manifest?.studies.map((s) => s.id)).toEqual(['ok']);
  });

  it('loadSampleSet(source) reports a missing image by study id and loads the rest', async () => {
    const src = memorySource({ 'set.json': JSON.stringify(valid), 'images/s1.png': new Uint8Array(1) });
    const { manifest, problems } = await loadSampleSet(src);
    expect(manifest.studies.map((s) => s.id)).toEqual(['s1']);
    expect(problems).toHaveLength(1);
    expect(problems[0]).toMatchObject({ code: 'missing-image', item: 's2', file: 'sets/demo/set.json' });
    expect(problems[0].message).toContain('images/s2.dcm');
  });

  it('loadSampleSet(source) throws DatasetError for a missing, non-JSON or unusable set.json', async () => {
    await expect(loadSampleSet(memorySource({}))).rejects.toMatchObject({ code: 'set-schema', file: 'sets/demo/set.json' });
    await expect(loadSampleSet(memorySource({ 'set.json': '{ "schema": ' }))).rejects.toMatchObject({ code: 'set-json' });
    try {
      await loadSampleSet(memorySource({ 'set.json': JSON.stringify({ schema: 'tessera.set/1', studies: 3 }) }));
      expect.unreachable();
    } catch (e) {
      expect(e).toBeInstanceOf(DatasetError);
      const err = e as DatasetError;
      expect(err.problems.map((p) => p.item)).toEqual(['name', 'synthetic', 'studies']);
    }
  });
});
