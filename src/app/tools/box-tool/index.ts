// The box tool's states; start it with boxIdle().
export { boxIdle } from './idle';
export { boxPointing } from './pointing';
export { boxDragging } from './dragging';
export { boxPressing } from './pressing';
export { boxMoving } from './moving';
export { boxResizing } from './resizing';
