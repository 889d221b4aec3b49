import { describe, expect, it } from 'vitest';
import { PNG } from 'pngjs';
import { encode as encodeJpeg } from 'jpeg-js';
import { decodeImage, PNG_SYNTHETIC_KEYWORD, readImageSize, sniffImageFormat } from './decode-image';
import { encodePng } from './png-codec';
import { encodeDicom } from './dicom-writer';
import { DatasetError } from './errors';
import { expectClose } from '../../tests/support/expect-close';

describe('decodeImage', () => {
  it('decodeImage(16-bit grey PNG) keeps values and the 16-bit range, and reads the synthetic flag', () => {
    const data = Uint16Array.of(0, 1000, 65535, 42);
    const img = decodeImage(encodePng({ width: 2, height: 2, bitDepth: 16, data, text: { [PNG_SYNTHETIC_KEYWORD]: 'true' } }), 'a.png');
    expect(img.format).toBe('png');
    expect(img.bitDepth).toBe(16);
    expect(img.valueRange).toEqual([0, 65535]);
    expect(Array.from(img.data)).toEqual([0, 1000, 65535, 42]);
    expect(img.synthetic).toBe(true);
    expect(decodeImage(encodePng({ width: 1, height: 1, bitDepth: 8, data: Uint8Array.of(7) }), 'b.png').synthetic).toBe(false);
  });

  it('decodeImage(RGB PNG) converts to Rec. 601 luma (ITU-R BT.601 weights 0.299, 0.587, 0.114)', () => {
    const png = new PNG({ width: 4, height: 1 });
    const rgba = [255, 0, 0, 255, 0, 255, 0, 255, 0, 0, 255, 255, 10, 20, 30, 128];
    png.data = Buffer.from(rgba);
    const bytes = PNG.sync.write(png, { colorType: 6 });
    const img = decodeImage(new Uint8Array(bytes), 'c.png');
    expectClose(img.data, [0.299 * 255, 0.587 * 255, 0.114 * 255, 0.299 * 10 + 0.587 * 20 + 0.114 * 30], 1e-4);
    expect(img.valueRange).toEqual([0, 255]);
  });

  it('decodeImage(JPEG) decodes via jpeg-js to luma of about the encoded grey', () => {
    const w = 16;
    const h = 16;
    const rgba = new Uint8Array(w * h * 4);
    for (let i = 0; i < w * h; i++) rgba.set([120, 120, 120, 255], i * 4);
    const jpg = encodeJpeg({ width: w, height: h, data: rgba }, 95).data;
    const img = decodeImage(new Uint8Array(jpg), 'd.jpg');
    expect(img.format).toBe('jpeg');
    expect([img.width, img.height]).toEqual([16, 16]);
    for (const v of img.data) expect(Math.abs(v - 120)).toBeLessThanOrEqual(2);
  });

  it('decodeImage(truncated JPEG) throws unreadable-image naming the file', () => {
    const rgba = new Uint8Array(32 * 32 * 4).fill(200);
    const jpg = new Uint8Array(encodeJpeg({ width: 32, height: 32, data: rgba }, 90).data);
    expect(() => decodeImage(jpg.subarray(0, Math.floor(jpg.length / 2)), 'studies/e.jpg')).toThrow(expect.objectContaining({ code: 'unreadable-image', file: 'studies/e.jpg' }));
  });

  it('decodeImage(DICOM) dispatches on the DICM prefix, not the extension', () => {
    const bytes = encodeDicom({ width: 2, height: 1, data: Uint16Array.of(5, 6), photometric: 'MONOCHROME2', pixelSpacingMm: [0.2, 0.2], studyId: 's', description: 'd' });
    const img = decodeImage(bytes, 'misnamed.png');
    expect(img.format).toBe('dicom');
    expect(Array.from(img.data)).toEqual([5, 6]);
    expect(sniffImageFormat(bytes)).toBe('dicom');
  });

  it('decodeImage(truncated PNG / empty / unknown bytes) throws unreadable-image naming the file', () => {
    const png = encodePng({ width: 4, height: 4, bitDepth: 8, data: new Uint8Array(16) });
    const cases: Array<[Uint8Array, string]> = [
      [png.subarray(0, png.length - 15), 'trunc.png'],
      [new Uint8Array(0), 'empty.png'],
      [new TextEncoder().encode('this is a report, not an image'), 'notes.txt'],
    ];
    for (const [bytes, name] of cases) {
      try {
        decodeImage(bytes, name);
        expect.unreachable();
      } catch (e) {
        expect(e).toBeInstanceOf(DatasetError);
        expect((e as DatasetError).code).toBe('unreadable-image');
        expect((e as DatasetError).message.startsWith(name)).toBe(true);
      }
    }
  });
});

describe('readImageSize', () => {
  it('readImageSize(bytes) reads PNG and JPEG sizes from the header and agrees with decodeImage', () => {
    const png = encodePng({ width: 7, height: 5, bitDepth: 8, data: new Uint8Array(35) });
    expect(readImageSize(png, 'a.png')).toEqual({ width: 7, height: 5 });
    const rgba = new Uint8Array(9 * 4 * 4).fill(128);
    const jpeg = new Uint8Array(encodeJpeg({ width: 9, height: 4, data: rgba }, 90).data);
    expect(readImageSize(jpeg, 'a.jpg')).toEqual({ width: 9, height: 4 });
    const decoded = decodeImage(jpeg, 'a.jpg');
    expect([decoded.width, decoded.height]).toEqual([9, 4]);
  });
  it('readImageSize rejects a file that is no image with the decoder error naming the file', () => {
    expect(() => readImageSize(new Uint8Array([1, 2, 3, 4]), 'x.bin')).toThrow(/x\.bin/);
  });
});
