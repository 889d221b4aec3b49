"""Unit tests of quantize.py. Run: /usr/bin/python3 -m unittest discover -s models/recipe -p 'test_*.py'"""

import hashlib
import json
import os
import sys
import unittest

import numpy as np
import onnx
from onnx import TensorProto, helper, numpy_helper

sys.path.insert(0, os.path.dirname(os.path.abspath(__file__)))
import quantize  # noqa: E402

ROOT = os.path.normpath(os.path.join(os.path.dirname(os.path.abspath(__file__)), '..', '..'))
INT8_FOLDER = os.path.join(ROOT, 'models', 'demo-local-int8')


class SymmetricPerChannelTest(unittest.TestCase):
    def test_round_trip_error_is_at_most_half_a_step_per_channel(self):
        rng = np.random.default_rng(0)
        # Channels of very different magnitudes: one scale per channel must follow each.
        w = rng.normal(size=(6, 4, 3, 3)).astype(np.float32) * np.array([1e-3, 0.1, 1, 10, 100, 0.5], np.float32)[:, None, None, None]
        q, scale = quantize.symmetric_per_channel(w, axis=0)
        self.assertEqual(q.dtype, np.int8)
        self.assertEqual(scale.shape, (6,))
        err = np.abs(q.astype(np.float32) * scale[:, None, None, None] - w)
        for c in range(6):
            self.assertLessEqual(err[c].max(), scale[c] / 2 * (1 + 1e-6))

    def test_the_largest_magnitude_maps_to_127_and_minus_128_is_unused(self):
        w = np.array([[-2.0, 1.0, 0.5], [0.25, -0.125, 0.0]], np.float32)
        q, scale = quantize.symmetric_per_channel(w, axis=0)
        np.testing.assert_array_equal(np.abs(q).max(axis=1), [127, 127])
        self.assertGreaterEqual(int(q.min()), -127)
        np.testing.assert_allclose(scale, [2.0 / 127, 0.25 / 127], rtol=1e-6)
        self.assertEqual(int(q[1, 2]), 0)  # zero stays exactly zero

    def test_a_zero_channel_gets_scale_one_and_stays_zero(self):
        w = np.zeros((2, 3), np.float32)
        w[1] = [1.0, -3.0, 2.0]
        q, scale = quantize.symmetric_per_channel(w, axis=0)
        self.assertEqual(float(scale[0]), 1.0)
        np.testing.assert_array_equal(q[0], [0, 0, 0])

    def test_another_axis_is_honoured(self):
        w = np.array([[1.0, 100.0], [-1.0, 50.0]], np.float32)
        _, scale = quantize.symmetric_per_channel(w, axis=1)
        np.testing.assert_allclose(scale, [1.0 / 127, 100.0 / 127], rtol=1e-6)

    def test_a_scalar_is_refused(self):
        with self.assertRaises(ValueError):
            quantize.symmetric_per_channel(np.float32(1.0))


class AffineUint8Test(unittest.TestCase):
    def test_zero_is_exact_and_the_range_round_trips_within_half_a_step(self):
        for lo, hi in ((-1.96, 1.41), (0.0, 7.2), (-3.0, -1.0), (2.0, 5.0)):
            with self.subTest(lo=lo, hi=hi):
                scale, zp = quantize.affine_uint8_params(lo, hi)
                self.assertEqual(float((quantize.quantize_uint8(0.0, scale, zp).astype(np.float32) - zp) * scale), 0.0)
                x = np.linspace(min(lo, 0), max(hi, 0), 1001, dtype=np.float32)
                back = (quantize.quantize_uint8(x, scale, zp).astype(np.float32) - float(zp)) * scale
                self.assertLessEqual(np.abs(back - x).max(), scale / 2 * (1 + 1e-5))

    def test_a_positive_range_has_zero_point_zero(self):
        _, zp = quantize.affine_uint8_params(0.5, 8.0)
        self.assertEqual(int(zp), 0)

    def test_uint8_with_zero_point_zero_equals_quantising_after_a_relu(self):
        # Why quantize.py may drop a Relu in front of a QuantizeLinear whose zero point is 0.
        x = np.random.default_rng(1).normal(size=1000).astype(np.float32) * 4
        scale, zp = quantize.affine_uint8_params(0.0, 6.0)
        np.testing.assert_array_equal(quantize.quantize_uint8(x, scale, zp), quantize.quantize_uint8(np.maximum(x, 0), scale, zp))

    def test_an_empty_range_gives_scale_one(self):
        self.assertEqual(quantize.affine_uint8_params(0.0, 0.0), (np.float32(1.0), np.uint8(0)))

    def test_bad_ranges_are_refused(self):
        for lo, hi in ((1.0, 0.0), (float('nan'), 1.0), (0.0, float('inf'))):
            with self.subTest(lo=lo, hi=hi), self.assertRaises(ValueError):
                quantize.affine_uint8_params(lo, hi)


