import { useEffect, useMemo, useRef, useState } from 'react';
import { Image as KonvaImage, Layer, Stage } from 'react-konva';
import type Konva from 'konva';
import { pointInRect } from '../../core/box-geometry';
import type { DecodedImage } from '../../dataset/types';
import type { AppState, AppStore } from '../state';
import { hoverCell } from '../state';
import { canvasToImage, drawStudyScene, type CanvasPoint, type RegionFeatureMap, type SentenceMap } from '../draw';
import { boxIdle, createToolRunner, lungAwaiting, type ToolRunner, type ToolState } from '../tools';
import { paintGreyImage } from './grey-image';
import { ShapeNodes } from './ShapeNodes';
import type { ToolMode } from './use-keyboard-shortcuts';
import { useViewport } from './use-viewport';

export interface StudyCanvasProps {
  readonly state: AppState;
  readonly store: AppStore;
  readonly image: DecodedImage | undefined;
  readonly map: SentenceMap | undefined;
  readonly mapVisible: boolean;
  /** The study's region features for the 'features' overlay (view.overlay); undefined until the study is encoded. */
  readonly features?: RegionFeatureMap;
  readonly tool: ToolMode;
  readonly zoomRequest: { how: 'in' | 'out' | 'fit'; n: number };
  /** Where links to the best cells start, canvas pixels. */
  readonly linkAnchorY: number | undefined;
  readonly label: string;
  readonly onPrompt: (prompt: string | undefined) => void;
  readonly onProblem: (m: string) => void;
}


const KEY_AT: CanvasPoint = { canvasX: 8, canvasY: 8 };

function useElementSize(ref: React.RefObject<HTMLDivElement | null>) {
  const [size, setSize] = useState({ width: 0, height: 0 });
  useEffect(() => {
    const el = ref.current;
    if (!el) return;
    const measure = () => setSize({ width: el.clientWidth, height: el.clientHeight });
    measure();
    const ro = new ResizeObserver(measure);
    ro.observe(el);
    return () => ro.disconnect();
  }, [ref]);
  return size;
}

/**
 * The study on a Konva stage: the grey image (display window), then the draw module's layers
 * (grid, cell overlay, outlines, links, lung template, boxes, proposals, tool preview). The cell
 * overlay is the map or, when view.overlay is 'features', the region features with their key;
 * `mapVisible` shows or hides either. Wheel zooms about the pointer; space + drag or the middle
 * button pans; the pointer tools get image pixels.
 */
