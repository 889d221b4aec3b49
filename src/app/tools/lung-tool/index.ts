// The lung-template tool's states; start it with lungAwaiting('right').
export { lungAwaiting, LUNG_PROMPTS } from './awaiting';
export { lungDrawing } from './drawing';
