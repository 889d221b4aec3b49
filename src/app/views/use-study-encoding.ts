import { useEffect, useState } from 'react';
import type { DecodedImage, FileSource } from '../../dataset/types';
import { decodeImage } from '../../dataset/decode-image';
import type { InferenceClient, OpenedModel } from '../inference/inference-client';
import { contentHashOf } from '../inference/inference-client';

export type EncodingStatus =
  | { readonly kind: 'idle' }
  | { readonly kind: 'loading'; readonly stage: string }
  | { readonly kind: 'ready' }
  | { readonly kind: 'failed'; readonly message: string };

export interface StudyEncoding {
  readonly studyId?: string;
  readonly image?: DecodedImage;
  /** Cell embeddings as encoded (grid.h * grid.w * D) and sentence embeddings (S * D), for `modelHash`. */
  readonly cells?: Float32Array;
  readonly sentences?: Float32Array;
  readonly modelHash?: string;
  readonly status: EncodingStatus;
}

export interface StudyEncodingArgs {
  readonly source: FileSource | undefined;
  readonly studyId: string | undefined;
  readonly imagePath: string | undefined;
  readonly texts: readonly string[];
  readonly client: InferenceClient;
  readonly model: OpenedModel | undefined;
  readonly onImageSize?: (studyId: string, size: { width: number; height: number }) => void;
}

/**
 * Decodes the selected study's image and has the inference worker encode it and its sentences
 * (the client caches both). Changing study cancels the requests in flight.
 */
export function useStudyEncoding({ source, studyId, imagePath, texts, client, model, onImageSize }: StudyEncodingArgs): StudyEncoding {
  const [state, setState] = useState<StudyEncoding>({ status: { kind: 'idle' } });
  const textKey = texts.join('\u0000');
  useEffect(() => {
    if (!source || !studyId || !imagePath) {
      setState({ status: { kind: 'idle' } });
      return;
    }
    const ac = new AbortController();
    const { signal } = ac;
    (async () => {
      setState({ studyId, status: { kind: 'loading', stage: 'reading the image' } });
      const bytes = await source.readBytes(imagePath);
      const image = decodeImage(bytes, imagePath);
      if (signal.aborted) return;
      onImageSize?.(studyId, { width: image.width, height: image.height });
      if (!model) {
        setState({ studyId, image, status: { kind: 'idle' } });
        return;
      }
      setState({ studyId, image, status: { kind: 'loading', stage: 'encoding the image' } });
      const cells = await client.encodeImage(model.hash, image, await contentHashOf(bytes), { signal });
      setState({ studyId, image, status: { kind: 'loading', stage: 'encoding the sentences' } });
      const sentences = texts.length > 0 ? await client.encodeSentences(model.hash, texts, { signal }) : new Float32Array(0);
      if (signal.aborted) return;
      setState({ studyId, image, cells, sentences, modelHash: model.hash, status: { kind: 'ready' } });
    })().catch((err: unknown) => {
      if (signal.aborted) return;
      setState((s) => ({ ...s, studyId, status: { kind: 'failed', message: (err as Error).message } }));
    });
    return () => ac.abort(new DOMException('The study changed.', 'AbortError'));
    // Texts are keyed by their joined text, so a new array of the same sentences does not re-run.
  }, [source, studyId, imagePath, textKey, client, model]);
  return state;
}
