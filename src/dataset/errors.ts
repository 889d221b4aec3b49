/** Codes of operational failures in the dataset layer; the UI and CLI turn each into an action. */
export type DatasetErrorCode =
  | 'set-schema'
  | 'set-json'
  | 'missing-image'
  | 'unreadable-image'
  | 'duplicate-study'
  | 'empty-report'
  | 'box-outside-image'
  | 'box-zero-area'
  | 'box-unknown-study'
  | 'duplicate-box'
  | 'stale-annotation'
  | 'annotation-schema'
  | 'annotation-version'
  | 'unsupported-transfer-syntax'
  | 'unsupported-image'
  | 'interchange-format';

/** One problem found while reading a file; validators return every problem at once. */
export interface Problem {
  readonly code: DatasetErrorCode;
  /** The file the problem is in, as the user knows it (e.g. 'samples/demo/set.json'). */
  readonly file: string;
  /** The item inside the file: a study id, a box id, a JSON path, or '' for the whole file. */
  readonly item: string;
  readonly message: string;
  /** What the user can do about it. */
  readonly fix: string;
}

export interface DatasetErrorOptions {
  readonly code: DatasetErrorCode;
  readonly file: string;
  readonly item?: string;
  readonly fix: string;
  readonly cause?: unknown;
  /** Every problem found, when the failure gathers several (e.g. a set.json that cannot be used). */
  readonly problems?: readonly Problem[];
}

/** Formats the one-line message used by both DatasetError and Problem: file, item, what, fix. */
export function formatProblemMessage(file: string, item: string, what: string, fix: string): string {
  const where = item === '' ? file : `${file} (${item})`;
  return `${where}: ${what}. Fix: ${fix}`;
}

/** Builds a Problem record with a message naming the file, the item and the fix. */
export function makeProblem(
  code: DatasetErrorCode,
  file: string,
  item: string,
  what: string,
  fix: string,
): Problem {
  return { code, file, item, message: formatProblemMessage(file, item, what, fix), fix };
}

/** An operational failure reading or writing a sample set, an image or an annotation file. */
export class DatasetError extends Error {
  readonly code: DatasetErrorCode;
  readonly file: string;
  readonly item: string;
  readonly fix: string;
  override readonly cause?: unknown;
  readonly problems: readonly Problem[];

  constructor(what: string, { code, file, item = '', fix, cause, problems }: DatasetErrorOptions) {
    super(formatProblemMessage(file, item, what, fix));
    this.name = 'DatasetError';
    this.code = code;
    this.file = file;
    this.item = item;
    this.fix = fix;
    this.cause = cause;
    this.problems = problems ?? [{ code, file, item, message: this.message, fix }];
  }

  /** The same failure as a Problem record, for lists of problems. */
  toProblem(): Problem {
    return { code: this.code, file: this.file, item: this.item, message: this.message, fix: this.fix };
  }
}
