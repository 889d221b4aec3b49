/**
 * Shared plain types of the core. Coordinate spaces are kept apart by name:
 * - image pixels: the original image as decoded (where reference boxes live);
 * - input pixels: the encoder input after the resize policy;
 * - grid cells: (row, col) of the encoder's region grid, row-major index = row * w + col.
 */

/** A dense row-major matrix of float32 values. */
export interface Matrix {
  readonly data: Float32Array;
  readonly rows: number;
  readonly cols: number;
}

/** Size in pixels. */
export interface Size {
  readonly width: number;
  readonly height: number;
}

/** Axis-aligned rectangle in original image pixels: [x, x + w) x [y, y + h). */
export interface ImageRect {
  readonly x: number;
  readonly y: number;
  readonly w: number;
  readonly h: number;
}

/** Axis-aligned rectangle in encoder-input pixels. */
export interface InputRect {
  readonly inputX: number;
  readonly inputY: number;
  readonly inputW: number;
  readonly inputH: number;
}

/** A point in original image pixels. */
export interface ImagePoint {
  readonly x: number;
  readonly y: number;
}

/** The encoder's region grid: h rows by w columns. */
export interface GridShape {
  readonly h: number;
  readonly w: number;
}

export type ResizePolicy = 'stretch' | 'letterbox' | 'centre-crop';

/**
 * The exact affine map from original image pixels to encoder-input pixels:
 * inputX = x * scaleX + offsetX, inputY = y * scaleY + offsetY.
 * Letterbox has positive offsets (padding); centre crop has negative ones.
 */
export interface ResizeTransform {
  readonly policy: ResizePolicy;
  readonly source: Size;
  readonly input: Size;
  readonly scaleX: number;
  readonly scaleY: number;
  readonly offsetX: number;
  readonly offsetY: number;
}

/** The six lung zones; 'right' is the patient's right, shown on the viewer's left (common practice). */
export type LungZone =
  | 'right-upper'
  | 'right-middle'
  | 'right-lower'
  | 'left-upper'
  | 'left-middle'
  | 'left-lower';

export const LUNG_ZONES: readonly LungZone[] = [
  'right-upper',
  'right-middle',
  'right-lower',
  'left-upper',
  'left-middle',
  'left-lower',
];

/** A zone label on a reference box: a lung zone, or a non-lung structure. */
export type ZoneLabel = LungZone | 'cardiac' | 'mediastinal' | 'other';

/** Region pooling of one sentence's similarities over the cells (the aggregator). */
export type Aggregator =
  | { readonly kind: 'max' }
  | { readonly kind: 'softmax'; readonly temperature: number }
  | { readonly kind: 'lse'; readonly sharpness: number }
  | { readonly kind: 'topk'; readonly k: number };

/** Hit rules for grounding. */
export type HitRule = 'centre' | 'overlap' | 'upsampled';

/** A named tensor as it crosses from an inference adapter into plain code. */
export interface PlainTensor {
  readonly data: Float32Array;
  readonly dims: readonly number[];
}
