import { describe, expect, it } from 'vitest';
import { execFileSync } from 'node:child_process';
import { existsSync, mkdtempSync, readFileSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { decodeDicom } from './dicom';
import { decodeImage } from './decode-image';
import { encodeDicom } from './dicom-writer';
import { DatasetError } from './errors';
import { toUnitIntensity } from '../core/voi-window';
import { expectClose } from '../../tests/support/expect-close';
import { TESSERA_WRITTEN_INPUT } from '../../tests/fixtures/reference/make-tessera-dicom';

// Reference values: pydicom 2.3.1 (pixel_array, apply_modality_lut, apply_voi_lut), made once by
// tests/fixtures/reference/make-dicom-fixture.py; see that script for the command.
const DIR = join(__dirname, '../../tests/fixtures/reference/dicom');
interface ExpectedFile {
  file: string;
  transfer_syntax: string;
  compressed?: boolean;
  rows: number;
  columns: number;
  photometric: string;
  bits_stored: number;
  modality_lut: number[];
  pixel_spacing?: number[];
  imager_pixel_spacing?: number[];
  window_first?: [number, number];
  voi_lut?: number[];
  voi_output_range?: [number, number];
}
const expected = JSON.parse(readFileSync(join(DIR, 'expected.json'), 'utf8')) as { files: ExpectedFile[] };
const read = (f: string): Uint8Array => new Uint8Array(readFileSync(join(DIR, f)));

describe('decodeDicom against pydicom fixtures', () => {
  for (const ref of expected.files.filter((f) => !f.compressed)) {
    it(`decodeDicom(${ref.file}) matches pydicom's modality LUT, spacing and VOI (source: pydicom 2.3.1)`, () => {
      const img = decodeDicom(read(ref.file), ref.file);
      expect(img.width).toBe(ref.columns);
      expect(img.height).toBe(ref.rows);
      expect(img.bitDepth).toBe(ref.bits_stored);
      const [lo, hi] = img.valueRange;
      const mono1 = ref.photometric === 'MONOCHROME1';
      // MONOCHROME1 is inverted over the modality output range so that higher is brighter.
      expectClose(img.data, ref.modality_lut.map((v) => (mono1 ? lo + hi - v : v)), 1e-3);
      const spacing = ref.pixel_spacing ?? ref.imager_pixel_spacing;
      if (spacing) expectClose(img.pixelSpacingMm as readonly number[], spacing, 1e-12);
      else expect(img.pixelSpacingMm).toBeUndefined();
      if (ref.window_first && ref.voi_lut && ref.voi_output_range) {
        expect(img.window?.width).toBe(ref.window_first[1]);
        const [yMin, yMax] = ref.voi_output_range;
        expectClose(img.valueRange as readonly number[], [Math.min(yMin, yMax), Math.max(yMin, yMax)], 1e-9);
        const unit = ref.voi_lut.map((v) => (v - yMin) / (yMax - yMin));
        const ours = toUnitIntensity(img, img.window);
        expectClose(ours, unit.map((u) => (mono1 ? 1 - u : u)), 1e-5);
      } else {
        expect(img.window).toBeUndefined();
      }
      expect(img.synthetic).toBe(true);
    });
  }

  it('decodeDicom(compressed) names the syntax, its UID and the fix', () => {
    for (const [file, name, uid] of [
      ['compressed-jpeg-baseline.dcm', 'JPEG Baseline (Process 1)', '1.2.840.10008.1.2.4.50'],
      ['compressed-rle.dcm', 'RLE Lossless', '1.2.840.10008.1.2.5'],
    ]) {
      try {
        decodeDicom(read(file), `set/${file}`);
        expect.unreachable();
      } catch (e) {
        expect(e).toBeInstanceOf(DatasetError);
        const err = e as DatasetError;
        expect(err.code).toBe('unsupported-transfer-syntax');
        expect(err.message).toContain(name);
        expect(err.message).toContain(uid);
        expect(err.message).toContain(`set/${file}`);
        expect(err.fix).toMatch(/Explicit VR Little Endian/);
      }
    }
  });

  it('decodeImage(truncated DICOM) throws unreadable-image naming the file', () => {
    const bytes = read('mono2-u16-12bit-explicit-le.dcm');
    for (const cut of [140, 300, bytes.length - 10]) {
      expect(() => decodeImage(bytes.subarray(0, cut), 'cut.dcm')).toThrow(expect.objectContaining({ code: 'unreadable-image', file: 'cut.dcm' }));
    }
  });
});

describe('bundled pydicom test files (read in place, not copied: they are anonymised scans)', () => {
  const bundled = JSON.parse(readFileSync(join(DIR, 'bundled.json'), 'utf8')) as {
    directory: string;
    files: { file: string; rows: number; columns: number; modality_sum: number; modality_min: number; modality_max: number; samples: [number, number][] }[];
  };
  const present = bundled.files.filter((f) => existsSync(join(bundled.directory, f.file)));
  it.skipIf(present.length === 0)('decodeDicom(MR_small in three syntaxes, image_dfl deflated) matches pydicom 2.3.1 summaries', () => {
    for (const ref of present) {
      const img = decodeDicom(new Uint8Array(readFileSync(join(bundled.directory, ref.file))), ref.file);
      expect([img.width, img.height]).toEqual([ref.columns, ref.rows]);
      let sum = 0;
      let min = Infinity;
      let max = -Infinity;
      for (const v of img.data) {
        sum += v;
        min = Math.min(min, v);
        max = Math.max(max, v);
      }
      expect([sum, min, max]).toEqual([ref.modality_sum, ref.modality_min, ref.modality_max]);
      for (const [i, v] of ref.samples) expect(img.data[i]).toBe(v);
    }
  });
});

describe('pydicom reads what encodeDicom writes', () => {
  const view = JSON.parse(readFileSync(join(DIR, 'pydicom-view-of-tessera.json'), 'utf8')) as {
    pixel_array: number[];
    modality_lut: number[];
    patient_name: string;
    window: [number, number];
    pixel_spacing: [number, number];
  };

  it('encodeDicom(fixture input) reproduces the committed file, whose pydicom view (pydicom 2.3.1) matches our decoder', () => {
    const bytes = encodeDicom(TESSERA_WRITTEN_INPUT);
    expect(Buffer.from(bytes).equals(readFileSync(join(DIR, 'tessera-written.dcm')))).toBe(true);
    expect(view.pixel_array).toEqual(Array.from(TESSERA_WRITTEN_INPUT.data));
    expect(view.patient_name).toBe('SYNTHETIC^PHANTOM');
    expect(view.window).toEqual([900, 1600]);
    expect(view.pixel_spacing).toEqual([0.175, 0.2]);
    const img = decodeDicom(bytes, 'tessera-written.dcm');
    const [lo, hi] = img.valueRange;
    expectClose(img.data, view.modality_lut.map((v) => lo + hi - v), 1e-4);
  });

  const python = '/usr/bin/python3';
  const hasPydicom = ((): boolean => {
    if (!existsSync(python)) return false;
    try {
      execFileSync(python, ['-c', 'import pydicom'], { stdio: 'ignore' });
      return true;
    } catch {
      return false;
    }
  })();
  it.skipIf(!hasPydicom)('pydicom (live) reads a freshly encoded MONOCHROME2 file with our pixels and tags', () => {
    const data = Uint16Array.from({ length: 12 * 7 }, (_, i) => (i * 733) % 65536);
    const bytes = encodeDicom({ width: 12, height: 7, data, photometric: 'MONOCHROME2', pixelSpacingMm: [0.3, 0.31], studyId: 'live', description: 'live check' });
    const dir = mkdtempSync(join(tmpdir(), 'tessera-dicom-'));
    const file = join(dir, 'live.dcm');
    writeFileSync(file, bytes);
    const out = execFileSync(python, ['-c', [
      'import sys, json, pydicom',
      'd = pydicom.dcmread(sys.argv[1])',
      'print(json.dumps({"px": d.pixel_array.ravel().tolist(), "pn": str(d.PatientName), "ts": str(d.file_meta.TransferSyntaxUID), "conv": d.ConversionType, "ps": [float(v) for v in d.PixelSpacing]}))',
    ].join('\n'), file], { encoding: 'utf8' });
    const got = JSON.parse(out) as { px: number[]; pn: string; ts: string; conv: string; ps: number[] };
    expect(got.px).toEqual(Array.from(data));
    expect(got.pn).toBe('SYNTHETIC^PHANTOM');
    expect(got.ts).toBe('1.2.840.10008.1.2.1');
    expect(got.conv).toBe('SYN');
    expect(got.ps).toEqual([0.3, 0.31]);
  });
});
