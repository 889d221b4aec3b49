import { describe, expect, it } from 'vitest';
import { expectClose } from '../../tests/support/expect-close';
import type { DecodedImage } from '../dataset/types';
import { preprocessImage, preprocessingTag, stackImageTensors, type ImageInputSpec } from './preprocess';

function image(width: number, height: number, f: (x: number, y: number) => number, valueRange: [number, number] = [0, 255]): DecodedImage {
  const data = new Float32Array(width * height);
  for (let y = 0; y < height; y++) for (let x = 0; x < width; x++) data[y * width + x] = f(x, y);
  return { width, height, data, format: 'png', bitDepth: 8, valueRange };
}

const grey = (over: Partial<ImageInputSpec> = {}): ImageInputSpec => ({
  name: 'pixel_values', channels: 1, height: 64, width: 64, scale: 1, mean: [0], std: [1], resize: 'stretch', ...over,
});

const at = (t: { data: ArrayLike<number> }, c: number, y: number, x: number, w = 64, h = 64): number => t.data[c * w * h + y * w + x] as number;

describe('preprocessImage geometry', () => {
  it("preprocessImage(128 x 64, 'stretch') halves x only and records the transform", () => {
    const { tensor, transform } = preprocessImage(image(128, 64, (x) => x), grey());
    expect(tensor.dims).toEqual([1, 1, 64, 64]);
    expect(transform).toMatchObject({ policy: 'stretch', scaleX: 0.5, scaleY: 1, offsetX: 0, offsetY: 0 });
    // Input column u averages image columns 2u and 2u + 1 (a 2x shrink): (2u + 0.5) / 255.
    expectClose(at(tensor, 0, 10, 5), 10.5 / 255, 1e-6);
  });

  it("preprocessImage(128 x 64, 'letterbox') pads 16 rows above and below with pad_value", () => {
    const input = grey({ resize: 'letterbox', pad_value: 0.25, mean: [0.5], std: [0.5] });
    const { tensor, transform } = preprocessImage(image(128, 64, () => 255), input);
    expect(transform).toMatchObject({ policy: 'letterbox', scaleX: 0.5, scaleY: 0.5, offsetX: 0, offsetY: 16 });
    const pad = (0.25 - 0.5) / 0.5;
    const white = (1 - 0.5) / 0.5;
    for (const y of [0, 15, 48, 63]) expectClose(at(tensor, 0, y, 30), pad, 1e-6);
    for (const y of [16, 32, 47]) expectClose(at(tensor, 0, y, 30), white, 1e-6);
  });

  it("preprocessImage(128 x 64, 'centre-crop') keeps the middle 64 columns at scale 1", () => {
    const { tensor, transform } = preprocessImage(image(128, 64, (x, y) => x + y), grey({ resize: 'centre-crop' }));
    expect(transform).toMatchObject({ policy: 'centre-crop', scaleX: 1, scaleY: 1, offsetX: -32, offsetY: 0 });
    for (const [u, v] of [[0, 0], [63, 10], [20, 63]]) expectClose(at(tensor, 0, v, u), (u + 32 + v) / 255, 1e-6);
  });

  it('preprocessImage maps image corners through the transform into the input frame (letterbox, portrait)', () => {
    const { transform: t } = preprocessImage(image(50, 100, () => 0), grey({ resize: 'letterbox' }));
    // 50 x 100 into 64 x 64: scale 0.64, 16 px of padding left and right.
    expectClose([t.scaleX, t.offsetX, t.offsetY], [0.64, 16, 0], 1e-12);
    expectClose([100 * t.scaleY + t.offsetY, 50 * t.scaleX + t.offsetX], [64, 48], 1e-12);
  });

  it('preprocessImage(64 x 64, stretch) at the input size is the identity resample', () => {
    const im = image(64, 64, (x, y) => (x * 7 + y * 3) % 256);
    const { tensor } = preprocessImage(im, grey());
    expectClose(tensor.data as Float32Array, Array.from(im.data, (v) => v / 255), 1e-6);
  });

  it('preprocessImage(1 x 1 image) fills the whole input with its one value', () => {
    const { tensor } = preprocessImage(image(1, 1, () => 51), grey({ width: 4, height: 4 }));
    expectClose(tensor.data as Float32Array, new Array(16).fill(0.2), 1e-6);
  });
});

