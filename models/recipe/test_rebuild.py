"""Tests of rebuild_checkpoint.py, and of how evaluate.py ties sentences to boxes and scores a pointing hit.

Run: /usr/bin/python3 -m unittest models/recipe/test_rebuild.py
"""

import contextlib
import io
import json
import os
import shutil
import sys
import tempfile
import unittest

import numpy as np
import torch
from PIL import Image

sys.path.insert(0, os.path.dirname(os.path.abspath(__file__)))
import evaluate  # noqa: E402
import export  # noqa: E402
import nets  # noqa: E402
import rebuild_checkpoint  # noqa: E402
from wordpiece import build_vocab  # noqa: E402

torch.set_num_threads(2)
HERE = os.path.dirname(os.path.abspath(__file__))
DEMO_LOCAL = os.path.join(HERE, '..', 'demo-local')
SIZE = 64  # the centred64 layout at 64 px gives an 8 x 8 grid of cells with centres at 8 c + 4


def small_config(vocab_size):
    return {'field': 'centred64', 'dim': 16, 'coords': True, 'vocab_size': vocab_size, 'max_tokens': 32,
            'size': SIZE, 'mean': 0.5, 'std': 0.25, 'objective': 'local', 'pooling': 'softmax',
            'pool_temperature': 0.1, 'receptive_field_px': 64, 'stride_px': 8}


def random_checkpoint(texts, seed=3):
    """A checkpoint as train.py writes it, with random weights and BatchNorm statistics far from (0, 1)."""
    torch.manual_seed(seed)
    tokenizer = build_vocab(texts, min_count=1)
    model = nets.DualEncoder(small_config(len(tokenizer.vocab))).eval()
    with torch.no_grad():
        for m in model.modules():
            if isinstance(m, torch.nn.BatchNorm2d):
                m.running_mean.uniform_(-0.5, 0.5)
                m.running_var.uniform_(0.5, 2.0)
                m.weight.uniform_(0.5, 1.5)
                m.bias.uniform_(-0.2, 0.2)
    return {'config': model.config, 'state_dict': model.state_dict(), 'tokenizer': tokenizer.to_json(),
            'training': {'note': 'random weights for a test'}}


def quietly(fn, *args):
    with contextlib.redirect_stdout(io.StringIO()):
        return fn(*args)


class RebuildCheckpointTest(unittest.TestCase):
    def setUp(self):
        self.dir = tempfile.mkdtemp()

    def tearDown(self):
        shutil.rmtree(self.dir)

    def test_rebuild_reproduces_the_recorded_reference_outputs_of_demo_local(self):
        # The reference outputs are what the lost PyTorch checkpoint computed at export (export.py).
        ckpt, errors = rebuild_checkpoint.rebuild(DEMO_LOCAL)
        self.assertLessEqual(max(errors), 1e-4)
        self.assertEqual(sorted(ckpt), ['config', 'state_dict', 'tokenizer', 'training'])
        path = os.path.join(self.dir, 'rebuilt.pt')
        torch.save(ckpt, path)
        model = nets.build_model(torch.load(path, map_location='cpu'))
        self.assertEqual(model.image(torch.zeros(1, 1, 224, 224)).shape, (1, 128, 28, 28))

    def test_export_then_rebuild_gives_back_the_same_functions(self):
        texts = ['Nodule in the right upper zone.', 'No pleural effusion.', 'Heart size is normal.']
        ckpt = random_checkpoint(texts)
        ckpt_path, folder = os.path.join(self.dir, 'orig.pt'), os.path.join(self.dir, 'model')
        torch.save(ckpt, ckpt_path)
        quietly(export.main, ['--checkpoint', ckpt_path, '--out', folder, '--id', 't', '--description', 'test'])
        rebuilt, _ = rebuild_checkpoint.rebuild(folder)
        original = nets.build_model(ckpt)
        again = nets.build_model(rebuilt)
        x = torch.randn(2, 1, SIZE, SIZE)
        ids = torch.tensor([[2, 5, 6, 7, 3, 0], [2, 8, 9, 3, 0, 0]])
        mask = (ids != 0).long()
        with torch.no_grad():
            self.assertLess(float((original.image(x) - again.image(x)).abs().max()), 1e-4)
            self.assertLess(float((original.text(ids, mask) - again.text(ids, mask)).abs().max()), 1e-4)

    def test_graphs_that_do_not_fit_the_config_are_refused_with_the_tensor_named(self):
        folder = os.path.join(self.dir, 'model')
        shutil.copytree(DEMO_LOCAL, folder)
        path = os.path.join(folder, 'training.json')
        with open(path) as fh:
            card = json.load(fh)
        card['config']['field'] = 'centred'  # one 3x3 layer fewer than the graph holds
        with open(path, 'w') as fh:
            json.dump(card, fh)
        with self.assertRaises(rebuild_checkpoint.RebuildError) as ctx:
            rebuild_checkpoint.rebuild(folder)
        self.assertRegex(str(ctx.exception), r'image: unmapped ONNX tensor onnx::Conv_\d+')


