"""Evaluates a checkpoint on a held-out sample set: pointing, its chance level, and retrieval.

  /usr/bin/python3 models/recipe/evaluate.py --checkpoint /tmp/demo-local.pt --set /tmp/phantom-eval \
      --out /tmp/demo-local-eval.json [--untrained --seed 11]

- Pointing (the pointing game; Zhang et al. 2018, "Top-down neural attention by excitation
  backprop"): for each localisable positive sentence (one with a reference box, not negated), the
  cell with the highest cosine similarity is a hit when its centre, mapped back to original image
  pixels, lies in one of the sentence's boxes. Chance: the share of cell centres inside the boxes.
  The test is closed (a centre on any edge of a box counts), as in the tool's pointInRect
  (src/core/box-geometry.ts): cell centres (8 c + 4 at stride 8) and box edges are both whole pixels,
  so a centre on a box's edge is common, and a half-open test would count it on the left and top
  edges but not on the right and bottom ones.
- Sentences are tied to their boxes by sentence index, as the tool does; a report that repeats a
  sentence word for word (findings and impression) gives two sentences. A sentence is negated as the
  set labels it (labels.sentences[].negated, which the phantom writes); without a label the
  trigger-word test of sample_set.is_negated decides.
- Sentence-to-image recall@1: each such sentence ranks every image of the set by the model's own
  region pooling (softmax or max over cells; mean-pooled regions for the global model). Strict: the
  top image is the sentence's own. Text-aware: the top image's report holds the same sentence text
  (the phantom repeats sentence templates, so strict recall has a ceiling below 1).
- Report-to-image recall@1: the study score (mean over its non-negated sentences) across studies.
This is the recipe's own quick check; `tessera score` is the tool's full, independent evaluation.
"""

import argparse
import json
import math
import os
import sys

import numpy as np
import torch
import torch.nn.functional as F

sys.path.insert(0, os.path.dirname(os.path.abspath(__file__)))
from nets import build_model  # noqa: E402
from sample_set import is_negated, load_image, read_sample_set, split_sentences  # noqa: E402
from wordpiece import WordPieceTokenizer, normalize  # noqa: E402


def parse_args(argv):
    p = argparse.ArgumentParser(description=__doc__, formatter_class=argparse.RawDescriptionHelpFormatter)
    p.add_argument('--checkpoint', required=True)
    p.add_argument('--set', required=True)
    p.add_argument('--out', help='JSON file for the figures')
    p.add_argument('--untrained', action='store_true')
    p.add_argument('--seed', type=int, default=11)
    return p.parse_args(argv)


def centre_in_boxes(pt, boxes):
    """Whether the point (x, y) lies in one of the boxes ({x, y, w, h}), edges included."""
    return any(b['x'] <= pt[0] <= b['x'] + b['w'] and b['y'] <= pt[1] <= b['y'] + b['h'] for b in boxes)


def localisable_sentences(studies, boxes):
    """The localisable positive sentences: [(study position, sentence index, text, boxes, finding)].

    One item per sentence index with at least one box and not negated; the finding comes from
    labels.sentences (the phantom's), else 'unlabelled'.
    """
    items = []
    for i, s in enumerate(studies):
        labels = {l.get('index'): l for l in (s.get('labels') or {}).get('sentences', []) if isinstance(l, dict)}
        by_index = {}
        for b in boxes.get(s['id'], []):
            entry = by_index.setdefault(b['sentence']['index'], (b['sentence']['text'], []))
            entry[1].append(b['box'])
        for index in sorted(by_index):
            text, bs = by_index[index]
            label = labels.get(index, {})
            negated = label['negated'] if isinstance(label.get('negated'), bool) else is_negated(text)
            if not negated:
                items.append((i, index, text, bs, label.get('finding') or 'unlabelled'))
    return items


def pooled(sim, pooling, temperature):
    if pooling == 'max':
        return sim.max(dim=-1).values
    if pooling == 'softmax':
        w = torch.softmax(sim / temperature, dim=-1)
        return (w * sim).sum(dim=-1)
    raise ValueError(pooling)


