import type { SentenceGrounding } from '../../core/ground-sentence';
import type { GridShape, ImageRect } from '../../core/types';
import { proposalsFor } from '../state/proposals';
import { boxesOfStudy, selectedStudy } from '../state/queries';
import type { AppState } from '../state/records';
import type { ToolPreview } from '../tools/types';
import { boxShapes, lungTemplateShapes, proposalShapes, toolPreviewShapes } from './annotation-shapes';
import { valueDomain } from './colour-scale';
import { bestCellShapes, linkShapes, rankedCells } from './grounding-shapes';
import { gridLineShapes, legendShapes, mapCellShapes } from './map-shapes';
import type { ImagePlacement, Shape } from './shapes';
import { rectToCanvas, type CanvasPoint, type Viewport } from './viewport';

/** The selected sentence's map over the region grid. */
export interface SentenceMap {
  readonly grid: GridShape;
  readonly cells: readonly ImageRect[]; // gridCellRects, image pixels
  readonly values: ArrayLike<number>; // row-major, one per cell
  readonly grounding?: SentenceGrounding; // from groundSentence, when the sentence has boxes
}

export interface StudySceneInput {
  readonly state: AppState;
  readonly viewport: Viewport;
  readonly map?: SentenceMap;
  /** Where links start: the selected sentence's place beside the image, canvas pixels. */
  readonly linkAnchor?: CanvasPoint;
  readonly toolPreview?: readonly ToolPreview[];
  /** Top-left of the legend, canvas pixels. */
  readonly legendAt?: CanvasPoint;
}

/** Shapes in drawing order, one list per layer. */
export interface StudyScene {
  readonly image?: ImagePlacement;
  readonly grid: readonly Shape[];
  readonly map: readonly Shape[];
  readonly grounding: readonly Shape[];
  readonly annotations: readonly Shape[];
  readonly tool: readonly Shape[];
  readonly legend: readonly Shape[];
}

/**
 * Everything drawn over the selected study for the given records, viewport and map: image
 * placement, grid (when view.showGrid), map cells at view.opacity with legend, best and top-k
 * cell outlines, links to the best cells (when view.showLinks and an anchor is given), lung
 * template, boxes, proposals and the tool's preview. No selected study: every layer empty.
 */
export function drawStudyScene({ state, viewport, map, linkAnchor, toolPreview = [], legendAt }: StudySceneInput): StudyScene {
  const study = selectedStudy(state);
  const empty: StudyScene = { grid: [], map: [], grounding: [], annotations: [], tool: [], legend: [] };
  if (!study) return empty;
  const image: ImagePlacement | undefined = study.imageSize
    ? { kind: 'image', id: `image-${study.id}`, ...rectToCanvas(viewport, { x: 0, y: 0, w: study.imageSize.width, h: study.imageSize.height }) }
    : undefined;
  const { view } = state;
  const grid = map && view.showGrid ? gridLineShapes(map.grid, map.cells, viewport) : [];
  const domain = map ? valueDomain(map.values) : undefined;
  const mapShapes = map && domain ? mapCellShapes(map.grid, map.cells, map.values, viewport, { domain, opacity: view.opacity }) : [];
  const legend = domain && legendAt ? legendShapes({ domain, x: legendAt.canvasX, y: legendAt.canvasY }) : [];
  const grounding: Shape[] = [];
  if (map && domain) {
    const outlines = bestCellShapes(map.values, map.cells, viewport, { topK: view.topK, bestCell: map.grounding?.bestCell.index });
    grounding.push(...outlines);
    if (view.showLinks && linkAnchor) {
      grounding.push(...linkShapes(linkAnchor, rankedCells(map.values, view.topK, map.grounding?.bestCell.index), map.cells, viewport));
    }
  }
  const lungs = state.lungs[study.id];
  const annotations: Shape[] = [
    ...(lungs ? lungTemplateShapes(lungs, viewport) : []),
    ...boxShapes(boxesOfStudy(state, study.id), viewport, { selectedId: state.selection.boxId }),
    ...proposalShapes(proposalsFor(state), viewport),
  ];
  return { ...(image ? { image } : {}), grid, map: mapShapes, grounding, annotations, tool: toolPreviewShapes(toolPreview, viewport), legend };
}
