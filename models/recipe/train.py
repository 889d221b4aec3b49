"""Trains the demo dual encoder on a Tessera sample set.

  /usr/bin/python3 models/recipe/train.py --set /tmp/phantom-train --objective local \
      --pooling softmax --field small --out /tmp/demo-local.pt

Objectives (both InfoNCE in both directions across the batch, fixed temperature 0.07; van den Oord
et al. 2018, "Representation learning with contrastive predictive coding"; the symmetric form as in
CLIP, Radford et al. 2021):
- local: each sentence's cosine similarity to every region of every image in the batch, pooled over
  the regions (softmax-weighted mean with temperature --pool-temperature, or max), then averaged over
  the sentences of a study -> a study x image score matrix.
- global: mean-pooled regions vs the mean of the study's sentence embeddings.
The local objective adds (weight --sentence-nce, default 1) a per-sentence InfoNCE from each sentence
to the batch's images, with every image whose report holds the same sentence counted as a positive.
Only non-negated sentences enter either loss: a negated sentence ("No effusion.") describes no region.
A study with no non-negated sentence still serves as a negative image.
AdamW, linear warm-up then cosine decay, gradient-norm clipping at 5.
"""

import argparse
import json
import math
import os
import sys
import time

import numpy as np
import torch
import torch.nn.functional as F

sys.path.insert(0, os.path.dirname(os.path.abspath(__file__)))
from nets import DualEncoder  # noqa: E402
from sample_set import SampleSetError, is_negated, load_image, read_sample_set, sentence_negation, split_sentences  # noqa: E402
from wordpiece import build_vocab  # noqa: E402

CONTRAST_TEMPERATURE = 0.07


def parse_args(argv):
    p = argparse.ArgumentParser(description=__doc__, formatter_class=argparse.RawDescriptionHelpFormatter)
    p.add_argument('--set', required=True, action='append',
                   help='training sample-set folder (set.json, images/); repeat to train on several')
    p.add_argument('--out', required=True, help='checkpoint file to write (.pt)')
    p.add_argument('--objective', choices=['local', 'global'], default='local')
    p.add_argument('--pooling', choices=['softmax', 'max'], default='softmax', help='region pooling (local objective)')
    p.add_argument('--pool-temperature', type=float, default=0.1)
    p.add_argument('--field', choices=['small', 'wide', 'fine', 'centred', 'centred64'], default='small', help='receptive field layout')
    p.add_argument('--no-coords', action='store_true', help='leave out the two coordinate channels')
    p.add_argument('--size', type=int, default=224)
    p.add_argument('--dim', type=int, default=128)
    p.add_argument('--max-tokens', type=int, default=32)
    p.add_argument('--max-sentences', type=int, default=6, help='sentences per study per step, at most')
    p.add_argument('--epochs', type=float, default=4.0)
    p.add_argument('--batch', type=int, default=48)
    p.add_argument('--lr', type=float, default=2e-3)
    p.add_argument('--weight-decay', type=float, default=1e-4)
    p.add_argument('--warmup', type=float, default=0.05, help='share of steps in linear warm-up')
    p.add_argument('--sentence-nce', type=float, default=1.0,
                   help='weight of the per-sentence sentence-to-image InfoNCE term (local objective; 0 turns it off)')
    p.add_argument('--seed', type=int, default=7)
    p.add_argument('--threads', type=int, default=2)
    p.add_argument('--minutes', type=float, default=0.0,
                   help='time budget: after 20 steps the step count is cut to fit this many minutes of training '
                        '(0: no budget); the schedule then follows the new count')
    p.add_argument('--time-limit-min', type=float, default=28.0,
                   help='hard stop (and say so) when the whole run would pass this many minutes')
    p.add_argument('--negation', choices=['words', 'labels'], default='words',
                   help="which sentences leave the losses as negated: 'words', the trigger-word test "
                        "(sample_set.is_negated; the committed models), or 'labels', the set's own sentence labels "
                        "where given (the phantom's), else the trigger words")
    p.add_argument('--limit', type=int, default=0, help='use only the first N studies (debugging)')
    return p.parse_args(argv)


def prepare(args):
    names, studies = [], []
    for folder in args.set:
        manifest, _ = read_sample_set(folder)
        names.append(manifest.get('name'))
        studies += [(folder, s) for s in manifest['studies']]
    if args.limit:
        studies = studies[: args.limit]
    sentences = [split_sentences(s['report']) for _, s in studies]
    tokenizer = build_vocab([t for sents in sentences for t in sents])
    images = np.zeros((len(studies), args.size, args.size), dtype=np.uint8)
    for i, (folder, s) in enumerate(studies):
        arr, _ = load_image(os.path.join(folder, s['image']), args.size)
        images[i] = np.clip(np.rint(arr * 255.0), 0, 255).astype(np.uint8)
    positive = []
    for (_, s), sents in zip(studies, sentences):
        negated = sentence_negation(s, sents) if args.negation == 'labels' else [is_negated(t) for t in sents]
        keep = [t for t, n in zip(sents, negated) if not n]
        positive.append([tokenizer.encode(t, args.max_tokens) for t in keep])
    return names, studies, tokenizer, images, positive


