"""Unit tests of the recipe. Run: /usr/bin/python3 -m unittest discover -s models/recipe -p 'test_*.py'"""

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
import nets  # noqa: E402
import sample_set  # noqa: E402
import train  # noqa: E402
from wordpiece import WordPieceTokenizer, build_vocab, normalize, pre_tokenize  # noqa: E402

torch.set_num_threads(2)


class ReceptiveFieldTest(unittest.TestCase):
    def test_receptive_field_of_one_and_two_layers(self):
        self.assertEqual(nets.receptive_field([('conv', 1, 3, 1)]), (3, 1))
        # 1 + (3 - 1) * 1 + (3 - 1) * 2 = 7, jump 2
        self.assertEqual(nets.receptive_field([('conv', 1, 3, 2), ('conv', 1, 3, 1)]), (7, 2))
        self.assertEqual(nets.receptive_field([]), (1, 1))
        # dilation d spreads a k-tap kernel over (k - 1) * d + 1 pixels
        self.assertEqual(nets.receptive_field([('conv', 1, 3, 1, 3)]), (7, 1))

    def test_receptive_field_of_the_demo_layouts(self):
        self.assertEqual(nets.receptive_field(nets.SMALL_FIELD), (60, 16))
        self.assertEqual(nets.receptive_field(nets.WIDE_FIELD), (156, 16))
        self.assertEqual(nets.receptive_field(nets.CENTRED_WIDER_FIELD), (64, 8))

    def test_receptive_field_matches_the_gradient_support(self):
        for field in ('small', 'wide', 'centred64'):
            with self.subTest(field=field):
                self.check_gradient_support(field)

    def test_centred_layout_centres_each_cells_field_on_the_cell(self):
        # The gradient support of cell (r, c) must be symmetric about the cell's centre, 8 r + 4.
        torch.manual_seed(0)
        enc = nets.ImageEncoder('centred64', dim=8, coords=False).eval()
        x = torch.randn(1, 1, 224, 224, requires_grad=True)
        enc(x)[0, :, 13, 13].sum().backward()
        rows = torch.nonzero(x.grad[0, 0].abs().sum(1)).flatten()
        self.assertEqual((int(rows.min()) + int(rows.max()) + 1) / 2, 13 * 8 + 4)

    def check_gradient_support(self, field):
        torch.manual_seed(0)
        enc = nets.ImageEncoder(field, dim=8, coords=False).eval()
        x = torch.randn(1, 1, 224, 224, requires_grad=True)
        enc(x)[0, :, 7, 7].sum().backward()
        rows = torch.nonzero(x.grad[0, 0].abs().sum(1)).flatten()
        support = int(rows.max() - rows.min() + 1)
        self.assertLessEqual(support, enc.field_px)
        self.assertGreater(support, enc.field_px - enc.stride_px)


class CoordChannelsTest(unittest.TestCase):
    def test_coord_channels_are_pixel_centres_in_minus_one_to_one(self):
        out = nets.CoordChannels()(torch.zeros(2, 1, 4, 6))
        self.assertEqual(tuple(out.shape), (2, 3, 4, 6))
        self.assertAlmostEqual(float(out[0, 1, 0, 0]), -1 + 1 / 6, places=6)
        self.assertAlmostEqual(float(out[0, 2, 3, 0]), 1 - 1 / 4, places=6)
        self.assertTrue(torch.allclose(out[:, 1], -out[:, 1].flip(-1)))
        self.assertTrue(torch.equal(out[0], out[1]))


class EncoderTest(unittest.TestCase):
    def test_image_encoder_gives_a_14_by_14_grid_independent_of_batch(self):
        torch.manual_seed(1)
        enc = nets.ImageEncoder('small').eval()
        x = torch.randn(2, 1, 224, 224)
        with torch.no_grad():
            both = enc(x)
            one = enc(x[1:])
        self.assertEqual(tuple(both.shape), (2, 128, 14, 14))
        self.assertTrue(torch.allclose(both[1:], one, atol=1e-5))

    def test_text_encoder_ignores_padding(self):
        torch.manual_seed(2)
        enc = nets.TextEncoder(50, max_tokens=16).eval()
        ids = torch.tensor([[2, 7, 9, 3]])
        with torch.no_grad():
            short = enc(ids, torch.ones_like(ids))
            padded_ids = torch.cat([ids, torch.zeros(1, 5, dtype=torch.long)], 1)
            mask = torch.tensor([[1, 1, 1, 1, 0, 0, 0, 0, 0]])
            long = enc(padded_ids, mask)
        self.assertTrue(torch.allclose(short, long, atol=1e-5))


