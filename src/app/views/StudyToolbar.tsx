import type { DecodedImage } from '../../dataset/types';
import type { AppState, AppStore } from '../state';
import { canRedo, canUndo, redo, setOpacity, setOverlay, setShowGrid, setShowLinks, setTopK, setWindow, undo, type CellOverlay } from '../state';
import { defaultWindow } from './grey-image';
import type { ToolMode } from './use-keyboard-shortcuts';

export interface StudyToolbarProps {
  readonly state: AppState;
  readonly store: AppStore;
  readonly image: DecodedImage | undefined;
  readonly tool: ToolMode;
  readonly onTool: (t: ToolMode) => void;
  readonly mapVisible: boolean;
  readonly onToggleMap: () => void;
  readonly onZoom: (how: 'in' | 'out' | 'fit') => void;
  readonly cellCount: number | undefined;
}

const TOOLS: readonly { id: ToolMode; label: string; key: string }[] = [
  { id: 'inspect', label: 'Inspect', key: 'V' },
  { id: 'box', label: 'Boxes', key: 'B' },
  { id: 'lungs', label: 'Lung template', key: 'L' },
];

const OVERLAYS: readonly { id: CellOverlay; label: string; title: string }[] = [
  { id: 'map', label: 'Similarity map', title: "The selected sentence's cosine similarity with each cell (cividis)" },
  { id: 'features', label: 'Region features', title: "The cells' embeddings on their first three principal components, as red, green and blue" },
];

function Toggle({ label, on, onChange, keyHint }: { label: string; on: boolean; onChange: (v: boolean) => void; keyHint: string }) {
  return (
    <button type="button" className="t-button" aria-pressed={on} onClick={() => onChange(!on)} title={`${label} (${keyHint})`}>
      {label}
    </button>
  );
}

/** Tools, layers, the cell overlay (map or region features) and its opacity, top-k, display window, zoom and undo for the study canvas. */
export function StudyToolbar(p: StudyToolbarProps) {
  const { view } = p.state;
  const win = view.window ?? (p.image ? defaultWindow(p.image) : undefined);
  const [lo, hi] = p.image?.valueRange ?? [0, 255];
  const span = Math.max(1, hi - lo);
  const step = span > 1000 ? Math.round(span / 500) : 1;
  return (
    <div className="t-toolbar" role="toolbar" aria-label="Study tools">
      <span className="t-toolbar__group" role="group" aria-label="Pointer tool">
        {TOOLS.map((t) => (
          <button key={t.id} type="button" className="t-button" aria-pressed={p.tool === t.id} onClick={() => p.onTool(t.id)} title={`${t.label} (${t.key})`}>
            {t.label}
          </button>
        ))}
      </span>
      <span className="t-toolbar__group" role="group" aria-label="Layers">
        <Toggle label="Map" on={p.mapVisible} onChange={p.onToggleMap} keyHint="M" />
        <Toggle label="Grid" on={view.showGrid} onChange={(v) => setShowGrid(p.store, v)} keyHint="G" />
        <Toggle label="Links" on={view.showLinks} onChange={(v) => setShowLinks(p.store, v)} keyHint="K" />
      </span>
      <span className="t-toolbar__group" role="group" aria-label="Cell overlay">
        {OVERLAYS.map((o) => (
          <button key={o.id} type="button" className="t-button" aria-pressed={view.overlay === o.id} onClick={() => setOverlay(p.store, o.id)} title={o.title}>
            {o.label}
          </button>
        ))}
      </span>
      <label className="t-toolbar__field">
        Overlay opacity
        <input type="range" min={0} max={1} step={0.05} value={view.opacity} onChange={(e) => setOpacity(p.store, Number(e.target.value))} />
      </label>
      <label className="t-toolbar__field">
        Top cells
        <input
          type="number"
          min={1}
          max={p.cellCount}
          value={view.topK}
          style={{ width: '4em' }}
          onChange={(e) => {
            const k = Number(e.target.value);
            if (Number.isInteger(k) && k >= 1 && (p.cellCount === undefined || k <= p.cellCount)) setTopK(p.store, k);
          }}
        />
      </label>
      {win && (
        <span className="t-toolbar__group" role="group" aria-label="Display window">
          <label className="t-toolbar__field">
            Level
            <input
              type="range"
              min={lo}
              max={hi}
              step={step}
              value={win.centre}
              onChange={(e) => setWindow(p.store, { centre: Number(e.target.value), width: win.width })}
            />
          </label>
          <label className="t-toolbar__field">
            Width
            <input
              type="range"
              min={1}
              max={span * 2}
              step={step}
              value={win.width}
              onChange={(e) => setWindow(p.store, { centre: win.centre, width: Math.max(1, Number(e.target.value)) })}
            />
          </label>
          <span className="t-toolbar__value" aria-live="polite">
            {Math.round(win.centre)} / {Math.round(win.width)}
          </span>
          <button type="button" className="t-button" onClick={() => setWindow(p.store, undefined)} disabled={view.window === undefined}>
            Reset window
          </button>
        </span>
      )}
      <span className="t-toolbar__group" role="group" aria-label="Zoom">
        <button type="button" className="t-button" onClick={() => p.onZoom('out')} aria-label="Zoom out" title="Zoom out (-)">
          −
        </button>
        <button type="button" className="t-button" onClick={() => p.onZoom('fit')} title="Fit (0)">
          Fit
        </button>
        <button type="button" className="t-button" onClick={() => p.onZoom('in')} aria-label="Zoom in" title="Zoom in (+)">
          +
        </button>
      </span>
      <span className="t-toolbar__group" role="group" aria-label="History">
        <button type="button" className="t-button" disabled={!canUndo(p.state)} onClick={() => undo(p.store)} title="Undo (Ctrl+Z)">
          Undo
        </button>
        <button type="button" className="t-button" disabled={!canRedo(p.state)} onClick={() => redo(p.store)} title="Redo (Ctrl+Shift+Z)">
          Redo
        </button>
      </span>
    </div>
  );
}