describe('preprocessImage intensities and channels', () => {
  it('preprocessImage replicates grey into 3 channels, each with its own mean and std', () => {
    const input = grey({ channels: 3, mean: [0.1, 0.2, 0.3], std: [0.5, 0.25, 2], scale: 1 });
    const { tensor } = preprocessImage(image(64, 64, () => 255), input);
    expect(tensor.dims).toEqual([1, 3, 64, 64]);
    expectClose([at(tensor, 0, 5, 5), at(tensor, 1, 5, 5), at(tensor, 2, 5, 5)], [0.9 / 0.5, 0.8 / 0.25, 0.7 / 2], 1e-6);
  });

  it('preprocessImage multiplies by scale before subtracting the mean ([0, 255] models)', () => {
    const input = grey({ scale: 255, mean: [127.5], std: [127.5] });
    const { tensor } = preprocessImage(image(64, 64, (x) => (x < 32 ? 0 : 255)), input);
    expectClose([at(tensor, 0, 0, 0), at(tensor, 0, 0, 63)], [-1, 1], 1e-6);
  });

  it('preprocessImage(16-bit image) maps valueRange to [0, 1] and clamps beyond it', () => {
    const im = image(64, 64, (x) => (x === 0 ? 70000 : x === 1 ? -5 : 32767.5), [0, 65535]);
    const { tensor } = preprocessImage(im, grey());
    expectClose([at(tensor, 0, 0, 0), at(tensor, 0, 0, 1), at(tensor, 0, 0, 40)], [1, 0, 0.5], 1e-6);
  });

  it('preprocessImage(image, input, { window }) applies the DICOM linear VOI window', () => {
    const im = image(64, 64, (x) => x * 100, [0, 6300]);
    const { tensor } = preprocessImage(im, grey(), { window: { centre: 1000.5, width: 1001 } });
    // DICOM PS3.3 C.11.2.1.2.1: below c - 0.5 - (w - 1) / 2 = 500 -> 0, above 1500 -> 1.
    expectClose([at(tensor, 0, 0, 5), at(tensor, 0, 0, 10), at(tensor, 0, 0, 20)], [0, 0.5, 1], 1e-6);
  });

  it('preprocessImage keeps every normalised value within the bounds the settings allow', () => {
    const input = grey({ mean: [0.4], std: [0.2], resize: 'letterbox', pad_value: 0 });
    let seed = 7;
    const rand = (): number => ((seed = (seed * 16807) % 2147483647) / 2147483647) * 255;
    const { tensor } = preprocessImage(image(97, 41, () => rand()), input);
    for (const v of tensor.data as Float32Array) {
      expect(v).toBeGreaterThanOrEqual((0 - 0.4) / 0.2 - 1e-6);
      expect(v).toBeLessThanOrEqual((1 - 0.4) / 0.2 + 1e-6);
    }
  });

  it('preprocessImage lets a NaN pixel through as NaN (the encoder output check reports it)', () => {
    const { tensor } = preprocessImage(image(64, 64, (x, y) => (x === 3 && y === 4 ? NaN : 10)), grey());
    expect(Number.isNaN(at(tensor, 0, 4, 3))).toBe(true);
    expect(at(tensor, 0, 4, 5)).toBeCloseTo(10 / 255, 6);
  });

  it('preprocessImage rejects data of the wrong length and empty images', () => {
    const bad = { ...image(4, 4, () => 0), width: 5 };
    expect(() => preprocessImage(bad, grey())).toThrow(/'image.data' must hold width \* height = 20 values; got 16/);
    expect(() => preprocessImage({ ...image(1, 1, () => 0), width: 0, data: new Float32Array(0) }, grey())).toThrow(RangeError);
  });
});

describe('stackImageTensors and preprocessingTag', () => {
  it('stackImageTensors([a, b]) concatenates along a new batch axis', () => {
    const a = preprocessImage(image(64, 64, () => 0), grey()).tensor;
    const b = preprocessImage(image(64, 64, () => 255), grey()).tensor;
    const s = stackImageTensors([a, b]);
    expect(s.dims).toEqual([2, 1, 64, 64]);
    expect([s.data[0], s.data[4096]]).toEqual([0, 1]);
    expect(() => stackImageTensors([])).toThrow(RangeError);
  });

  it('preprocessingTag changes with every setting that changes the input, and with the window', () => {
    const base = preprocessingTag(grey());
    const variants = [
      preprocessingTag(grey({ resize: 'letterbox' })), preprocessingTag(grey({ mean: [0.5] })), preprocessingTag(grey({ scale: 255 })),
      preprocessingTag(grey({ width: 32 })), preprocessingTag(grey({ pad_value: 0.5 })), preprocessingTag(grey(), { centre: 1, width: 2 }),
    ];
    expect(new Set([base, ...variants]).size).toBe(variants.length + 1);
    expect(preprocessingTag(grey())).toBe(base);
  });
});
