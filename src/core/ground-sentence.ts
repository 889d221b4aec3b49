import type { GridShape, HitRule, ImagePoint, ImageRect, ResizeTransform, Size } from './types';
import { cellIndexToRowCol } from './grid-geometry';
import { coveredAreasInto, unionArea } from './box-geometry';
import {
  centreHit,
  chanceLevels,
  overlapHit,
  prepareStudyGeometry,
  requireBestCell,
  upsampledPoint,
  validateHitArgs,
  type StudyGeometry,
} from './hit-rules';
import { topKHit } from './top-k-hit';
import { DEFAULT_MASS_TEMPERATURE, massInBoxes } from './mass-in-boxes';
import { contrastToNoise } from './contrast-to-noise';
import { thresholdedIouFromAreas, type ThresholdIou } from './thresholded-iou';
import { isLateralitySwap } from './laterality-swap';

/** Every grounding measure of one sentence's map against its reference boxes. */
export interface SentenceGrounding {
  /** The best cell (first maximum, NaN ignored). */
  readonly bestCell: { readonly index: number; readonly row: number; readonly col: number };
  /** Centre of the best cell's image rectangle, image pixels. */
  readonly bestPoint: ImagePoint;
  /**
   * Centre of the arg-max pixel of the bilinearly upsampled map, image pixels; undefined when no
   * visible pixel has a number (NaN cells around every numbered node), and then hits.upsampled
   * is false.
   */
  readonly upsampledPoint: ImagePoint | undefined;
  readonly hits: Readonly<Record<HitRule, boolean>>;
  readonly chance: Readonly<Record<HitRule, number>>;
  /** Any of the topK best cells' centres in an enlarged box. */
  readonly topKHit: boolean;
  /** Share of softmax(values / massTemperature) mass inside the box union, in [0, 1]. */
  readonly massInBoxes: number;
  /** Contrast-to-noise ratio, cells with centre in a box vs the rest; undefined when degenerate. */
  readonly cnr: number | undefined;
  /** IoU of the thresholded map with the box union at 0.25, 0.5, 0.75. */
  readonly iou: readonly ThresholdIou[];
  /** A centre-rule miss whose best point lies in the mirrored boxes. */
  readonly lateralitySwap: boolean;
}

export interface GroundSentenceArgs {
  /** The sentence's similarity map, grid.h * grid.w values, row-major cells. */
  readonly values: Float32Array;
  readonly grid: GridShape;
  /** gridCellRects(transform, grid). */
  readonly cells: readonly ImageRect[];
  readonly transform: ResizeTransform;
  readonly imageSize: Size;
  /** Reference boxes, image pixels; each must be valid for the image (validateImageBox). */
  readonly boxes: readonly ImageRect[];
  /** Enlarges boxes on every side for the centre, upsampled, top-k and swap tests; default 0. */
  readonly tolerancePx?: number;
  /** Cells counted by topKHit; default 5, or every cell when the grid has fewer. */
  readonly topK?: number;
  /** Softmax temperature of massInBoxes; default 0.1. */
  readonly massTemperature?: number;
  /** Mirror line of the laterality swap; default the image midline, width / 2. */
  readonly midlineX?: number;
  /** prepareStudyGeometry(transform, grid, cells), to share across a study's sentences. */
  readonly geometry?: StudyGeometry;
}

/**
 * Grounds one sentence: the best cell, the three hit rules (evaluateHit) with their chance levels
 * (chanceLevel), top-k hit, softmax mass in the boxes, CNR (cells whose centre lies in a box as
 * drawn vs the rest), thresholded IoU and the laterality swap, in one pass over shared geometry.
 * The one implementation used by the batch pipeline and the explorer. Pass `geometry` from
 * prepareStudyGeometry to reuse a study's per-cell work. No boxes: every hit false, chance 0,
 * mass 0, cnr undefined. Throws a RangeError listing every bad argument, and when every value
 * is NaN (there is no best cell).
 */
export function groundSentence(args: GroundSentenceArgs): SentenceGrounding {
  const { values, grid, boxes } = args;
  validateHitArgs(args, args.geometry);
  const tolerancePx = args.tolerancePx ?? 0;
  const geometry = args.geometry ?? prepareStudyGeometry(args.transform, grid, args.cells);
  const n = values.length;
  const best = requireBestCell(values);
  const { row, col } = cellIndexToRowCol(grid, best);
  const bestPoint = geometry.centres[best];
  const up = upsampledPoint(values, geometry);
  const hits: Record<HitRule, boolean> = {
    centre: centreHit(bestPoint, boxes, tolerancePx),
    overlap: overlapHit(geometry.cells[best], boxes),
    upsampled: up !== undefined && centreHit(up, boxes, tolerancePx),
  };
  const { covered, fraction, inside } = geometry.scratch;
  coveredAreasInto(geometry.cells, geometry.cellEdges, boxes, covered);
  const { centreX, centreY, cellAreas } = geometry;
  for (let i = 0; i < n; i++) {
    const a = cellAreas[i];
    fraction[i] = a > 0 ? covered[i] / a : 0;
    const cx = centreX[i];
    const cy = centreY[i];
    let hit = 0;
    for (let k = 0; k < boxes.length; k++) {
      // pointInRect with no tolerance: the boxes as drawn.
      const b = boxes[k];
      if (cx >= b.x && cx <= b.x + b.w && cy >= b.y && cy <= b.y + b.h) {
        hit = 1;
        break;
      }
    }
    inside[i] = hit;
  }
  const topK = args.topK ?? Math.min(5, n);
  return {
    bestCell: { index: best, row, col },
    bestPoint,
    upsampledPoint: up,
    hits,
    chance: chanceLevels(geometry, boxes, tolerancePx),
    topKHit: topKHit(values, geometry.centres, boxes, { k: topK, tolerancePx }),
    massInBoxes: massInBoxes(values, fraction, { temperature: args.massTemperature ?? DEFAULT_MASS_TEMPERATURE }) ?? 0,
    cnr: contrastToNoise(values, inside),
    iou: thresholdedIouFromAreas(values, geometry.cellAreas, covered, unionArea(boxes)),
    lateralitySwap: isLateralitySwap({
      point: bestPoint,
      boxes,
      hit: hits.centre,
      imageSize: args.imageSize,
      midlineX: args.midlineX,
      tolerancePx,
    }),
  };
}
