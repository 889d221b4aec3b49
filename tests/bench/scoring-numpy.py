"""The benchmark's scoring stage in numpy, for a speed ratio against Tessera's TypeScript core.

Reads the binary written by run-bench.ts and does the same work per study: L2-normalise, cosine
similarity sentences x cells, max pooling over cells, best cell, centre and overlap hit, their chance
levels, softmax mass in the box (cell area fraction) and CNR inside vs outside the box.
Prints one JSON object: {"studies_per_s": ..., "seconds": ...}.
"""
import json
import sys
import time

import numpy as np


def main(path):
    with open(path + '.json') as f:
        meta = json.load(f)
    n, s, c, d = meta['studies'], meta['sentences'], meta['cells'], meta['dim']
    gh, gw, size = meta['grid_h'], meta['grid_w'], meta['image_size']
    raw = np.fromfile(path + '.bin', dtype=np.float32)
    cells_all = raw[: n * c * d].reshape(n, c, d)
    sents_all = raw[n * c * d : n * c * d + n * s * d].reshape(n, s, d)
    boxes = np.array(meta['boxes'], dtype=np.float64).reshape(n, s, 4)
    cw, ch = size / gw, size / gh
    xs = (np.arange(c) % gw) * cw
    ys = (np.arange(c) // gw) * ch
    cx, cy = xs + cw / 2, ys + ch / 2
    t0 = time.perf_counter()
    hits_total = 0
    for i in range(n):
        cells = cells_all[i]
        sents = sents_all[i]
        cells = cells / np.maximum(np.linalg.norm(cells, axis=1, keepdims=True), 1e-12)
        sents = sents / np.maximum(np.linalg.norm(sents, axis=1, keepdims=True), 1e-12)
        sim = sents @ cells.T
        pooled = sim.max(axis=1)
        best = sim.argmax(axis=1)
        b = boxes[i]
        bx, by, bw, bh = b[:, 0:1], b[:, 1:2], b[:, 2:3], b[:, 3:4]
        inside = (cx >= bx) & (cx < bx + bw) & (cy >= by) & (cy < by + bh)
        ix = np.clip(np.minimum(xs + cw, bx + bw) - np.maximum(xs, bx), 0, None)
        iy = np.clip(np.minimum(ys + ch, by + bh) - np.maximum(ys, by), 0, None)
        overlap = (ix * iy) > 0
        frac = (ix * iy) / (cw * ch)
        hit_centre = inside[np.arange(s), best]
        hit_overlap = overlap[np.arange(s), best]
        chance_centre = inside.mean(axis=1)
        chance_overlap = overlap.mean(axis=1)
        z = sim / 0.1
        z = np.exp(z - z.max(axis=1, keepdims=True))
        p = z / z.sum(axis=1, keepdims=True)
        mass = (p * frac).sum(axis=1)
        n_in = inside.sum(axis=1)
        n_out = c - n_in
        m_in = np.where(n_in > 0, (sim * inside).sum(axis=1) / np.maximum(n_in, 1), 0)
        m_out = np.where(n_out > 0, (sim * ~inside).sum(axis=1) / np.maximum(n_out, 1), 0)
        v_in = np.where(n_in > 0, ((sim - m_in[:, None]) ** 2 * inside).sum(axis=1) / np.maximum(n_in, 1), 0)
        v_out = np.where(n_out > 0, ((sim - m_out[:, None]) ** 2 * ~inside).sum(axis=1) / np.maximum(n_out, 1), 0)
        cnr = np.abs(m_in - m_out) / np.sqrt(np.maximum(v_in + v_out, 1e-30))
        hits_total += int(hit_centre.sum())
        _ = (pooled, hit_overlap, chance_centre, chance_overlap, mass, cnr)
    secs = time.perf_counter() - t0
    print(json.dumps({'studies_per_s': n / secs, 'seconds': secs, 'hits': hits_total, 'numpy': np.__version__}))


if __name__ == '__main__':
    main(sys.argv[1])
