import { describe, expect, it } from 'vitest';
import { makeTestStore } from '../../state/test-support';
import { undo } from '../../state/commands';
import { createToolRunner } from '../runner';
import { lungAwaiting } from './awaiting';

function setup() {
  const store = makeTestStore();
  const tool = createToolRunner(lungAwaiting('right'), () => ({ store, tolerancePx: 3, minBoxPx: 4 }));
  const rect = (x0: number, y0: number, x1: number, y1: number) => {
    tool.dispatch({ type: 'down', point: { x: x0, y: y0 } });
    tool.dispatch({ type: 'move', point: { x: x1, y: y1 } });
    tool.dispatch({ type: 'up', point: { x: x1, y: y1 } });
  };
  return { store, tool, rect };
}

describe('lung tool', () => {
  it("lungAwaiting('right'): the right lung (viewer's left) then the left lung make one template", () => {
    const { store, tool, rect } = setup();
    expect(tool.state.prompt).toMatch(/patient's right lung \(on the viewer's left\)/);
    rect(40, 30, 160, 240);
    expect(tool.state.name).toBe('awaiting-left');
    expect(tool.state.preview).toEqual([{ kind: 'lung-right', rect: { x: 40, y: 30, w: 120, h: 210 } }]);
    expect(store.get().lungs).toEqual({});
    rect(240, 30, 360, 240);
    expect(tool.state.name).toBe('awaiting-right');
    expect(store.get().lungs['study-a']).toMatchObject({ right: { x: 40, y: 30, w: 120, h: 210 }, left: { x: 240, y: 30, w: 120, h: 210 }, annotator: 'tester' });
    undo(store);
    expect(store.get().lungs).toEqual({});
  });

  it('a left lung on the wrong side is refused with a notice and asked for again', () => {
    const { store, tool, rect } = setup();
    rect(240, 30, 360, 240);
    rect(40, 30, 160, 240);
    expect(store.get().lungs).toEqual({});
    expect(tool.state.name).toBe('awaiting-left');
    expect(store.get().notices.at(-1)?.text).toMatch(/viewer's right of the right lung/);
  });

  it('Escape while the left lung is awaited starts over; a tiny rectangle is ignored', () => {
    const { store, tool, rect } = setup();
    rect(40, 30, 160, 240);
    tool.dispatch({ type: 'key', key: 'Escape' });
    expect(tool.state.name).toBe('awaiting-right');
    expect(tool.state.preview).toEqual([]);
    rect(10, 10, 12, 12);
    expect(tool.state.name).toBe('awaiting-right');
    expect(store.get().lungs).toEqual({});
  });
});