def pool_regions(sim, pooling, temperature):
    """sim [S, B, N] -> [S, B]: softmax-weighted mean over regions, or max."""
    if pooling == 'max':
        return sim.max(dim=-1).values
    weights = torch.softmax(sim / temperature, dim=-1)
    return (weights * sim).sum(dim=-1)


def batch_loss(model, args, image, token_lists, owner, positives=None):
    """InfoNCE both ways over the study x image score matrix. owner[s] = batch row of sentence s;
    positives [S, B] bool marks each image whose report holds sentence s (for the per-sentence term)."""
    grid = F.normalize(model.image(image), dim=1)  # [B, D, h, w], unit vectors per cell
    b, d = grid.shape[:2]
    regions = grid.flatten(2).transpose(1, 2)  # [B, N, D]
    width = max(len(t) for t in token_lists)
    ids = torch.zeros(len(token_lists), width, dtype=torch.long)
    mask = torch.zeros_like(ids)
    for i, t in enumerate(token_lists):
        ids[i, : len(t)] = torch.tensor(t)
        mask[i, : len(t)] = 1
    sent = F.normalize(model.text(ids, mask), dim=-1)  # [S, D]
    owner = torch.tensor(owner)
    rows = torch.unique(owner)  # studies that have text, in batch order
    row_of = torch.full((b,), -1, dtype=torch.long)
    row_of[rows] = torch.arange(len(rows))
    member = torch.zeros(len(rows), len(token_lists))
    member[row_of[owner], torch.arange(len(token_lists))] = 1.0
    member = member / member.sum(1, keepdim=True)  # mean over a study's sentences
    if args.objective == 'global':
        img_g = F.normalize(regions.mean(1), dim=-1)  # [B, D]
        txt_g = F.normalize(member @ sent, dim=-1)  # [R, D]
        score = txt_g @ img_g.t()  # [R, B]
        sent_score = None
    else:
        # Cosine of every sentence with every cell of every image, as a 1x1 convolution (the same
        # numbers as einsum('sd,bnd->sbn'), computed by the convolution kernels, which are faster on CPU).
        sim = F.conv2d(grid, sent.view(len(token_lists), d, 1, 1)).flatten(2).transpose(0, 1)  # [S, B, N]
        sent_score = pool_regions(sim, args.pooling, args.pool_temperature)  # [S, B]
        score = member @ sent_score  # [R, B]
    logits = score / CONTRAST_TEMPERATURE
    t2i = F.cross_entropy(logits, rows)
    i2t = F.cross_entropy(logits[:, rows].t(), torch.arange(len(rows)))
    loss = 0.5 * (t2i + i2t)
    if sent_score is not None and args.sentence_nce > 0:
        # Multi-positive InfoNCE per sentence: every image whose report holds the same sentence is a
        # positive, so a sentence repeated across studies ("The trachea is central.") adds no false negatives.
        if positives is None:
            positives = torch.zeros_like(sent_score, dtype=torch.bool)
            positives[torch.arange(len(owner)), owner] = True
        sl = sent_score / CONTRAST_TEMPERATURE
        nce = torch.logsumexp(sl, 1) - torch.logsumexp(sl.masked_fill(~positives, float('-inf')), 1)
        loss = loss + args.sentence_nce * nce.mean()
    return loss


def learning_rate(step, total, args):
    warm = max(1, int(args.warmup * total))
    if step < warm:
        return args.lr * (step + 1) / warm
    progress = (step - warm) / max(1, total - warm)
    return args.lr * 0.5 * (1.0 + math.cos(math.pi * progress))


