import { describe, expect, it } from 'vitest';
import { addBox } from '../state/commands';
import { makeTestStore } from '../state/test-support';
import { boxIdle } from './box-tool';
import { lungAwaiting } from './lung-tool';
import { createToolRunner } from './runner';

describe('createToolRunner', () => {
  it('reset(state) mid-move cancels the open drag and switches tool; listeners see each new state', () => {
    const store = makeTestStore();
    const b = addBox(store, { rect: { x: 10, y: 10, w: 20, h: 20 } });
    const tool = createToolRunner(boxIdle(), () => ({ store, tolerancePx: 2, minBoxPx: 4 }));
    const names: string[] = [];
    const off = tool.subscribe((s) => names.push(s.name));
    tool.dispatch({ type: 'down', point: { x: 15, y: 15 } });
    tool.dispatch({ type: 'move', point: { x: 60, y: 60 } });
    expect(store.get().boxes[b.id].box.x).toBe(55);
    tool.reset(lungAwaiting('right'));
    off();
    expect(store.get().boxes[b.id].box).toEqual({ x: 10, y: 10, w: 20, h: 20 });
    expect(store.get().history.drag).toBeUndefined();
    expect(names).toEqual(['pressing', 'moving', 'awaiting-right']);
    expect(tool.state.tool).toBe('lungs');
  });
});
