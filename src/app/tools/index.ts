// Public API of the pointer tools: state machines fed with events in image pixels.
export type { ToolContext, ToolEvent, ToolPreview, ToolState } from './types';
export { createToolRunner, type ToolRunner } from './runner';
export { HANDLES, HANDLE_CURSORS, handlePoint, hitBox, hitHandle, resizeRect, type Handle } from './handles';
export { clampPoint, rectFromCorners } from './geometry';
export * from './box-tool';
export * from './lung-tool';