class WordPieceTest(unittest.TestCase):
    def test_normalize_lowercases_and_strips_accents(self):
        self.assertEqual(normalize('Café  AU\tLait\x00'), 'cafe  au lait')

    def test_pre_tokenize_isolates_punctuation(self):
        self.assertEqual(pre_tokenize('re-check in 6/52!'), ['re', '-', 'check', 'in', '6', '/', '52', '!'])
        self.assertEqual(pre_tokenize(''), [])

    def test_word_ids_take_the_longest_match_first(self):
        # The worked example of BERT's WordPiece tokenizer (Devlin et al. 2019 code; from memory):
        # "unaffable" -> un ##aff ##able.
        vocab = {t: i for i, t in enumerate(['[PAD]', '[UNK]', '[CLS]', '[SEP]', '[MASK]', 'un', '##aff', '##able', '##a'])}
        tok = WordPieceTokenizer(vocab)
        self.assertEqual(tok.word_ids('unaffable'), [5, 6, 7])
        self.assertEqual(tok.word_ids('unx'), [1])  # one unmatched piece makes the whole word [UNK]
        self.assertEqual(tok.word_ids('x' * 101), [1])

    def test_encode_adds_special_tokens_and_truncates(self):
        tok = build_vocab(['the left base', 'the left base'], min_count=1)
        ids = tok.encode('The left base. The left base.', max_tokens=5)
        self.assertEqual(len(ids), 5)
        self.assertEqual((ids[0], ids[-1]), (tok.cls_id, tok.sep_id))
        ids, mask = tok.batch(['left', 'the left base'], max_tokens=32)
        self.assertEqual([len(r) for r in ids], [5, 5])
        self.assertEqual(mask[0], [1, 1, 1, 0, 0])

    def test_build_vocab_falls_back_to_characters_not_unk(self):
        tok = build_vocab(['nodule'], min_count=5)
        ids = tok.encode('nodule', 16)
        self.assertNotIn(tok.unk_id, ids)
        self.assertEqual(len(ids), 2 + len('nodule'))

    def test_tokenizer_json_round_trips(self):
        tok = build_vocab(['a small effusion'], min_count=1)
        doc = tok.to_json()
        self.assertEqual(doc['model']['type'], 'WordPiece')
        self.assertEqual(doc['normalizer']['type'], 'BertNormalizer')
        self.assertIsNone(doc['padding'])
        with tempfile.TemporaryDirectory() as d:
            tok.save(os.path.join(d, 't.json'))
            again = WordPieceTokenizer.load(os.path.join(d, 't.json'))
        self.assertEqual(again.vocab, tok.vocab)


