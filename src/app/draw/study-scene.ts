import type { SentenceGrounding } from '../../core/ground-sentence';
import type { GridShape, ImageRect } from '../../core/types';
import { proposalsFor } from '../state/proposals';
import { boxesOfStudy, selectedStudy } from '../state/queries';
import type { AppState } from '../state/records';
import type { ToolPreview } from '../tools/types';
import { boxShapes, lungTemplateShapes, proposalShapes, toolPreviewShapes } from './annotation-shapes';
import { valueDomain } from './colour-scale';
import { featureCellShapes, featureKeyShapes, type RegionFeatureMap } from './feature-shapes';
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
  /** The study's region features, drawn instead of the map when view.overlay is 'features'. */
  readonly features?: RegionFeatureMap;
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
  /** The cell overlay: the map's cells or the region features' cells, as view.overlay says. */
  readonly map: readonly Shape[];
  readonly grounding: readonly Shape[];
  readonly annotations: readonly Shape[];
  readonly tool: readonly Shape[];
  readonly legend: readonly Shape[];
}

/**
 * Everything drawn over the selected study for the given records, viewport and map: image
 * placement, grid (when view.showGrid), the cell overlay at view.opacity with its legend (the
 * map's cividis cells when view.overlay is 'map', the region features' colours and key when it is
 * 'features'), best and top-k cell outlines, links to the best cells (when view.showLinks and an
 * anchor is given), lung template, boxes, proposals and the tool's preview. No selected study:
 * every layer empty.
 */
export function drawStudyScene({ state, viewport, map, features, linkAnchor, toolPreview = [], legendAt }: StudySceneInput): StudyScene {
  const study = selectedStudy(state);
  const empty: StudyScene = { grid: [], map: [], grounding: [], annotations: [], tool: [], legend: [] };
  if (!study) return empty;
  const image: ImagePlacement | undefined = study.imageSize
    ? { kind: 'image', id: `image-${study.id}`, ...rectToCanvas(viewport, { x: 0, y: 0, w: study.imageSize.width, h: study.imageSize.height }) }
    : undefined;
  const { view } = state;
  const showFeatures = view.overlay === 'features';
  const cellGrid = map ?? features;
  const grid = cellGrid && view.showGrid ? gridLineShapes(cellGrid.grid, cellGrid.cells, viewport) : [];
  const domain = map ? valueDomain(map.values) : undefined;
  let overlay: Shape[] = [];
  let legend: Shape[] = [];
  if (showFeatures && features) {
    overlay = featureCellShapes(features.grid, features.cells, features.colours.rgb, viewport, { opacity: view.opacity });
    if (legendAt) legend = featureKeyShapes({ varianceShare: features.colours.varianceShare, x: legendAt.canvasX, y: legendAt.canvasY });
  } else if (!showFeatures && map && domain) {
    overlay = mapCellShapes(map.grid, map.cells, map.values, viewport, { domain, opacity: view.opacity });
    if (legendAt) legend = legendShapes({ domain, x: legendAt.canvasX, y: legendAt.canvasY });
  }
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
  return { ...(image ? { image } : {}), grid, map: overlay, grounding, annotations, tool: toolPreviewShapes(toolPreview, viewport), legend };
}
