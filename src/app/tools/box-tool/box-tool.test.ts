import { describe, expect, it } from 'vitest';
import { addBox, selectSentence, undo } from '../../state/commands';
import { makeTestStore } from '../../state/test-support';
import { createToolRunner } from '../runner';
import type { ToolContext } from '../types';
import { boxIdle } from './idle';

function setup() {
  const store = makeTestStore();
  const ctx: ToolContext = { store, tolerancePx: 3, minBoxPx: 4 };
  const tool = createToolRunner(boxIdle(), () => ctx);
  const down = (x: number, y: number) => tool.dispatch({ type: 'down', point: { x, y } });
  const move = (x: number, y: number) => tool.dispatch({ type: 'move', point: { x, y } });
  const up = (x: number, y: number) => tool.dispatch({ type: 'up', point: { x, y } });
  const key = (k: string) => tool.dispatch({ type: 'key', key: k });
  return { store, tool, down, move, up, key };
}

describe('box tool', () => {
  it('boxIdle(): down, drag, up draws a box for the selected sentence through idle, pointing, dragging', () => {
    const { store, tool, down, move, up } = setup();
    const names: string[] = [tool.state.name];
    down(100, 80);
    names.push(tool.state.name);
    move(120, 90);
    names.push(tool.state.name);
    move(150, 130);
    expect(tool.state.preview).toEqual([{ kind: 'draft-box', rect: { x: 100, y: 80, w: 50, h: 50 } }]);
    up(150, 130);
    names.push(tool.state.name);
    expect(names).toEqual(['idle', 'pointing', 'dragging', 'idle']);
    expect(Object.values(store.get().boxes).map((b) => [b.box, b.sentence.index, b.zone])).toEqual([[{ x: 100, y: 80, w: 50, h: 50 }, 0, 'right-lower']]);
  });

  it('a draft dragged up-left and past the image edge is normalised and cut to the image', () => {
    const { store, down, move, up } = setup();
    down(30, 40);
    move(-50, -60);
    up(-50, -60);
    expect(Object.values(store.get().boxes)[0].box).toEqual({ x: 0, y: 0, w: 30, h: 40 });
  });

  it('a draft smaller than minBoxPx is dropped; Escape while dragging cancels', () => {
    const { store, down, move, up, key, tool } = setup();
    down(10, 10);
    move(20, 12);
    up(20, 12);
    expect(store.get().boxes).toEqual({});
    down(10, 10);
    move(80, 80);
    key('Escape');
    expect(tool.state.name).toBe('idle');
    up(80, 80);
    expect(store.get().boxes).toEqual({});
  });

  it('without a selected sentence a drag draws nothing and says why', () => {
    const { store, down, move, up } = setup();
    selectSentence(store, undefined);
    down(10, 10);
    move(80, 80);
    up(80, 80);
    expect(store.get().boxes).toEqual({});
    expect(store.get().notices.at(-1)?.text).toMatch(/Choose a sentence first/);
  });

  it('dragging a box body moves it, inside the image, as one undo step; Escape puts it back', () => {
    const { store, down, move, up, key } = setup();
    const b = addBox(store, { rect: { x: 100, y: 100, w: 40, h: 30 } });
    down(110, 110);
    for (let i = 1; i <= 10; i++) move(110 + i * 10, 110 + i * 5);
    up(210, 160);
    expect(store.get().boxes[b.id].box).toEqual({ x: 200, y: 150, w: 40, h: 30 });
    down(210, 160);
    move(2000, 2000);
    up(2000, 2000);
    expect(store.get().boxes[b.id].box).toEqual({ x: 360, y: 270, w: 40, h: 30 });
    undo(store);
    expect(store.get().boxes[b.id].box).toEqual({ x: 200, y: 150, w: 40, h: 30 });
    down(210, 160);
    move(250, 200);
    key('Escape');
    expect(store.get().boxes[b.id].box).toEqual({ x: 200, y: 150, w: 40, h: 30 });
    expect(store.get().history.drag).toBeUndefined();
  });

  it('each of the 8 handles of the selected box resizes its own edges, as one undo step', () => {
    const expected: Record<string, { x: number; y: number; w: number; h: number }> = {
      nw: { x: 90, y: 90, w: 50, h: 40 },
      n: { x: 100, y: 90, w: 40, h: 40 },
      ne: { x: 100, y: 90, w: 50, h: 40 },
      e: { x: 100, y: 100, w: 50, h: 30 },
      se: { x: 100, y: 100, w: 50, h: 40 },
      s: { x: 100, y: 100, w: 40, h: 40 },
      sw: { x: 90, y: 100, w: 50, h: 40 },
      w: { x: 90, y: 100, w: 50, h: 30 },
    };
    const at: Record<string, [number, number]> = { nw: [100, 100], n: [120, 100], ne: [140, 100], e: [140, 115], se: [140, 130], s: [120, 130], sw: [100, 130], w: [100, 115] };
    for (const [h, [x, y]] of Object.entries(at)) {
      const { store, down, move, up } = setup();
      const b = addBox(store, { rect: { x: 100, y: 100, w: 40, h: 30 } });
      const steps = store.get().history.past.length;
      const dx = h.includes('w') ? -10 : h.includes('e') ? 10 : 0;
      const dy = h.startsWith('n') ? -10 : h.startsWith('s') ? 10 : 0;
      down(x, y);
      move(x + dx / 2, y + dy / 2);
      move(x + dx, y + dy);
      up(x + dx, y + dy);
      expect([h, store.get().boxes[b.id].box]).toEqual([h, expected[h]]);
      expect(store.get().history.past.length).toBe(steps + 1);
    }
  });

  it('a click on another box selects it; a click on empty image clears the selection; Delete removes the selected box', () => {
    const { store, down, up, key } = setup();
    const a = addBox(store, { rect: { x: 10, y: 10, w: 40, h: 30 } });
    addBox(store, { rect: { x: 200, y: 200, w: 40, h: 30 } });
    down(20, 20);
    up(20, 20);
    expect(store.get().selection.boxId).toBe(a.id);
    key('Delete');
    expect(store.get().boxes[a.id]).toBeUndefined();
    down(300, 50);
    up(300, 50);
    expect(store.get().selection.boxId).toBeUndefined();
  });

  it('idle reports a resize cursor over a handle and a move cursor over a box', () => {
    const { store, move, tool } = setup();
    addBox(store, { rect: { x: 100, y: 100, w: 40, h: 30 } });
    move(101, 99);
    expect(tool.state.cursor).toBe('nwse-resize');
    move(120, 115);
    expect(tool.state.cursor).toBe('move');
    move(5, 5);
    expect(tool.state.cursor).toBe('crosshair');
  });
});