def main(argv=None):
    args = parse_args(argv if argv is not None else sys.argv[1:])
    torch.set_num_threads(args.threads)
    torch.manual_seed(args.seed)
    rng = np.random.default_rng(args.seed)
    started = time.time()
    try:
        set_names, studies, tokenizer, images, positive = prepare(args)
    except SampleSetError as err:
        print(f'train: {err}', file=sys.stderr)
        return 2
    pixels = images.astype(np.float32) / 255.0
    mean, std = float(pixels.mean()), float(pixels.std())
    del pixels
    config = {
        'field': args.field, 'dim': args.dim, 'coords': not args.no_coords, 'vocab_size': len(tokenizer.vocab),
        'max_tokens': args.max_tokens, 'size': args.size, 'mean': round(mean, 4), 'std': round(std, 4),
        'objective': args.objective, 'pooling': 'mean' if args.objective == 'global' else args.pooling,
        'pool_temperature': args.pool_temperature,
    }
    model = DualEncoder(config)
    model.image.to(memory_format=torch.channels_last)
    config['receptive_field_px'] = model.image.field_px
    config['stride_px'] = model.image.stride_px
    n = len(studies)
    with_text = np.array([len(p) > 0 for p in positive])
    positive_sets = [set(tuple(t) for t in p) for p in positive]
    print(f'train: {n} studies ({int(with_text.sum())} with non-negated sentences), vocab {len(tokenizer.vocab)}, '
          f'field {model.image.field_px} px, objective {args.objective}/{config["pooling"]}, '
          f'prepared in {time.time() - started:.0f} s', flush=True)
    steps_per_epoch = n // args.batch
    total = max(1, int(args.epochs * steps_per_epoch))
    optim = torch.optim.AdamW(model.parameters(), lr=args.lr, weight_decay=args.weight_decay)
    log, step, t0, stopped_early, budget_cut = [], 0, time.time(), False, False
    model.train()
    while step < total:
        order = rng.permutation(n)
        for k in range(steps_per_epoch):
            if step >= total:
                break
            idx = order[k * args.batch:(k + 1) * args.batch]
            if not with_text[idx].any():
                continue
            x = torch.from_numpy(images[idx].astype(np.float32) / 255.0).unsqueeze(1)
            # Mild intensity jitter only: a flip or a large shift would change which side a finding is on.
            gain = torch.from_numpy(rng.uniform(0.9, 1.1, (len(idx), 1, 1, 1)).astype(np.float32))
            offset = torch.from_numpy(rng.uniform(-0.05, 0.05, (len(idx), 1, 1, 1)).astype(np.float32))
            x = ((x * gain + offset) - mean) / std
            x = x.contiguous(memory_format=torch.channels_last)
            token_lists, owner = [], []
            for row, i in enumerate(idx):
                sents = positive[i]
                if len(sents) > args.max_sentences:
                    sents = [sents[j] for j in rng.choice(len(sents), args.max_sentences, replace=False)]
                token_lists += sents
                owner += [row] * len(sents)
            positives = torch.tensor([[tuple(t) in positive_sets[i] for i in idx] for t in token_lists])
            for group in optim.param_groups:
                group['lr'] = learning_rate(step, total, args)
            loss = batch_loss(model, args, x, token_lists, owner, positives)
            optim.zero_grad()
            loss.backward()
            torch.nn.utils.clip_grad_norm_(model.parameters(), 5.0)
            optim.step()
            step += 1
            if step == 20 and args.minutes > 0:
                per_step = (time.time() - t0) / step
                fit = int(args.minutes * 60.0 / per_step)
                if fit < total:
                    print(f'train: {per_step:.2f} s/step; cutting {total} steps to {fit} for --minutes {args.minutes}',
                          flush=True)
                    total = max(fit, step + 1)
                    budget_cut = True
            if step % 10 == 0 or step == total:
                elapsed = time.time() - t0
                log.append({'step': step, 'loss': round(float(loss), 4), 'seconds': round(elapsed, 1)})
                print(f'step {step}/{total} loss {float(loss):.4f} lr {optim.param_groups[0]["lr"]:.2e} '
                      f'{elapsed:.0f} s', flush=True)
                if (time.time() - started) / 60.0 > args.time_limit_min:
                    stopped_early = True
                    print(f'train: stopping at step {step} of {total}: past --time-limit-min {args.time_limit_min}',
                          flush=True)
                    total = step
                    break
    model.eval()
    training = {
        'sets': set_names, 'studies': n, 'steps': step,
        'epochs': round(step / max(1, steps_per_epoch), 2), 'batch': args.batch, 'lr': args.lr,
        'seed': args.seed, 'sentence_nce': args.sentence_nce, 'minutes': round((time.time() - started) / 60.0, 1),
        'stopped_early': stopped_early, 'cut_to_time_budget': budget_cut, 'planned_epochs': args.epochs,
        'torch': torch.__version__, 'threads': args.threads, 'log': log,
        'negated_sentences': 'excluded from the loss', 'negation': args.negation,
    }
    torch.save({'config': config, 'state_dict': model.state_dict(), 'tokenizer': tokenizer.to_json(),
                'training': training}, args.out)
    print(f'train: wrote {args.out} after {training["minutes"]} min', flush=True)
    return 0


if __name__ == '__main__':
    sys.exit(main())
