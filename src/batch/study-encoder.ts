import type { StudyEncoder } from './score-set';
import type { DecodedImage } from '../dataset/types';
import type { ModelManifest } from '../model/types';

/** The parts of src/model's DualEncoder the pipeline uses. */
export interface DualEncoderLike {
  readonly manifest: ModelManifest;
  readonly hash: string;
  encodeImage(image: DecodedImage, options?: { window?: DecodedImage['window'] }): Promise<{ readonly embeddings: Float32Array }>;
  encodeSentences(texts: readonly string[]): Promise<Float32Array>;
}

/** Adapts an opened model to the pipeline's StudyEncoder; `id` defaults to the manifest id. */
export function toStudyEncoder(dual: DualEncoderLike, id = dual.manifest.id): StudyEncoder {
  const m = dual.manifest;
  return {
    id,
    hash: dual.hash,
    grid: { h: m.image.output.grid.h, w: m.image.output.grid.w },
    embeddingDim: m.embedding_dim,
    input: { width: m.image.input.width, height: m.image.input.height, resize: m.image.input.resize },
    // The file's own VOI window (DICOM) decides the intensities the encoder sees, as a viewer would.
    encodeImage: async (image) => (await dual.encodeImage(image, { window: image.window })).embeddings,
    encodeSentences: (texts) => dual.encodeSentences([...texts]),
  };
}