def main(argv=None):
    args = parse_args(argv if argv is not None else sys.argv[1:])
    torch.set_num_threads(2)
    ckpt = torch.load(args.checkpoint, map_location='cpu')
    config = ckpt['config']
    model = build_model(ckpt, untrained=args.untrained, seed=args.seed)
    tokenizer = WordPieceTokenizer(ckpt['tokenizer']['model']['vocab'])
    manifest, boxes = read_sample_set(args.set)
    studies = manifest['studies']
    size = config['size']

    regions, originals = [], []
    with torch.no_grad():
        for start in range(0, len(studies), 32):
            chunk = studies[start:start + 32]
            arrs = []
            for s in chunk:
                arr, original = load_image(os.path.join(args.set, s['image']), size)
                arrs.append(arr)
                originals.append(original)
            x = (torch.from_numpy(np.stack(arrs)).unsqueeze(1) - config['mean']) / config['std']
            r = model.image(x)
            regions.append(F.normalize(r.flatten(2).transpose(1, 2), dim=-1))
    regions = torch.cat(regions)  # [N, cells, D]
    gh = gw = size // config['stride_px']

    def embed(texts):
        out = []
        with torch.no_grad():
            for start in range(0, len(texts), 256):
                ids, mask = tokenizer.batch(texts[start:start + 256], config['max_tokens'])
                out.append(F.normalize(model.text(torch.tensor(ids), torch.tensor(mask)), dim=-1))
        return torch.cat(out) if out else torch.zeros(0, config['dim'])

    def score_all(emb):  # [S, D] -> [S, N]
        if config['objective'] == 'global':
            g = F.normalize(regions.mean(1), dim=-1)
            return emb @ g.t()
        rows = []
        for start in range(0, len(emb), 64):
            sim = torch.einsum('sd,bnd->sbn', emb[start:start + 64], regions)
            rows.append(pooled(sim, config['pooling'], config['pool_temperature']))
        return torch.cat(rows)

    # The finding labels (labels.sentences) only break the figures down.
    items = localisable_sentences(studies, boxes)
    findings = [f for *_, f in items]
    texts = [t for _, _, t, _, _ in items]
    emb = embed(texts)
    hits, chances, gaps, other_side, offsets = [], [], [], [], []
    for k, (i, _, _, bs, _) in enumerate(items):
        sim = regions[i] @ emb[k]
        best = int(sim.argmax())
        oh, ow = originals[i]
        sx, sy = ow / size, oh / size
        centres = [((c % gw + 0.5) * config['stride_px'] * sx, (c // gw + 0.5) * config['stride_px'] * sy)
                   for c in range(gh * gw)]

        hits.append(centre_in_boxes(centres[best], bs))
        chances.append(sum(centre_in_boxes(c, bs) for c in centres) / len(centres))
        # How far a miss lands: the best cell centre's distance to the nearest box, in image pixels,
        # and whether it is on the other half of the image from every box (a side error).
        px, py = centres[best]
        gaps.append(min(math.hypot(max(b['x'] - px, 0, px - b['x'] - b['w']), max(b['y'] - py, 0, py - b['y'] - b['h']))
                        for b in bs))
        nb = min(bs, key=lambda b: math.hypot(b['x'] + b['w'] / 2 - px, b['y'] + b['h'] / 2 - py))
        offsets.append(((nb['x'] + nb['w'] / 2 - px) / sx, (nb['y'] + nb['h'] / 2 - py) / sy))
        other_side.append(all((px < ow / 2) != (b['x'] + b['w'] / 2 < ow / 2) for b in bs))

    by_finding = {}
    for f in sorted(set(findings)):
        ks = [k for k, g in enumerate(findings) if g == f]
        misses = [k for k in ks if not hits[k]]
        by_finding[f] = {'n': len(ks), 'pointing': round(float(np.mean([hits[k] for k in ks])), 4),
                         'chance': round(float(np.mean([chances[k] for k in ks])), 4),
                         'miss_median_gap_px': round(float(np.median([gaps[k] for k in misses])), 1) if misses else None,
                         'misses_on_other_side': sum(other_side[k] for k in misses),
                         # box centre minus best cell centre, in model-input pixels, averaged over all sentences
                         'mean_offset_input_px': [round(float(np.mean([offsets[k][j] for k in ks])), 2) for j in (0, 1)]}

    scores = score_all(emb)
    own = torch.tensor([i for i, *_ in items])
    top = scores.argmax(1)
    strict = (top == own).float().mean().item() if items else None
    norm_sentences = [set(normalize(t) for t in split_sentences(s['report'])) for s in studies]
    aware = float(np.mean([normalize(texts[k]) in norm_sentences[int(top[k])] for k in range(len(items))])) if items else None

    # Study-level report-to-image recall@1 over studies with non-negated sentences.
    study_sents = [[t for t in split_sentences(s['report']) if not is_negated(t)] for s in studies]
    flat = [t for ss in study_sents for t in ss]
    owner = [i for i, ss in enumerate(study_sents) for _ in ss]
    all_scores = score_all(embed(flat))
    ids = sorted(set(owner))
    study_scores = torch.stack([all_scores[[k for k, o in enumerate(owner) if o == i]].mean(0) for i in ids])
    r2i = (study_scores.argmax(1) == torch.tensor(ids)).float().mean().item()
    i2r = (study_scores.argmax(0)[ids] == torch.arange(len(ids))).float().mean().item()

    result = {
        'set': manifest.get('name'), 'studies': len(studies), 'localisable_positive_sentences': len(items),
        'pointing': round(float(np.mean(hits)), 4) if hits else None,
        'pointing_hits': int(np.sum(hits)),
        'chance': round(float(np.mean(chances)), 4) if chances else None,
        'sentence_to_image_r1_strict': round(strict, 4) if strict is not None else None,
        'sentence_to_image_r1_text_aware': round(aware, 4) if aware is not None else None,
        'report_to_image_r1': round(r2i, 4), 'image_to_report_r1': round(i2r, 4),
        'by_finding': by_finding,
        'scored_with': config['pooling'], 'weights': 'random' if args.untrained else 'trained',
    }
    print(json.dumps(result, indent=1))
    if args.out:
        with open(args.out, 'w', encoding='utf-8') as fh:
            json.dump(result, fh, indent=1)
            fh.write('\n')
    return 0


if __name__ == '__main__':
    sys.exit(main())