class SampleSetTest(unittest.TestCase):
    def setUp(self):
        self.dir = tempfile.mkdtemp()
        os.makedirs(os.path.join(self.dir, 'images'))
        for i in range(3):
            Image.fromarray(np.full((32, 32), 40 * i, dtype=np.uint8)).save(os.path.join(self.dir, f'images/{i}.png'))
        self.studies = [{'id': f's{i}', 'image': f'images/{i}.png', 'report': 'FINDINGS:\nNodule in the right upper zone.'}
                        for i in range(3)]

    def tearDown(self):
        shutil.rmtree(self.dir)

    def write(self, studies, **extra):
        doc = {'schema': 'tessera.set/1', 'name': 't', 'synthetic': True, 'studies': studies, **extra}
        with open(os.path.join(self.dir, 'set.json'), 'w') as fh:
            json.dump(doc, fh)

    def test_read_sample_set_accepts_a_good_set(self):
        self.write(self.studies)
        manifest, boxes = sample_set.read_sample_set(self.dir)
        self.assertEqual(len(manifest['studies']), 3)
        self.assertEqual(boxes, {})

    def test_read_sample_set_names_the_first_bad_study(self):
        bad = [dict(s) for s in self.studies]
        bad[1]['image'] = 'images/missing.png'
        bad[2]['report'] = ''
        self.write(bad)
        with self.assertRaises(sample_set.SampleSetError) as ctx:
            sample_set.read_sample_set(self.dir)
        self.assertIn("study 1 (id 's1')", str(ctx.exception))

    def test_read_sample_set_rejects_a_duplicate_id_and_a_wrong_schema(self):
        self.write(self.studies + [dict(self.studies[0])])
        with self.assertRaises(sample_set.SampleSetError) as ctx:
            sample_set.read_sample_set(self.dir)
        self.assertIn('duplicate id', str(ctx.exception))
        with open(os.path.join(self.dir, 'set.json'), 'w') as fh:
            json.dump({'schema': 'tessera.set/0', 'studies': self.studies}, fh)
        with self.assertRaises(sample_set.SampleSetError):
            sample_set.read_sample_set(self.dir)

    def test_load_image_stretches_to_the_input_size(self):
        arr, original = sample_set.load_image(os.path.join(self.dir, 'images/2.png'), 64)
        self.assertEqual(original, (32, 32))
        self.assertEqual(arr.shape, (64, 64))
        self.assertAlmostEqual(float(arr.mean()), 80 / 255, places=5)

    def test_split_sentences_drops_headings_and_splits_lines(self):
        text = 'FINDINGS:\nThe heart is normal. No effusion.\n\nIMPRESSION:\nNormal chest radiograph.\n'
        self.assertEqual(sample_set.split_sentences(text),
                         ['The heart is normal.', 'No effusion.', 'Normal chest radiograph.'])
        self.assertEqual(sample_set.split_sentences(''), [])

    def test_is_negated_flags_trigger_words_only(self):
        self.assertTrue(sample_set.is_negated('No evidence of pneumothorax.'))
        self.assertTrue(sample_set.is_negated('There is no consolidation.'))
        self.assertFalse(sample_set.is_negated('Nodule in the right upper zone.'))
        self.assertFalse(sample_set.is_negated('The trachea is central.'))


    def test_sentence_negation_prefers_the_sets_labels_by_index(self):
        sents = ['A pleural line is seen at the right apex with no lung markings above it, in keeping with pneumothorax.',
                 'No effusion.', 'The trachea is central.']
        study = {'labels': {'sentences': [{'index': 0, 'negated': False}, {'index': 1, 'negated': True}]}}
        # The trigger words call the first sentence negated; the label says it is not.
        self.assertTrue(sample_set.is_negated(sents[0]))
        self.assertEqual(sample_set.sentence_negation(study, sents), [False, True, False])
        # Without labels (a researcher's own set) the trigger words decide.
        self.assertEqual(sample_set.sentence_negation({}, sents), [True, True, False])

class LossTest(unittest.TestCase):
    def test_pool_regions_softmax_lies_between_mean_and_max(self):
        sim = torch.randn(3, 2, 10)
        soft = train.pool_regions(sim, 'softmax', 0.1)
        self.assertTrue(bool((soft <= sim.max(-1).values + 1e-6).all()))
        self.assertTrue(bool((soft >= sim.mean(-1) - 1e-6).all()))
        self.assertTrue(torch.equal(train.pool_regions(sim, 'max', 0.1), sim.max(-1).values))

    def test_batch_loss_is_finite_and_reaches_every_parameter_it_should(self):
        torch.manual_seed(3)
        model = nets.DualEncoder({'field': 'small', 'dim': 16, 'coords': True, 'vocab_size': 20, 'max_tokens': 8})
        args = train.parse_args(['--set', 'x', '--out', 'y'])
        x = torch.randn(3, 1, 64, 64)
        tokens = [[2, 5, 3], [2, 6, 7, 3], [2, 8, 3]]
        for objective in ('local', 'global'):
            args.objective = objective
            model.zero_grad()
            loss = train.batch_loss(model, args, x, tokens, owner=[0, 0, 2])
            loss.backward()
            self.assertTrue(bool(torch.isfinite(loss)))
            self.assertIsNotNone(model.image.proj.weight.grad)
            self.assertIsNotNone(model.text.proj.weight.grad)

    def test_learning_rate_warms_up_then_decays_to_zero(self):
        args = train.parse_args(['--set', 'x', '--out', 'y', '--lr', '1.0', '--warmup', '0.1'])
        lrs = [train.learning_rate(s, 100, args) for s in range(100)]
        self.assertAlmostEqual(lrs[9], 1.0)
        self.assertLess(lrs[0], lrs[5])
        self.assertTrue(all(a >= b for a, b in zip(lrs[10:], lrs[11:])))
        self.assertLess(lrs[-1], 1e-3)


if __name__ == '__main__':
    unittest.main()
