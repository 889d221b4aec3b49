import { computeResizeTransform } from '../core/resize-transform';
import { resampleToInput } from '../core/resample-bilinear';
import type { ResizeTransform } from '../core/types';
import { toUnitIntensity } from '../core/voi-window';
import type { DecodedImage } from '../dataset/types';
import type { ModelManifest, NamedTensor } from './types';

export type ImageInputSpec = ModelManifest['image']['input'];
/** A VOI window in the units of the image data; without one, valueRange maps to [0, 1]. */
export type IntensityWindow = Parameters<typeof toUnitIntensity>[1];

/** A NamedTensor known to hold float32 data. */
export type Float32Tensor = NamedTensor & { readonly type: 'float32'; readonly data: Float32Array };

export interface PreprocessedImage {
  /** [1, C, H, W] float32, ready for the image encoder. */
  readonly tensor: Float32Tensor;
  /** The exact map from original image pixels to input pixels. */
  readonly transform: ResizeTransform;
}

/**
 * Turns a decoded image into the image encoder's input as the manifest declares it:
 * intensities to [0, 1] (window, or the image's value range), the resize policy (stretch,
 * letterbox padded with pad_value, or centre crop) by bilinear resampling, the grey plane copied
 * into each declared channel, then `(v * scale - mean[c]) / std[c]`. The transform used is returned
 * so grid cells map back to original pixels.
 */
export function preprocessImage(
  image: DecodedImage,
  input: ImageInputSpec,
  { window }: { window?: IntensityWindow } = {},
): PreprocessedImage {
  if (!Number.isInteger(image.width) || !Number.isInteger(image.height) || image.width < 1 || image.height < 1) {
    throw new RangeError(`'image' must have integer width and height >= 1; got ${image.width} x ${image.height}`);
  }
  if (image.data.length !== image.width * image.height) {
    throw new RangeError(`'image.data' must hold width * height = ${image.width * image.height} values; got ${image.data.length}`);
  }
  const unit = toUnitIntensity(image, window);
  const source = { width: image.width, height: image.height };
  const size = { width: input.width, height: input.height };
  const transform = computeResizeTransform(source, size, input.resize);
  const plane = resampleToInput(unit, source, transform, input.pad_value ?? 0);
  const n = input.width * input.height;
  const data = new Float32Array(input.channels * n);
  for (let c = 0; c < input.channels; c++) {
    const mean = input.mean[c];
    const std = input.std[c];
    const offset = c * n;
    for (let i = 0; i < n; i++) data[offset + i] = (plane[i] * input.scale - mean) / std;
  }
  return { tensor: { type: 'float32', data, dims: [1, input.channels, input.height, input.width] }, transform };
}

/** Stacks [1, C, H, W] tensors into one [N, C, H, W] batch. */
export function stackImageTensors(tensors: readonly Float32Tensor[]): Float32Tensor {
  if (tensors.length === 0) throw new RangeError("'tensors' must hold at least one tensor; got 0");
  const [, c, h, w] = tensors[0].dims;
  const per = c * h * w;
  const data = new Float32Array(tensors.length * per);
  tensors.forEach((t, i) => data.set(t.data, i * per));
  return { type: 'float32', data, dims: [tensors.length, c, h, w] };
}

/** A short tag of everything in preprocessing that changes the encoder input, for cache keys. */
export function preprocessingTag(input: ImageInputSpec, window?: IntensityWindow): string {
  const parts = [
    `c${input.channels}`,
    `${input.width}x${input.height}`,
    input.resize,
    `pad${input.pad_value ?? 0}`,
    `s${input.scale}`,
    `m${input.mean.join(',')}`,
    `sd${input.std.join(',')}`,
    window === undefined ? 'range' : `w${JSON.stringify(window)}`,
  ];
  return parts.join('|');
}
