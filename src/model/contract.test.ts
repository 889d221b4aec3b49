import { readFileSync } from 'node:fs';
import { join } from 'node:path';
import Ajv from 'ajv';
import { describe, expect, it } from 'vitest';
import { ModelContractError, describeValue, formatProblem, parseManifest, validateManifest } from './contract';
import { FIXTURES } from './testing/fixture-folder';
import schema from './schemas/model.schema.json';

const valid = (): Record<string, any> => JSON.parse(readFileSync(join(FIXTURES, 'tiny-model', 'tessera-model.json'), 'utf8')); // eslint-disable-line @typescript-eslint/no-explicit-any
const edited = (edit: (m: Record<string, any>) => void): unknown => { // eslint-disable-line @typescript-eslint/no-explicit-any
  const m = valid();
  edit(m);
  return m;
};
const paths = (json: unknown): string[] => validateManifest(json).map((p) => p.path);

const ajv = new Ajv({ allErrors: true, strict: false });
const schemaAccepts = ajv.compile(schema);

describe('validateManifest', () => {
  it('validateManifest(fixture manifests) finds no problem', () => {
    expect(validateManifest(valid())).toEqual([]);
    const bnd = JSON.parse(readFileSync(join(FIXTURES, 'tiny-model-bnd', 'tessera-model.json'), 'utf8'));
    expect(validateManifest(bnd)).toEqual([]);
  });

  it('validateManifest(non-object) gives one whole-file problem', () => {
    for (const v of [null, 3, 'x', [], undefined]) {
      const p = validateManifest(v);
      expect(p).toHaveLength(1);
      expect(p[0].path).toBe('');
      expect(p[0].file).toBe('tessera-model.json');
    }
  });

  it('validateManifest({}) lists every missing required field at once', () => {
    expect(paths({}).sort()).toEqual(['embedding_dim', 'id', 'image', 'schema', 'similarity', 'text'].sort());
  });

  it('validateManifest reports several problems in one pass, each with expected, got and a fix', () => {
    const m = edited((m) => {
      m.image.input.channels = 2;
      m.image.input.std = [0];
      m.image.output.layout = 'BHWD';
      m.text.output.pooling = undefined;
      m.embedding_dim = 0;
    });
    const problems = validateManifest(m, 'models/x/tessera-model.json');
    expect(problems.map((p) => p.path)).toEqual([
      'image.input.channels', 'image.input.std', 'image.output.layout', 'text.output.pooling', 'embedding_dim',
    ]);
    for (const p of problems) {
      expect(p.file).toBe('models/x/tessera-model.json');
      expect(p.expected.length).toBeGreaterThan(0);
      expect(p.got.length).toBeGreaterThan(0);
      expect(p.fix.length).toBeGreaterThan(0);
    }
    expect(formatProblem(problems[2])).toBe(
      'models/x/tessera-model.json: image.output.layout: expected one of "BDHW", "BND"; got the string "BHWD". ' +
        'Fix: use "BDHW" for an output shaped [batch, D, h, w] or "BND" for [batch, h*w, D].',
    );
  });

  it('validateManifest names a wrong schema version and says how to fix it', () => {
    const [p] = validateManifest(edited((m) => { m.schema = 'tessera.model/2'; }));
    expect(p.path).toBe('schema');
    expect(p.got).toBe('the string "tessera.model/2"');
    expect(p.fix).toMatch(/update Tessera/);
  });

  it('validateManifest wants one mean and one std per channel', () => {
    const p = validateManifest(edited((m) => { m.image.input.channels = 3; }));
    expect(p.map((x) => x.path)).toEqual(['image.input.mean', 'image.input.std']);
    expect(p[0].expected).toBe('3 values (one per channel, channels = 3)');
  });

  it('validateManifest rejects NaN-like and huge bad numbers: non-finite scale, NaN mean, fractional sizes', () => {
    const p = validateManifest(edited((m) => {
      m.image.input.scale = Infinity;
      m.image.input.mean = [NaN];
      m.image.input.height = 64.5;
      m.image.output.grid.w = 1e309;
      m.text.max_tokens = 1;
    }));
    expect(p.map((x) => x.path)).toEqual(['image.input.height', 'image.input.scale', 'image.input.mean', 'image.output.grid.w', 'text.max_tokens']);
  });

  it('validateManifest refuses paths that leave the model folder', () => {
    for (const f of ['/abs/enc.onnx', '../enc.onnx', 'a/../../enc.onnx', 'C:\\enc.onnx']) {
      expect(paths(edited((m) => { m.image.file = f; delete m.hashes; }))).toEqual(['image.file']);
    }
    expect(paths(edited((m) => { m.image.file = 'sub/enc.onnx'; delete m.hashes; }))).toEqual([]);
    // A hash for a file the manifest no longer names is flagged too.
    expect(paths(edited((m) => { m.image.file = 'sub/enc.onnx'; }))).toEqual(['hashes.image-encoder.onnx']);
  });

  it('validateManifest flags an unknown field by its path (likely a typo)', () => {
    const p = validateManifest(edited((m) => { m.text.ouput = {}; m.embeding_dim = 3; }));
    expect(p.map((x) => x.path)).toEqual(['embeding_dim', 'text.ouput']);
    expect(p[0].got).toBe('the string "an unknown field "embeding_dim""');
  });

  it('validateManifest flags pooling on a sentence output and bad hashes', () => {
    const p = validateManifest(edited((m) => {
      m.text.output.kind = 'sentence';
      m.hashes['image-encoder.onnx'] = 'ABC';
      m.hashes['other.onnx'] = 'a'.repeat(64);
    }));
    expect(p.map((x) => x.path)).toEqual(['text.output.pooling', 'hashes.image-encoder.onnx', 'hashes.other.onnx']);
  });

  it('validateManifest accepts optional fields left out', () => {
    expect(validateManifest(edited((m) => {
      delete m.hashes; delete m.temperature; delete m.description; delete m.image.input.pad_value; delete m.image.receptive_field_px;
    }))).toEqual([]);
  });
});

