import type { ImageRect, LungZone, ZoneLabel } from '../core/types';

/** Current versions of our own formats. */
export const SET_SCHEMA = 'tessera.set/1';
export const ANNOTATIONS_SCHEMA = 'tessera.annotations/2';

/** A labelled finding of a study (ground truth from the generator, or the researcher's labels). */
export interface FindingLabel {
  readonly finding: string; // e.g. 'consolidation', 'nodule', 'effusion', 'pneumothorax', 'atelectasis', 'cardiomegaly', 'edema'
  readonly zones: readonly ZoneLabel[];
  readonly severity?: number; // e.g. edema grade 0..3
}

export interface StudyRecord {
  readonly id: string;
  readonly image: string; // path relative to the set folder
  readonly report: string;
  readonly labels?: {
    readonly findings?: readonly FindingLabel[];
    readonly edema_grade?: number;
    readonly [key: string]: unknown;
  };
}

/** set.json in a sample-set folder. */
export interface SampleSetManifest {
  readonly schema: typeof SET_SCHEMA;
  readonly name: string;
  readonly synthetic: boolean;
  readonly description?: string;
  readonly annotations?: string; // relative path of the annotation file, default 'annotations.json'
  readonly studies: readonly StudyRecord[];
}

/** Ties a box to one sentence of one study; text and hash detect an edited report. */
export interface SentenceKey {
  readonly index: number; // index of the sentence in the parsed report
  readonly text: string; // the sentence text when the box was drawn
  readonly hash: string; // hashSentenceText(text)
}

/** One reference box, in original image pixels. */
export interface ReferenceBox {
  readonly id: string;
  readonly study: string;
  readonly sentence: SentenceKey;
  readonly zone: ZoneLabel;
  readonly box: ImageRect;
  readonly annotator: string;
  readonly created: string; // ISO 8601
}

/** Lung extents marked once per study; the six zones are derived from them. */
export interface LungTemplate {
  readonly study: string;
  readonly right: ImageRect; // patient's right lung (viewer's left)
  readonly left: ImageRect;
  readonly annotator: string;
  readonly created: string;
}

/** annotations.json in a sample-set folder. */
export interface AnnotationFile {
  readonly schema: typeof ANNOTATIONS_SCHEMA;
  readonly set: string; // name of the sample set it belongs to
  readonly boxes: readonly ReferenceBox[];
  readonly lungs?: readonly LungTemplate[];
}

export type { ImageRect, LungZone, ZoneLabel };

/** A decoded image as single-channel float values, before display mapping. */
export interface DecodedImage {
  readonly width: number;
  readonly height: number;
  /** Row-major values; for DICOM after the modality LUT and MONOCHROME1 inversion (higher = brighter). */
  readonly data: Float32Array;
  readonly format: 'png' | 'jpeg' | 'dicom';
  readonly bitDepth: number; // 8 or 16 for PNG/JPEG; BitsStored for DICOM
  /** The value range that maps to black..white when no window is given. */
  readonly valueRange: readonly [number, number];
  /** VOI window from the file (DICOM), in the units of data. */
  readonly window?: { readonly centre: number; readonly width: number };
  readonly pixelSpacingMm?: readonly [number, number]; // [row spacing, column spacing]
  readonly synthetic?: boolean;
}

/**
 * Read access to a folder (a sample set or a model folder), shared by the CLI (disk) and the
 * browser (directory picker, file input, or bundled demo served by the page). Paths use '/'.
 */
export interface FileSource {
  readonly label: string; // shown in messages, e.g. the folder path
  readBytes(path: string): Promise<Uint8Array>;
  readText(path: string): Promise<string>;
  exists(path: string): Promise<boolean>;
}

/** Write access to an output folder. */
export interface FileSink {
  writeFile(path: string, data: Uint8Array | string): Promise<void>;
}
