// Public API of drawing: plain functions from records, viewport and map data to shape descriptors.
export * from './shapes';
export * from './viewport';
export { CIVIDIS_CONTROL_POINTS, cividis, cividisHex, normaliseToDomain, rgbToHex, valueDomain } from './colour-scale';
export { gridLineShapes, legendShapes, mapCellShapes, type LegendOptions } from './map-shapes';
export {
  featureCellShapes,
  featureColourHex,
  featureKeyShapes,
  regionFeatureColours,
  type RegionFeatureColours,
  type RegionFeatureMap,
} from './feature-shapes';
export { bestCellShapes, linkShapes, rankedCells } from './grounding-shapes';
export { boxShapes, lungTemplateShapes, proposalShapes, toolPreviewShapes } from './annotation-shapes';
export { drawStudyScene, type SentenceMap, type StudyScene, type StudySceneInput } from './study-scene';
