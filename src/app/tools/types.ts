import type { ImagePoint, ImageRect } from '../../core/types';
import type { AppStore } from '../state/store';

/** A pointer or key event for a tool; points are in IMAGE pixels (the view converts from canvas). */
export type ToolEvent =
  | { readonly type: 'down' | 'move' | 'up'; readonly point: ImagePoint }
  | { readonly type: 'key'; readonly key: string };

export interface ToolContext {
  readonly store: AppStore;
  /** Pointer slop and handle reach, image pixels (canvas pixels / viewport scale). */
  readonly tolerancePx: number;
  /** Smallest box side kept when a drawn box is released, image pixels. */
  readonly minBoxPx: number;
}

/** What a tool draws while it works (the draw module turns it into shapes). */
export interface ToolPreview {
  readonly kind: 'draft-box' | 'lung-right' | 'lung-left';
  readonly rect: ImageRect;
}

/** One state of a tool's state machine; handling an event gives the next state (often itself). */
export interface ToolState {
  readonly tool: 'box' | 'lungs';
  readonly name: string;
  readonly preview: readonly ToolPreview[];
  /** A CSS cursor name for the view. */
  readonly cursor: string;
  /** A short instruction for the researcher, when the state has one. */
  readonly prompt?: string;
  handle(ctx: ToolContext, event: ToolEvent): ToolState;
}
