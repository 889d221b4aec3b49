import type { GridShape } from '../../core/types';
import type { Problem as ModelProblem } from '../../model/contract';
import type { ModelManifest } from '../../model/types';

/** What opening a model gives the page: the checked manifest, its content hash and region grid. */
export interface OpenedModel {
  readonly manifest: ModelManifest;
  readonly hash: string;
  readonly grid: GridShape;
}

/** A decoded image as it crosses to the worker (the fields preprocessing reads). */
export interface ImagePayload {
  readonly width: number;
  readonly height: number;
  readonly data: Float32Array;
  readonly format: 'png' | 'jpeg' | 'dicom';
  readonly bitDepth: number;
  readonly valueRange: readonly [number, number];
  readonly window?: { readonly centre: number; readonly width: number };
}

/** Stages of one encoding request, in order. */
export type EncodeStage = 'queued' | 'running' | 'done';

export type WorkerRequest =
  | { readonly id: number; readonly type: 'open-model'; readonly label: string; readonly files: Readonly<Record<string, Uint8Array>> }
  | { readonly id: number; readonly type: 'encode-image'; readonly modelHash: string; readonly image: ImagePayload }
  | { readonly id: number; readonly type: 'encode-sentences'; readonly modelHash: string; readonly texts: readonly string[] }
  | { readonly id: number; readonly type: 'release-model'; readonly modelHash: string }
  | { readonly id: number; readonly type: 'runtime-info' }
  /** Drops request `target` if it has not started; a running ONNX run cannot be interrupted. */
  | { readonly id: number; readonly type: 'cancel'; readonly target: number };

/** A failure as it crosses back: the message, and the contract problems when a model folder broke it. */
export interface WorkerFailure {
  readonly name: string;
  readonly message: string;
  readonly code?: string;
  readonly file?: string;
  readonly problems?: readonly ModelProblem[];
}

export interface RuntimeInfo {
  readonly crossOriginIsolated: boolean;
  readonly threads: number;
  readonly wasmPaths: string;
}

export type WorkerResponse =
  | { readonly id: number; readonly type: 'progress'; readonly stage: EncodeStage }
  | { readonly id: number; readonly type: 'result'; readonly value: unknown }
  | { readonly id: number; readonly type: 'error'; readonly error: WorkerFailure };
