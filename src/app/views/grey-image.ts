import type { DecodedImage } from '../../dataset/types';
import { toUnitIntensity } from '../../core/voi-window';

/**
 * Paints a decoded image into a canvas in grey for display: values through the window (the DICOM
 * linear VOI function of src/core) or the image's value range, then to 0..255.
 */
export function paintGreyImage(image: DecodedImage, window: { centre: number; width: number } | undefined, canvas: HTMLCanvasElement = document.createElement('canvas')): HTMLCanvasElement {
  canvas.width = image.width;
  canvas.height = image.height;
  const ctx = canvas.getContext('2d');
  if (!ctx) throw new Error('this browser gave no 2D canvas context; the image cannot be shown.');
  const unit = toUnitIntensity(image, window);
  const pixels = ctx.createImageData(image.width, image.height);
  const out = pixels.data;
  for (let i = 0; i < unit.length; i++) {
    const v = Number.isNaN(unit[i]) ? 0 : Math.round(unit[i] * 255);
    out[4 * i] = v;
    out[4 * i + 1] = v;
    out[4 * i + 2] = v;
    out[4 * i + 3] = 255;
  }
  ctx.putImageData(pixels, 0, 0);
  return canvas;
}

/** The window the image is shown with when none is set: its own (DICOM) or its value range. */
export function defaultWindow(image: DecodedImage): { centre: number; width: number } {
  if (image.window) return image.window;
  const [lo, hi] = image.valueRange;
  // The VOI function maps [c - w/2, c + w/2] to [0, 1], which with w = hi - lo + 1 covers the range.
  return { centre: (lo + hi + 1) / 2, width: Math.max(1, hi - lo + 1) };
}