class EvaluatePointingTest(unittest.TestCase):
    """evaluate.py must score pointing as the tool does (src/core/box-geometry.ts pointInRect: closed
    boxes; src/batch: one item per sentence index)."""

    def setUp(self):
        self.dir = tempfile.mkdtemp()
        os.makedirs(os.path.join(self.dir, 'images'))
        rng = np.random.default_rng(5)
        Image.fromarray(rng.integers(0, 256, (SIZE, SIZE)).astype(np.uint8)).save(os.path.join(self.dir, 'images/0.png'))

    def tearDown(self):
        shutil.rmtree(self.dir)

    def run_evaluate(self, report, sentences, labels=None):
        """evaluate.main on one study; sentences: [(index, text, boxes)]."""
        study = {'id': 's0', 'image': 'images/0.png', 'report': report}
        if labels is not None:
            study['labels'] = {'findings': [], 'sentences': labels}
        with open(os.path.join(self.dir, 'set.json'), 'w') as fh:
            json.dump({'schema': 'tessera.set/1', 'name': 't', 'synthetic': True, 'studies': [study],
                       'annotations': 'annotations.json'}, fh)
        boxes = [{'id': f'b{index}-{k}', 'study': 's0', 'sentence': {'index': index, 'text': text}, 'zone': 'right-upper',
                  'box': box} for index, text, bs in sentences for k, box in enumerate(bs)]
        with open(os.path.join(self.dir, 'annotations.json'), 'w') as fh:
            json.dump({'schema': 'tessera.annotations/2', 'set': 't', 'boxes': boxes}, fh)
        ckpt_path = os.path.join(self.dir, 'ckpt.pt')
        torch.save(random_checkpoint([report]), ckpt_path)
        out = os.path.join(self.dir, 'eval.json')
        quietly(evaluate.main, ['--checkpoint', ckpt_path, '--set', self.dir, '--out', out])
        with open(out) as fh:
            return json.load(fh)

    def test_centre_in_boxes_counts_every_edge(self):
        box = {'x': 150, 'y': 90, 'w': 6, 'h': 6}
        for pt in [(150, 90), (156, 96), (156, 90), (150, 96), (153, 93)]:
            self.assertTrue(evaluate.centre_in_boxes(pt, [box]), pt)
        for pt in [(156.01, 93), (149.99, 93), (153, 96.01), (153, 89.99)]:
            self.assertFalse(evaluate.centre_in_boxes(pt, [box]), pt)
        self.assertFalse(evaluate.centre_in_boxes((153, 93), []))

    def test_a_best_cell_centre_on_the_right_and_bottom_edges_of_a_box_is_a_hit(self):
        # Each cell gets a 4 x 4 box whose bottom-right corner is the cell's centre, so whichever cell
        # the random weights pick, its centre lies on a box's right and bottom edges; the mirrored
        # layout puts it on the left and top edges. Both must hit, with chance 1.
        text = 'Nodule in the right upper zone.'
        for name, dx in (('right-bottom', -4), ('left-top', 0)):
            with self.subTest(edges=name):
                boxes = [{'x': 8 * c + 4 + dx, 'y': 8 * r + 4 + dx, 'w': 4, 'h': 4} for r in range(8) for c in range(8)]
                result = self.run_evaluate(f'FINDINGS:\n{text}', [(0, text, boxes)])
                self.assertEqual(result['localisable_positive_sentences'], 1)
                self.assertEqual(result['pointing'], 1.0)
                self.assertEqual(result['chance'], 1.0)

    def test_sentences_are_tied_to_boxes_by_index_and_negated_as_the_set_labels_them(self):
        repeated = 'Pneumothorax in the left upper zone.'
        # Positive despite the word 'no' (the phantom's own wording); its label says so.
        positive_with_no = ('A pleural line is seen at the left apex with no lung markings above it, '
                            'in keeping with pneumothorax.')
        negated = 'No pleural effusion.'
        report = f'FINDINGS:\n{positive_with_no} {repeated} {negated}\n\nIMPRESSION:\n{repeated}\n'
        box = {'x': 40, 'y': 8, 'w': 16, 'h': 16}
        sentences = [(0, positive_with_no, [box]), (1, repeated, [box]), (2, negated, [box]), (3, repeated, [box])]
        labels = [{'index': i, 'finding': f, 'zones': [], 'negated': n, 'uncertain': False}
                  for i, f, n in [(0, 'pneumothorax', False), (1, 'pneumothorax', False), (2, 'effusion', True),
                                  (3, 'pneumothorax', False)]]
        result = self.run_evaluate(report, sentences, labels)
        self.assertEqual(result['localisable_positive_sentences'], 3)
        self.assertEqual(sorted(result['by_finding']), ['pneumothorax'])
        self.assertEqual(result['by_finding']['pneumothorax']['n'], 3)

    def test_without_labels_the_trigger_word_test_decides(self):
        text, negated = 'Nodule in the right upper zone.', 'No nodule in the left lower zone.'
        box = {'x': 8, 'y': 8, 'w': 16, 'h': 16}
        result = self.run_evaluate(f'FINDINGS:\n{text} {negated}', [(0, text, [box]), (1, negated, [box])])
        self.assertEqual(result['localisable_positive_sentences'], 1)
        self.assertEqual(sorted(result['by_finding']), ['unlabelled'])


if __name__ == '__main__':
    unittest.main()
