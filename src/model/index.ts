// Browser-safe API of the model layer. Node-only code (adapters/ort-node, node/) is imported by path.
export * from './types';
export { validateManifest, parseManifest, formatProblem, describeValue, ModelContractError } from './contract';
export type { Problem, ModelContractCode } from './contract';
export { preprocessImage, stackImageTensors, preprocessingTag } from './preprocess';
export type { Float32Tensor, ImageInputSpec, IntensityWindow, PreprocessedImage } from './preprocess';
export { createDualEncoder, imageOutputToCells, poolTokenStates } from './encoders';
export type { DualEncoder, DualEncoderParts, EncodedImage, EncodeImageOptions } from './encoders';
export { checkImageOutput, checkTextOutput } from './output-checks';
export {
  MANIFEST_FILE,
  PROBE_SENTENCE,
  loadModelFolder,
  modelHash,
  openModelFolder,
  probeImage,
  probeModel,
  readManifest,
  tokenizerConfigPath,
} from './model-folder';
export type { LoadedModelFolder, OpenModelOptions, ProbeResult, ProbeRun, TokenizerFactory } from './model-folder';
export { embeddingCacheKey, fnv1a64 } from './embedding-cache-key';
export { encodeImageCached } from './cached-encoding';
export { inspectModel, formatInspectReport } from './inspect';
export type { InspectOptions, InspectReport } from './inspect';
export { sha256Hex, sha256HexOfText } from './sha256';
export { createOrtWebEngine } from './adapters/ort-web';
export { createTokenizerFromJson } from './adapters/hf-tokenizer';