class BiasTest(unittest.TestCase):
    def test_int32_bias_round_trips_within_half_a_step(self):
        b = np.array([0.3, -1.7, 0.0, 12.5], np.float32)
        q, scale = quantize.quantize_bias(b, 0.02, np.array([0.01, 0.003, 1.0, 0.05], np.float32))
        self.assertEqual(q.dtype, np.int32)
        np.testing.assert_allclose(scale, 0.02 * np.array([0.01, 0.003, 1.0, 0.05]), rtol=1e-6)
        self.assertTrue(np.all(np.abs(q * scale - b) <= scale / 2 * (1 + 1e-6)))

    def test_an_overflowing_bias_is_refused(self):
        with self.assertRaises(ValueError):
            quantize.quantize_bias(np.array([1e6], np.float32), 1e-6, np.array([1e-6], np.float32))


def tiny_conv_graph():
    """image [B, 1, 8, 8] -> Conv 3x3 (4 ch) -> Relu -> Conv 1x1 (2 ch) -> out."""
    rng = np.random.default_rng(3)
    inits = [
        numpy_helper.from_array(rng.normal(size=(4, 1, 3, 3)).astype(np.float32), 'w1'),
        numpy_helper.from_array(rng.normal(size=4).astype(np.float32), 'b1'),
        numpy_helper.from_array(rng.normal(size=(2, 4, 1, 1)).astype(np.float32), 'w2'),
        numpy_helper.from_array(rng.normal(size=2).astype(np.float32), 'b2'),
    ]
    nodes = [
        helper.make_node('Conv', ['image', 'w1', 'b1'], ['c1'], name='conv1', pads=[1, 1, 1, 1]),
        helper.make_node('Relu', ['c1'], ['r1'], name='relu1'),
        helper.make_node('Conv', ['r1', 'w2', 'b2'], ['out'], name='conv2'),
    ]
    graph = helper.make_graph(
        nodes, 'tiny',
        [helper.make_tensor_value_info('image', TensorProto.FLOAT, ['batch', 1, 8, 8])],
        [helper.make_tensor_value_info('out', TensorProto.FLOAT, ['batch', 2, 8, 8])], inits)
    return helper.make_model(graph, opset_imports=[helper.make_opsetid('', 17)])


RANGES = {name: {'min': lo, 'max': hi, 'percentiles': {'p99.9': [lo / 2, hi / 2]}}
          for name, lo, hi in (('image', -2.0, 1.5), ('c1', -4.0, 5.0), ('r1', 0.0, 5.0), ('out', -3.0, 3.0))}


