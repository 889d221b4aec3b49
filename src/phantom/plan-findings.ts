import type { Rng } from '../core/seeded-random';
import type { Side } from './chest-geometry';
import type { ZoneRow } from './zone-names';

export type FindingKind = 'consolidation' | 'nodule' | 'effusion' | 'pneumothorax' | 'atelectasis' | 'cardiomegaly' | 'edema';

/** A finding to draw: where it goes in the upright frame and how severe it is. */
export interface FindingPlan {
  readonly kind: FindingKind;
  readonly side: Side | 'both';
  readonly row: ZoneRow;
  readonly severity: number; // 1 mild/small .. 3 severe/large; edema: grade 1..3
  readonly variant: string; // e.g. 'apical' or 'lateral' for a pneumothorax
}

const pick = <T>(rng: Rng, items: readonly T[]): T => items[rng.int(items.length)];

/**
 * Chooses a study's lung findings: about a quarter of studies have none; others one to three of
 * consolidation, nodule, effusion, pneumothorax, atelectasis and edema, with rules that keep the
 * combination plausible (no effusion and pneumothorax on one side, at most one pneumothorax).
 */
export function planFindings(rng: Rng): FindingPlan[] {
  const plans: FindingPlan[] = [];
  const edemaRoll = rng.next();
  const edemaGrade = edemaRoll < 0.76 ? 0 : edemaRoll < 0.84 ? 1 : edemaRoll < 0.92 ? 2 : 3;
  if (edemaGrade > 0) plans.push({ kind: 'edema', side: 'both', row: 'middle', severity: edemaGrade, variant: '' });
  const count = rng.next() < 0.3 ? 0 : 1 + (rng.next() < 0.35 ? 1 : 0) + (rng.next() < 0.12 ? 1 : 0);
  const taken = new Set<string>();
  for (let k = 0; k < count; k++) {
    const kind = pick<FindingKind>(rng, ['consolidation', 'consolidation', 'nodule', 'nodule', 'effusion', 'effusion', 'pneumothorax', 'atelectasis']);
    const side: Side = rng.next() < 0.5 ? 'right' : 'left';
    const clash =
      taken.has(`${kind}:${side}`) ||
      (kind === 'pneumothorax' && [...taken].some((t) => t.startsWith('pneumothorax') || t === `effusion:${side}`)) ||
      (kind === 'effusion' && taken.has(`pneumothorax:${side}`)) ||
      (kind === 'atelectasis' && taken.has(`effusion:${side}`));
    if (clash) continue;
    taken.add(`${kind}:${side}`);
    plans.push(planOne(rng, kind, side));
  }
  // A focal opacity drawn inside the air of a pneumothorax would make no sense: keep that lung clear.
  const ptx = plans.find((p) => p.kind === 'pneumothorax');
  return ptx ? plans.filter((p) => p === ptx || p.side !== ptx.side || p.kind === 'effusion') : plans;
}

function planOne(rng: Rng, kind: FindingKind, side: Side): FindingPlan {
  switch (kind) {
    case 'consolidation':
      return { kind, side, row: pick<ZoneRow>(rng, ['upper', 'middle', 'lower', 'lower']), severity: rng.next() < 0.3 ? 2 : 1, variant: '' };
    case 'nodule':
      return { kind, side, row: pick<ZoneRow>(rng, ['upper', 'middle', 'lower']), severity: 1, variant: '' };
    case 'effusion':
      return { kind, side, row: 'lower', severity: pick(rng, [1, 1, 2, 2, 3]), variant: '' };
    case 'pneumothorax': {
      const variant = rng.next() < 0.5 ? 'apical' : 'lateral';
      return { kind, side, row: 'upper', severity: pick(rng, [1, 2, 2, 3]), variant };
    }
    default:
      return { kind: 'atelectasis', side, row: rng.next() < 0.7 ? 'lower' : 'middle', severity: 1, variant: '' };
  }
}