describe('model.schema.json agrees with validateManifest', () => {
  const cases: [string, unknown][] = [
    ['fixture', valid()],
    ['no id', edited((m) => { delete m.id; })],
    ['bad layout', edited((m) => { m.image.output.layout = 'NHWC'; })],
    ['tokens without pooling', edited((m) => { delete m.text.output.pooling; })],
    ['sentence with pooling', edited((m) => { m.text.output.kind = 'sentence'; })],
    ['unknown field', edited((m) => { m.extra = 1; })],
    ['zero std', edited((m) => { m.image.input.std = [0]; })],
    ['pad out of range', edited((m) => { m.image.input.pad_value = 2; })],
    ['bad hash', edited((m) => { m.hashes['tokenizer.json'] = 'xyz'; })],
    ['parent path', edited((m) => { m.text.tokenizer = '../tokenizer.json'; })],
    ['similarity dot', edited((m) => { m.similarity = 'dot'; })],
    ['no pad value', edited((m) => { delete m.image.input.pad_value; })],
  ];
  it.each(cases)('schema and validateManifest give the same verdict: %s', (_name, json) => {
    expect(schemaAccepts(json)).toBe(validateManifest(json).length === 0);
  });
});

describe('ModelContractError', () => {
  it('new ModelContractError(code, file, problems) carries code, file, all problems and cause in its message', () => {
    const problems = validateManifest(edited((m) => { m.embedding_dim = -1; m.similarity = 'dot'; }));
    const cause = new Error('root');
    const e = new ModelContractError('manifest-invalid', 'm/tessera-model.json', problems, { cause });
    expect(e).toBeInstanceOf(Error);
    expect(e.code).toBe('manifest-invalid');
    expect(e.problems).toHaveLength(2);
    expect(e.cause).toBe(cause);
    expect(e.message).toMatch(/^Model folder m\/tessera-model.json breaks the model contract \(2 problems\):/);
    expect(e.message.split('\n')).toHaveLength(3);
  });

  it('parseManifest(bad) throws with every problem; parseManifest(good) returns the manifest', () => {
    expect(parseManifest(valid()).id).toBe('tiny-fixture-bdhw');
    expect(() => parseManifest({})).toThrow(ModelContractError);
    try {
      parseManifest({});
    } catch (e) {
      expect((e as ModelContractError).problems).toHaveLength(6);
    }
  });
});

describe('describeValue', () => {
  it('describeValue(v) names missing, null, strings, numbers, arrays and objects', () => {
    expect(describeValue(undefined)).toBe('nothing (the field is missing)');
    expect(describeValue(null)).toBe('null');
    expect(describeValue(NaN)).toBe('number NaN');
    expect(describeValue([1, 2])).toBe('an array of 2 [1,2]');
    expect(describeValue('x'.repeat(100))).toMatch(/\.\.\."$/);
    expect(describeValue({ a: 1 })).toBe('an object');
  });
});