class QuantizeModelTest(unittest.TestCase):
    def test_calibration_graph_adds_every_conv_input_and_output_once(self):
        model, added = quantize.calibration_graph(tiny_conv_graph())
        self.assertEqual(added, ['image', 'c1', 'r1'])  # 'out' is already an output
        self.assertEqual([o.name for o in model.graph.output], ['out', 'image', 'c1', 'r1'])
        onnx.checker.check_model(model, full_check=True)

    def test_every_quantised_conv_reads_dequantised_int8_weights_int32_bias_and_uint8_activations(self):
        float_model = tiny_conv_graph()
        model, convs = quantize.quantize_model(float_model, RANGES, last='int8')
        onnx.checker.check_model(model, full_check=True)
        quantize.check_same_interface(float_model, model)
        self.assertEqual(convs, ['conv1', 'conv2'])
        ops = [n.op_type for n in model.graph.node]
        self.assertNotIn('Relu', ops)
        producers = {o: n for n in model.graph.node for o in n.output}
        inits = {t.name: numpy_helper.to_array(t) for t in model.graph.initializer}
        for conv in (n for n in model.graph.node if n.op_type == 'Conv'):
            dq = [producers[i] for i in conv.input]
            self.assertEqual([n.op_type for n in dq], ['DequantizeLinear'] * 3)
            self.assertEqual(inits[dq[1].input[0]].dtype, np.int8)
            self.assertEqual(inits[dq[2].input[0]].dtype, np.int32)
            activation = producers[dq[0].input[0]]
            self.assertEqual(activation.op_type, 'QuantizeLinear')
            self.assertEqual(inits[activation.input[2]].dtype, np.uint8)
            # the bias scale is the input scale times each weight scale, as QLinearConv requires
            np.testing.assert_allclose(inits[dq[2].input[1]], inits[dq[0].input[1]] * inits[dq[1].input[1]], rtol=1e-6)
        # the Relu's place: a zero-point-0 QuantizeLinear with the Relu output's range
        relu_q = producers['r1']
        self.assertEqual(relu_q.op_type, 'DequantizeLinear')
        self.assertEqual(int(inits[relu_q.input[2]]), 0)
        self.assertAlmostEqual(float(inits[relu_q.input[1]]), 5.0 / 255, places=6)
        self.assertEqual(producers['out'].op_type, 'DequantizeLinear')

    def test_last_float_keeps_the_output_conv_in_float(self):
        model, convs = quantize.quantize_model(tiny_conv_graph(), RANGES, last='float')
        onnx.checker.check_model(model, full_check=True)
        self.assertEqual(convs, ['conv1'])
        last = next(n for n in model.graph.node if 'out' in n.output)
        self.assertEqual((last.op_type, list(last.input)), ('Conv', ['r1', 'w2', 'b2']))

    def test_percentile_ranges_are_used_when_asked(self):
        model, _ = quantize.quantize_model(tiny_conv_graph(), RANGES, statistic='p99.9', last='float')
        inits = {t.name: numpy_helper.to_array(t) for t in model.graph.initializer}
        self.assertAlmostEqual(float(inits['image_scale']), (0.75 + 1.0) / 255, places=6)

    def test_a_missing_range_names_the_tensor(self):
        ranges = {k: v for k, v in RANGES.items() if k != 'image'}
        with self.assertRaisesRegex(KeyError, "'image'"):
            quantize.quantize_model(tiny_conv_graph(), ranges)
        with self.assertRaises(ValueError):
            quantize.quantize_model(tiny_conv_graph(), RANGES, last='int4')


@unittest.skipUnless(os.path.exists(os.path.join(INT8_FOLDER, 'quantization.json')), 'models/demo-local-int8 not present')
class CommittedInt8FolderTest(unittest.TestCase):
    def test_the_committed_graph_is_rebuilt_exactly_from_its_recorded_ranges(self):
        with open(os.path.join(INT8_FOLDER, 'quantization.json'), encoding='utf-8') as f:
            record = json.load(f)
        with open(os.path.join(INT8_FOLDER, 'tessera-model.json'), encoding='utf-8') as f:
            manifest = json.load(f)
        source = os.path.join(ROOT, record['source']['folder'], 'image-encoder.onnx')
        self.assertEqual(quantize.sha256_file(source), record['source']['image_encoder_sha256'])
        model, convs = quantize.quantize_model(onnx.load(source), record['calibration']['tensors'], record['ranges'], record['last_layer'])
        self.assertEqual(convs, record['quantized_convs'])
        self.assertEqual(hashlib.sha256(model.SerializeToString()).hexdigest(), manifest['hashes']['image-encoder.onnx'])


if __name__ == '__main__':
    unittest.main()