export function StudyCanvas(p: StudyCanvasProps) {
  const { state, store } = p;
  const host = useRef<HTMLDivElement>(null);
  const size = useElementSize(host);
  const imageSize = p.image ? { width: p.image.width, height: p.image.height } : undefined;
  const sizeKey = imageSize ? `${imageSize.width}x${imageSize.height}` : '';
  const stableImageSize = useMemo(() => imageSize, [sizeKey]);
  const { viewport, zoomAt, pan } = useViewport(stableImageSize, size, p.zoomRequest);
  const shown = size.width > 0 && size.height > 0;
  const painted = useMemo(() => {
    if (!p.image || !shown) return undefined;
    try {
      return { canvas: paintGreyImage(p.image, state.view.window), error: undefined };
    } catch (err) {
      return { canvas: undefined, error: (err as Error).message };
    }
  }, [p.image, state.view.window, shown]);
  const bitmap = painted?.canvas;
  const paintError = painted?.error;
  const { onProblem } = p;
  useEffect(() => {
    if (paintError !== undefined) onProblem(paintError);
  }, [paintError, onProblem]);

  const viewportRef = useRef(viewport);
  viewportRef.current = viewport;
  const [toolState, setToolState] = useState<ToolState | undefined>();
  const runner = useRef<ToolRunner | undefined>(undefined);
  useEffect(() => {
    if (p.tool === 'inspect') {
      runner.current = undefined;
      setToolState(undefined);
      return;
    }
    const r = createToolRunner(p.tool === 'box' ? boxIdle() : lungAwaiting('right'), () => ({
      store,
      tolerancePx: 6 / viewportRef.current.scale,
      minBoxPx: 3,
    }));
    runner.current = r;
    setToolState(r.state);
    const off = r.subscribe(setToolState);
    return () => {
      off();
      r.reset(r.state);
    };
  }, [p.tool, store]);
  const { onPrompt } = p;
  useEffect(() => onPrompt(toolState?.prompt), [toolState?.prompt, onPrompt]);

  const [spaceHeld, setSpaceHeld] = useState(false);
  useEffect(() => {
    const down = (e: KeyboardEvent) => {
      if (e.key === ' ' && document.activeElement === host.current) {
        e.preventDefault();
        setSpaceHeld(true);
      }
      if (e.key === 'Escape') runner.current?.dispatch({ type: 'key', key: 'Escape' });
    };
    const up = (e: KeyboardEvent) => e.key === ' ' && setSpaceHeld(false);
    window.addEventListener('keydown', down);
    window.addEventListener('keyup', up);
    return () => {
      window.removeEventListener('keydown', down);
      window.removeEventListener('keyup', up);
    };
  }, []);

  const panning = useRef<{ x: number; y: number } | undefined>(undefined);
  const pointerOf = (e: Konva.KonvaEventObject<MouseEvent>): CanvasPoint | undefined => {
    const pos = e.target.getStage()?.getPointerPosition();
    return pos ? { canvasX: pos.x, canvasY: pos.y } : undefined;
  };
  const safely = (fn: () => void) => {
    try {
      fn();
    } catch (err) {
      p.onProblem((err as Error).message);
    }
  };
  const cellAt = (c: CanvasPoint): number | undefined => {
    if (!p.map) return undefined;
    const pt = canvasToImage(viewport, c);
    const i = p.map.cells.findIndex((r) => pointInRect(pt, r));
    return i < 0 ? undefined : i;
  };

  const features = p.features;
  const showFeatures = state.view.overlay === 'features';
  const scene = drawStudyScene({
    state,
    viewport,
    map: p.map,
    features,
    linkAnchor: p.linkAnchorY === undefined ? undefined : { canvasX: size.width - 2, canvasY: p.linkAnchorY },
    toolPreview: toolState?.preview,
    // The map's scale is the legend below the canvas; the features' key is drawn on it.
    legendAt: showFeatures ? KEY_AT : undefined,
  });
  const cursor = panning.current || spaceHeld ? 'grab' : (toolState?.cursor ?? 'default');

  return (
    <div
      ref={host}
      className="t-canvas"
      tabIndex={0}
      role="img"
      aria-label={showFeatures && p.mapVisible ? `${p.label}; overlay: region features (principal components as colours)` : p.label}
      // canvas = image * scale + offset (draw/viewport.ts), for tests and scripts that point at image pixels.
      data-viewport={`${viewport.scale},${viewport.offsetX},${viewport.offsetY}`}
      style={{ cursor }}
      onContextMenu={(e) => e.preventDefault()}
    >
      {shown && (
        <Stage
          width={size.width}
          height={size.height}
          onWheel={(e) => {
            e.evt.preventDefault();
            const at = pointerOf(e as unknown as Konva.KonvaEventObject<MouseEvent>);
            if (at) zoomAt(at, e.evt.deltaY);
          }}
          onMouseDown={(e) => {
            host.current?.focus();
            const at = pointerOf(e);
            if (!at) return;
            if (e.evt.button === 1 || spaceHeld) {
              e.evt.preventDefault();
              panning.current = { x: at.canvasX, y: at.canvasY };
              return;
            }
            if (e.evt.button !== 0) return;
            if (runner.current) safely(() => runner.current?.dispatch({ type: 'down', point: canvasToImage(viewport, at) }));
            else safely(() => hoverCell(store, cellAt(at)));
          }}
          onMouseMove={(e) => {
            const at = pointerOf(e);
            if (!at) return;
            if (panning.current) {
              pan(at.canvasX - panning.current.x, at.canvasY - panning.current.y);
              panning.current = { x: at.canvasX, y: at.canvasY };
              return;
            }
            safely(() => hoverCell(store, cellAt(at)));
            if (runner.current) safely(() => runner.current?.dispatch({ type: 'move', point: canvasToImage(viewport, at) }));
          }}
          onMouseUp={(e) => {
            if (panning.current) {
              panning.current = undefined;
              return;
            }
            const at = pointerOf(e);
            if (at && runner.current) safely(() => runner.current?.dispatch({ type: 'up', point: canvasToImage(viewport, at) }));
          }}
          onMouseLeave={() => {
            panning.current = undefined;
          }}
        >
          <Layer>
            {bitmap && scene.image && (
              <KonvaImage image={bitmap} x={scene.image.x} y={scene.image.y} width={scene.image.width} height={scene.image.height} listening={false} imageSmoothingEnabled={false} />
            )}
          </Layer>
          <Layer listening={false}>
            {p.mapVisible && <ShapeNodes shapes={scene.map} />}
            <ShapeNodes shapes={scene.grid} />
            {p.mapVisible && <ShapeNodes shapes={scene.grounding} />}
            <ShapeNodes shapes={scene.annotations} />
            <ShapeNodes shapes={scene.tool} />
            {p.mapVisible && <ShapeNodes shapes={scene.legend} />}
          </Layer>
        </Stage>
      )}
    </div>
  );
}
