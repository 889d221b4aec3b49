/** Shape descriptors in CANVAS pixels, for the canvas component to render as they are. */

export interface RectShape {
  readonly kind: 'rect';
  readonly id: string;
  readonly x: number;
  readonly y: number;
  readonly width: number;
  readonly height: number;
  readonly fill?: string;
  readonly stroke?: string;
  readonly strokeWidth?: number;
  readonly dash?: readonly number[];
  readonly opacity?: number;
}

export interface LineShape {
  readonly kind: 'line';
  readonly id: string;
  /** x0, y0, x1, y1, ... */
  readonly points: readonly number[];
  readonly stroke: string;
  readonly strokeWidth: number;
  readonly dash?: readonly number[];
  readonly opacity?: number;
}

export interface TextShape {
  readonly kind: 'text';
  readonly id: string;
  readonly x: number;
  readonly y: number;
  readonly text: string;
  readonly fontSize: number;
  readonly fill: string;
  readonly align?: 'left' | 'center' | 'right';
}

/** Where the decoded image goes on the canvas. */
export interface ImagePlacement {
  readonly kind: 'image';
  readonly id: string;
  readonly x: number;
  readonly y: number;
  readonly width: number;
  readonly height: number;
}

export type Shape = RectShape | LineShape | TextShape;

/**
 * Colours of overlays drawn over a grey image and a cividis map: the Okabe-Ito colour-blind-safe
 * palette (Okabe and Ito 2008, "Color Universal Design"; hex values from memory).
 */
export const OVERLAY_COLOURS = {
  box: '#E69F00', // orange
  selectedBox: '#F0E442', // yellow
  proposal: '#56B4E9', // sky blue
  lungs: '#009E73', // bluish green
  bestCell: '#D55E00', // vermillion
  topK: '#CC79A7', // reddish purple
  link: '#D55E00',
  grid: '#FFFFFF',
  draft: '#FFFFFF',
  label: '#FFFFFF',
} as const;
