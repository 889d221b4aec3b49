// Browser-safe API of the dataset layer; Node-only helpers live in node-file-source.ts.
export * from './types';
export { DatasetError, formatProblemMessage, makeProblem, type DatasetErrorCode, type DatasetErrorOptions, type Problem } from './errors';
export { crc32, decodePng, encodePng, type DecodedPng, type PngColourType, type PngEncodeInput } from './png-codec';
export { decodeImage, sniffImageFormat, PNG_SYNTHETIC_KEYWORD, type ImageFormat } from './decode-image';
export { decodeDicom, isDicomPart10, COMPRESSED_TRANSFER_SYNTAXES, UNCOMPRESSED_TRANSFER_SYNTAXES } from './dicom';
export {
  deterministicUid,
  encodeDicom,
  EXPLICIT_VR_LITTLE_ENDIAN,
  SECONDARY_CAPTURE_SOP_CLASS,
  SYNTHETIC_MARKER,
  SYNTHETIC_PATIENT_NAME,
  type DicomEncodeInput,
} from './dicom-writer';
export { loadSampleSet, validateSampleSetManifest, SET_FILE, ZONE_LABELS, type ManifestValidation } from './sample-set';
export { checkSchemaVersion, migrateAnnotationsV1ToV2, type VersionCheck } from './migrations';
export { loadAnnotations, serialiseAnnotations, type AnnotationContext, type CurrentSentence, type LoadedAnnotations, type StaleBox } from './annotations';
export {
  CSV_HEADER,
  COCO_FORMAT,
  exportCoco,
  exportCsv,
  importCoco,
  importCsv,
  parseCsv,
  type CocoAnnotation,
  type CocoDocument,
  type CocoImage,
  type InterchangeImage,
} from './interchange';
