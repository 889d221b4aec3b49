import { MIN_PHANTOM_SIZE } from './generate-phantom-study';

export type PhantomFormat = 'png' | 'dcm' | 'mixed';
// Each study holds a few dozen size x size float layers; 2048 px keeps a study under about 1 GB.
export const MAX_PHANTOM_SIZE = 2048;

export const PHANTOM_FORMATS: readonly PhantomFormat[] = ['png', 'dcm', 'mixed'];

/**
 * Options of a synthetic sample set. 'mixed' writes mostly 8-bit PNG with one 16-bit PNG and
 * one DICOM (MONOCHROME2 and MONOCHROME1 in turn) in every 12 studies. */
export interface PhantomSetOptions {
  readonly n: number;
  readonly seed: number;
  readonly size?: number;
  readonly format?: PhantomFormat;
  readonly bitDepth?: 8 | 16;
  readonly name?: string;
  /** Also write masks/<id>.png: 8-bit ground-truth masks, one bit per finding kind (MASK_BITS). */
  readonly masks?: boolean;
  readonly onProgress?: (done: number, total: number) => void;
}

/** Every problem with a set's options, one message each (empty when they are fine). */
export function phantomSetProblems(options: PhantomSetOptions): string[] {
  const { n, seed, size = 512, format = 'png', bitDepth = 8 } = options;
  const problems: string[] = [];
  if (!Number.isInteger(n) || n < 1) problems.push(`'n' must be an integer >= 1; got ${n}`);
  if (!Number.isSafeInteger(seed) || seed < 0) problems.push(`'seed' must be a non-negative integer; got ${seed}`);
  if (!Number.isInteger(size) || size < MIN_PHANTOM_SIZE || size > MAX_PHANTOM_SIZE) problems.push(`'size' must be an integer in [${MIN_PHANTOM_SIZE}, ${MAX_PHANTOM_SIZE}]; got ${size}`);
  if (!PHANTOM_FORMATS.includes(format)) problems.push(`'format' must be one of ${PHANTOM_FORMATS.join(', ')}; got '${String(format)}'`);
  if (bitDepth !== 8 && bitDepth !== 16) problems.push(`'bitDepth' must be 8 or 16; got ${String(bitDepth)}`);
  return problems;
}

/** Bit of each finding kind in a written mask image; the heart (cardiac silhouette) has its own bit. */
export const MASK_BITS: Readonly<Record<string, number>> = {
  consolidation: 1,
  nodule: 2,
  effusion: 4,
  pneumothorax: 8,
  atelectasis: 16,
  edema: 32,
  heart: 64,
};
