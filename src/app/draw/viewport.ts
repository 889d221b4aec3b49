import type { ImagePoint, ImageRect, Size } from '../../core/types';

/** canvas = image * scale + offset, for both axes. */
export interface Viewport {
  readonly scale: number;
  readonly offsetX: number;
  readonly offsetY: number;
}

/** A point in canvas pixels (kept apart from ImagePoint by its field names). */
export interface CanvasPoint {
  readonly canvasX: number;
  readonly canvasY: number;
}

function checkViewport(v: Viewport): void {
  if (!(Number.isFinite(v.scale) && v.scale > 0) || !Number.isFinite(v.offsetX) || !Number.isFinite(v.offsetY)) {
    throw new RangeError(`'viewport' must have a finite scale > 0 and finite offsets; got scale ${v.scale}, offset ${v.offsetX}, ${v.offsetY}`);
  }
}

export function imageToCanvas(v: Viewport, p: ImagePoint): CanvasPoint {
  checkViewport(v);
  return { canvasX: p.x * v.scale + v.offsetX, canvasY: p.y * v.scale + v.offsetY };
}

export function canvasToImage(v: Viewport, c: CanvasPoint): ImagePoint {
  checkViewport(v);
  return { x: (c.canvasX - v.offsetX) / v.scale, y: (c.canvasY - v.offsetY) / v.scale };
}

/** An image rect on the canvas: { x, y, width, height } in canvas pixels. */
export function rectToCanvas(v: Viewport, r: ImageRect): { x: number; y: number; width: number; height: number } {
  const p = imageToCanvas(v, r);
  return { x: p.canvasX, y: p.canvasY, width: r.w * v.scale, height: r.h * v.scale };
}

/** The viewport that shows the whole image centred in the canvas, `margin` canvas pixels from the edges. */
export function fitViewport(image: Size, canvas: Size, { margin = 0 }: { margin?: number } = {}): Viewport {
  if (!(image.width > 0 && image.height > 0)) throw new RangeError(`'image' must have width and height > 0; got ${image.width} x ${image.height}`);
  const cw = canvas.width - 2 * margin;
  const ch = canvas.height - 2 * margin;
  if (!(cw > 0 && ch > 0)) throw new RangeError(`'canvas' must be larger than twice the margin (${margin}); got ${canvas.width} x ${canvas.height}`);
  const scale = Math.min(cw / image.width, ch / image.height);
  return { scale, offsetX: (canvas.width - image.width * scale) / 2, offsetY: (canvas.height - image.height * scale) / 2 };
}

/**
 * Zooms by `factor` about a canvas point, which keeps showing the same image point; the scale
 * is held in [minScale, maxScale]. RangeError for a factor that is not finite and > 0.
 */
export function zoomAbout(v: Viewport, at: CanvasPoint, factor: number, { minScale = 0.02, maxScale = 64 }: { minScale?: number; maxScale?: number } = {}): Viewport {
  if (!(Number.isFinite(factor) && factor > 0)) throw new RangeError(`'factor' must be a finite number > 0; got ${factor}`);
  const p = canvasToImage(v, at);
  const scale = Math.max(minScale, Math.min(maxScale, v.scale * factor));
  return { scale, offsetX: at.canvasX - p.x * scale, offsetY: at.canvasY - p.y * scale };
}

/** Moves the view by dx, dy canvas pixels. */
export function panBy(v: Viewport, dx: number, dy: number): Viewport {
  checkViewport(v);
  if (!(Number.isFinite(dx) && Number.isFinite(dy))) throw new RangeError(`'dx' and 'dy' must be finite; got ${dx}, ${dy}`);
  return { scale: v.scale, offsetX: v.offsetX + dx, offsetY: v.offsetY + dy };
}
