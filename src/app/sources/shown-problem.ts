import type { Problem as DatasetProblem } from '../../dataset/errors';
import type { Problem as ModelProblem } from '../../model/contract';

/** One problem with a model folder or a sample set, as the views show it: where, what, and the fix. */
export interface ShownProblem {
  readonly kind: 'model' | 'set' | 'folder';
  /** The file as the user knows it, e.g. 'demo-local/tessera-model.json'. */
  readonly file: string;
  /** The place inside the file (a setting, a study id, a box id), or ''. */
  readonly where: string;
  readonly what: string;
  readonly fix: string;
}

/** A model-contract problem in plain words. */
export function fromModelProblem(p: ModelProblem): ShownProblem {
  return { kind: 'model', file: p.file, where: p.path, what: `expected ${p.expected}; got ${p.got}`, fix: p.fix };
}

/** A sample-set problem in plain words; the message's own file and fix parts are not repeated. */
export function fromDatasetProblem(p: DatasetProblem): ShownProblem {
  let what = p.message;
  const head = p.item === '' ? `${p.file}: ` : `${p.file} (${p.item}): `;
  const tail = `. Fix: ${p.fix}`;
  if (what.startsWith(head)) what = what.slice(head.length);
  if (what.endsWith(tail)) what = what.slice(0, -tail.length);
  return { kind: 'set', file: p.file, where: p.item, what, fix: p.fix };
}

/** One line per problem, for logs and plain-text lists. */
export function formatShownProblem(p: ShownProblem): string {
  const where = p.where === '' ? p.file : `${p.file} (${p.where})`;
  return `${where}: ${p.what}. Fix: ${p.fix}`;
}
