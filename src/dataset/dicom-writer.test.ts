import { describe, expect, it } from 'vitest';
import * as dicomParser from 'dicom-parser';
import { deterministicUid, encodeDicom, SYNTHETIC_MARKER } from './dicom-writer';

function sample(): Uint16Array {
  const d = new Uint16Array(6 * 4);
  for (let i = 0; i < d.length; i++) d[i] = i * 150;
  return d;
}

describe('dicom-writer', () => {
  it('deterministicUid(seed) is a 2.25 UID of at most 64 characters, stable and seed-dependent', () => {
    const a = deterministicUid('study:s1');
    expect(a).toMatch(/^2\.25\.(0|[1-9][0-9]*)$/);
    expect(a.length).toBeLessThanOrEqual(64);
    expect(deterministicUid('study:s1')).toBe(a);
    expect(deterministicUid('study:s2')).not.toBe(a);
    expect(deterministicUid('')).toMatch(/^2\.25\.[1-9][0-9]*$/);
  });

  it('encodeDicom(...) writes a Part 10 file that dicom-parser reads back with our tags', () => {
    const bytes = encodeDicom({
      width: 6,
      height: 4,
      data: sample(),
      bitsStored: 12,
      photometric: 'MONOCHROME1',
      pixelSpacingMm: [0.143, 0.139],
      window: { centre: 1800.5, width: 3000 },
      rescale: { slope: 0.5, intercept: -100 },
      studyId: 'phantom-0001',
      description: 'right lower consolidation',
    });
    expect(String.fromCharCode(...bytes.subarray(128, 132))).toBe('DICM');
    const ds = dicomParser.parseDicom(bytes);
    expect(ds.string('x00020010')).toBe('1.2.840.10008.1.2.1');
    expect(ds.string('x00080016')).toBe('1.2.840.10008.5.1.4.1.1.7');
    expect(ds.string('x00080064')).toBe('SYN');
    expect(ds.string('x00100010')).toBe('SYNTHETIC^PHANTOM');
    expect(ds.string('x00204000')).toContain(SYNTHETIC_MARKER);
    expect(ds.uint16('x00280010')).toBe(4);
    expect(ds.uint16('x00280011')).toBe(6);
    expect(ds.uint16('x00280101')).toBe(12);
    expect(ds.string('x00280004')).toBe('MONOCHROME1');
    expect(ds.floatString('x00280030', 0)).toBe(0.143);
    expect(ds.floatString('x00280030', 1)).toBe(0.139);
    expect(ds.floatString('x00281050')).toBe(1800.5);
    expect(ds.floatString('x00281053')).toBe(0.5);
    expect(ds.floatString('x00281052')).toBe(-100);
    expect(ds.string('x00020003')).toBe(ds.string('x00080018'));
    const px = ds.elements.x7fe00010;
    expect(px.length).toBe(48);
    const view = new DataView(bytes.buffer, bytes.byteOffset + px.dataOffset, px.length);
    expect(Array.from({ length: 24 }, (_, i) => view.getUint16(2 * i, true))).toEqual(Array.from(sample()));
    // Group length (0002,0000) covers exactly the rest of the meta group.
    expect(ds.uint32('x00020000')).toBe(ds.elements.x00080008.dataOffset - 8 - (ds.elements.x00020001.dataOffset - 12));
  });

  it('encodeDicom(...) is byte-identical for the same input and changes the instance UID with the pixels', () => {
    const base = { width: 6, height: 4, photometric: 'MONOCHROME2' as const, pixelSpacingMm: [0.2, 0.2] as const, studyId: 's', description: 'd' };
    const a = encodeDicom({ ...base, data: sample() });
    const b = encodeDicom({ ...base, data: sample() });
    expect(Buffer.from(a).equals(Buffer.from(b))).toBe(true);
    const other = sample();
    other[0] = 1;
    const c = dicomParser.parseDicom(encodeDicom({ ...base, data: other }));
    expect(c.string('x00080018')).not.toBe(dicomParser.parseDicom(a).string('x00080018'));
    expect(c.string('x0020000d')).toBe(dicomParser.parseDicom(a).string('x0020000d'));
  });

  it('encodeDicom(...) rejects bad arguments naming the parameter', () => {
    const base = { width: 2, height: 2, data: new Uint16Array(4), photometric: 'MONOCHROME2' as const, pixelSpacingMm: [0.2, 0.2] as const, studyId: 's', description: 'd' };
    expect(() => encodeDicom({ ...base, width: 0 })).toThrow(/'width'/);
    expect(() => encodeDicom({ ...base, data: new Uint16Array(3) })).toThrow(/'data'/);
    expect(() => encodeDicom({ ...base, bitsStored: 8, data: Uint16Array.of(0, 0, 0, 256) })).toThrow(/bitsStored = 8/);
    expect(() => encodeDicom({ ...base, pixelSpacingMm: [0, 1] })).toThrow(/'pixelSpacingMm'/);
    expect(() => encodeDicom({ ...base, window: { centre: 1, width: 0.5 } })).toThrow(/'window'/);
    expect(() => encodeDicom({ ...base, rescale: { slope: 0, intercept: 0 } })).toThrow(/'rescale'/);
    expect(() => encodeDicom({ ...base, description: 'naïve' })).toThrow(/'description'/);
    expect(() => encodeDicom({ ...base, studyId: '' })).toThrow(/'studyId'/);
  });
});
