import type { StudyEncoder } from '../../batch/score-set';
import type { InferenceClient, OpenedModel } from './inference-client';

/**
 * src/batch's StudyEncoder over the inference worker, so the page runs scoreSet and buildSummary,
 * the same pipeline as the CLI. Image caching is left to scoreSet's store (pass client.imageStore),
 * which keys on the image file's bytes; `signal` cancels the request in flight.
 */
export function createPageStudyEncoder(client: InferenceClient, model: OpenedModel, { id = model.manifest.id, signal }: { id?: string; signal?: AbortSignal } = {}): StudyEncoder {
  const m = model.manifest;
  return {
    id,
    hash: model.hash,
    grid: { h: model.grid.h, w: model.grid.w },
    embeddingDim: m.embedding_dim,
    input: { width: m.image.input.width, height: m.image.input.height, resize: m.image.input.resize },
    encodeImage: (image) => client.encodeImage(model.hash, image, undefined, { signal }),
    encodeSentences: (texts) => client.encodeSentences(model.hash, texts, { signal }),
  };
}
