"""Static int8 quantisation of an image encoder, written by hand with the onnx Python API.

ONNX Runtime reads a float graph with QuantizeLinear/DequantizeLinear pairs around each Conv (the
QDQ form) and fuses every DequantizeLinear -> Conv -> QuantizeLinear group into one QLinearConv.
This script writes such a graph:

- weights: int8, symmetric, one scale per output channel (axis 0), zero point 0;
- activations: uint8, one scale and zero point per tensor, from ranges measured on calibration
  images (calibrate.ts); a Relu after a Conv is dropped, because QuantizeLinear with zero point 0
  clips the negative values to 0 exactly as the Relu did;
- biases: int32 with scale = input scale x weight scale of each channel, as QLinearConv expects;
- the graph's input and output keep their names, types and shapes, so the manifest holds unchanged.

Three steps (from the repository root):

  R=models/recipe; PY=/usr/bin/python3
  npm run tessera -- phantom --n 64 --seed 4004 --out /tmp/calib-4004 --size 224
  $PY $R/quantize.py calibration-graph --model models/demo-local/image-encoder.onnx --out /tmp/calib.onnx
  npx tsx $R/calibrate.ts --graph /tmp/calib.onnx --model models/demo-local --set /tmp/calib-4004 \
      --out /tmp/calib-ranges.json
  $PY $R/quantize.py folder --source models/demo-local --ranges /tmp/calib-ranges.json \
      --out models/demo-local-int8 --id demo-local-int8 --description "..."

`quantize` writes only the int8 graph; `folder` writes a whole model folder: the int8 image encoder,
the source folder's text encoder and tokenizer files copied, the manifest with the new id,
description and sha256 hashes, and quantization.json (how the graph was made).
"""

import argparse
import hashlib
import json
import os
import shutil
import sys

import numpy as np
import onnx
from onnx import TensorProto, helper, numpy_helper

QUANTIZABLE = ('Conv',)
UINT8_MIN, UINT8_MAX = 0, 255
INT8_MAX = 127
INT32_MIN, INT32_MAX = -(2 ** 31), 2 ** 31 - 1


def symmetric_per_channel(weights, axis=0):
    """Int8 symmetric quantisation with one scale per slice along `axis` (output channels).

    Returns (q int8 with values in [-127, 127], scale float32 of length weights.shape[axis]) so that
    q * scale reconstructs weights within scale / 2 per element. A channel of zeros gets scale 1 (any
    scale represents it exactly). -128 is never used, keeping the grid symmetric about 0.
    """
    w = np.asarray(weights, dtype=np.float32)
    if w.ndim == 0:
        raise ValueError(f"'weights' must have at least one axis; got a scalar")
    moved = np.moveaxis(w, axis, 0)
    peak = np.abs(moved.reshape(moved.shape[0], -1)).max(axis=1)
    scale = np.where(peak > 0, peak / INT8_MAX, 1.0).astype(np.float32)
    shape = [1] * w.ndim
    shape[axis] = -1
    q = np.clip(np.rint(w / scale.reshape(shape)), -INT8_MAX, INT8_MAX).astype(np.int8)
    return q, scale


def affine_uint8_params(lo, hi):
    """Scale and zero point of uint8 affine quantisation covering [lo, hi].

    The range is widened to include 0, so that 0 (padding, a Relu's floor) is represented exactly.
    An empty range (lo == hi == 0) gives scale 1, zero point 0. Returns (float32 scale, uint8 zp).
    """
    lo, hi = float(lo), float(hi)
    if not (np.isfinite(lo) and np.isfinite(hi)) or lo > hi:
        raise ValueError(f"'lo' and 'hi' must be finite with lo <= hi; got [{lo}, {hi}]")
    lo, hi = min(lo, 0.0), max(hi, 0.0)
    if hi == lo:
        return np.float32(1.0), np.uint8(0)
    scale = np.float32((hi - lo) / (UINT8_MAX - UINT8_MIN))
    zero_point = np.uint8(np.clip(np.rint(UINT8_MIN - lo / scale), UINT8_MIN, UINT8_MAX))
    return scale, zero_point


def quantize_uint8(x, scale, zero_point):
    """QuantizeLinear to uint8 as ONNX defines it: saturate(round_half_even(x / scale) + zero_point)."""
    return np.clip(np.rint(np.asarray(x, np.float32) / scale) + int(zero_point), UINT8_MIN, UINT8_MAX).astype(np.uint8)


def quantize_bias(bias, input_scale, weight_scales):
    """Int32 bias for QLinearConv: round(b / (input_scale * weight_scale[c])), zero point 0.

    Returns (q int32, scale float32 per channel). Raises when a value would overflow int32.
    """
    scale = (np.float32(input_scale) * np.asarray(weight_scales, np.float32)).astype(np.float32)
    q = np.rint(np.asarray(bias, np.float32).astype(np.float64) / scale.astype(np.float64))
    if q.min(initial=0) < INT32_MIN or q.max(initial=0) > INT32_MAX:
        raise ValueError('a bias does not fit int32 at scale input_scale * weight_scale; the calibrated input range is too narrow')
    return q.astype(np.int32), scale


def calibration_graph(model):
    """A copy of `model` whose outputs also include every input and output of each Conv.

    Returns (model, names of the added outputs). calibrate.ts measures each output's range.
    """
    out = onnx.ModelProto()
    out.CopyFrom(model)
    g = out.graph
    initializers = {t.name for t in g.initializer}
    have = {o.name for o in g.output}
    added = []
    for node in g.node:
        if node.op_type not in QUANTIZABLE:
            continue
        for name in (node.input[0], node.output[0]):
            if name in initializers or name in have or name in added:
                continue
            added.append(name)
    typed = onnx.shape_inference.infer_shapes(model).graph
    inferred = {v.name: v for v in list(typed.value_info) + list(typed.input)}
    for name in added:
        if name in inferred:
            g.output.append(inferred[name])
        else:
            g.output.append(helper.make_tensor_value_info(name, TensorProto.FLOAT, None))
    return out, added


def range_of(ranges, name, statistic):
    """(lo, hi) of a calibrated tensor: 'minmax' or a percentile pair such as 'p99.99'."""
    entry = ranges.get(name)
    if entry is None:
        raise KeyError(f"no calibrated range for tensor '{name}'; run calibrate.ts on the calibration graph of this model")
    if statistic == 'minmax':
        return entry['min'], entry['max']
    pct = entry.get('percentiles', {}).get(statistic)
    if pct is None:
        raise KeyError(f"tensor '{name}' has no '{statistic}' range; calibrate.ts wrote {sorted(entry.get('percentiles', {}))}")
    return pct[0], pct[1]


class _Builder:
    """Collects the new nodes and initializers of the QDQ graph."""

    def __init__(self):
        self.nodes, self.initializers, self.quantized = [], [], {}

    def constant(self, name, array):
        self.initializers.append(numpy_helper.from_array(np.asarray(array), name))
        return name

    def qdq(self, source, scale, zero_point, dequantized):
        """source (float) -> QuantizeLinear -> DequantizeLinear -> `dequantized` (float)."""
        s = self.constant(f'{source}_scale', np.float32(scale))
        z = self.constant(f'{source}_zero_point', np.uint8(zero_point))
        q = f'{source}_quantized'
        self.nodes.append(helper.make_node('QuantizeLinear', [source, s, z], [q], name=f'{source}_QuantizeLinear'))
        self.nodes.append(helper.make_node('DequantizeLinear', [q, s, z], [dequantized], name=f'{source}_DequantizeLinear'))
        self.quantized[dequantized] = (np.float32(scale), np.uint8(zero_point))

    def dequantized_constant(self, name, q, scale, axis):
        zp = self.constant(f'{name}_zero_point', np.zeros_like(q, shape=scale.shape))
        s = self.constant(f'{name}_scale', scale.astype(np.float32))
        self.constant(f'{name}_quantized', q)
        out = f'{name}_dequantized'
        self.nodes.append(helper.make_node('DequantizeLinear', [f'{name}_quantized', s, zp], [out], name=f'{name}_DequantizeLinear', axis=axis))
        return out


def quantize_model(model, ranges, statistic='minmax', last='float'):
    """The QDQ int8 form of a float graph of Conv (+ Relu) layers (see the module doc).

    `ranges` maps tensor names to calibrated {'min', 'max', 'percentiles'}; `statistic` picks
    'minmax' or a percentile pair; `last` is 'float' (the Conv writing a graph output keeps float
    weights and output, reading the int8 activation before it) or 'int8' (it is quantised too and its
    output passes through a uint8 QuantizeLinear/DequantizeLinear pair). Returns a new ModelProto.
    """
    if last not in ('float', 'int8'):
        raise ValueError(f"'last' must be 'float' or 'int8'; got {last!r}")
    g = model.graph
    init = {t.name: numpy_helper.to_array(t) for t in g.initializer}
    graph_outputs = {o.name for o in g.output}
    consumers = {}
    for node in g.node:
        for name in node.input:
            consumers.setdefault(name, []).append(node)
    b = _Builder()
    # Conv output -> the Relu that only it feeds, whose QuantizeLinear replaces it.
    relu_after = {}
    for node in g.node:
        if node.op_type == 'Conv' and node.output[0] not in graph_outputs:
            users = consumers.get(node.output[0], [])
            if len(users) == 1 and users[0].op_type == 'Relu':
                relu_after[node.output[0]] = users[0]
    dropped_relus = {id(r) for r in relu_after.values()}
    quantized_convs = []

    for node in g.node:
        if id(node) in dropped_relus:
            continue
        keep_float = node.op_type == 'Conv' and node.output[0] in graph_outputs and last == 'float'
        if node.op_type not in QUANTIZABLE or keep_float:
            b.nodes.append(node)
            continue
        x, w_name = node.input[0], node.input[1]
        if w_name not in init:
            raise ValueError(f"Conv '{node.name}': weight '{w_name}' is not an initializer; only constant weights are quantised")
        if x not in b.quantized:
            lo, hi = range_of(ranges, x, statistic)
            b.qdq(x, *affine_uint8_params(lo, hi), dequantized=f'{x}_dequantized')
            x = f'{x}_dequantized'
        x_scale = b.quantized[x][0]
        wq, w_scale = symmetric_per_channel(init[w_name], axis=0)
        inputs = [x, b.dequantized_constant(w_name, wq, w_scale, axis=0)]
        if len(node.input) > 2 and node.input[2]:
            bq, b_scale = quantize_bias(init[node.input[2]], x_scale, w_scale)
            inputs.append(b.dequantized_constant(node.input[2], bq, b_scale, axis=0))
        y = node.output[0]
        relu = relu_after.get(y)
        float_out = f'{y}_float'
        conv = helper.make_node('Conv', inputs, [float_out], name=node.name or y)
        conv.attribute.extend(node.attribute)
        b.nodes.append(conv)
        quantized_convs.append(node.name or y)
        if relu is not None:
            # uint8 with zero point 0 saturates below 0: the same values the Relu gave.
            _, hi = range_of(ranges, relu.output[0] if relu.output[0] in ranges else y, statistic)
            b.qdq(float_out, *affine_uint8_params(0.0, max(hi, 0.0)), dequantized=relu.output[0])
        else:
            lo, hi = range_of(ranges, y, statistic)
            b.qdq(float_out, *affine_uint8_params(lo, hi), dequantized=y)

    used = {name for node in b.nodes for name in node.input}
    kept = [t for t in g.initializer if t.name in used]
    graph = helper.make_graph(b.nodes, g.name, list(g.input), list(g.output), kept + b.initializers,
                              value_info=[])
    out = helper.make_model(graph, opset_imports=list(model.opset_import), producer_name='tessera quantize.py',
                            ir_version=model.ir_version)
    out.doc_string = f'int8 QDQ form of a float graph: {len(quantized_convs)} Conv layers quantised ({statistic} ranges, last layer {last}).'
    return out, quantized_convs


def check_same_interface(float_model, int8_model):
    """Raises unless both graphs have the same input and output names, element types and shapes."""
    def sig(values):
        return [(v.name, v.type.tensor_type.elem_type,
                 [d.dim_param or d.dim_value for d in v.type.tensor_type.shape.dim]) for v in values]
    for kind in ('input', 'output'):
        a, b = sig(getattr(float_model.graph, kind)), sig(getattr(int8_model.graph, kind))
        if a != b:
            raise ValueError(f'graph {kind}s differ: float {a}, int8 {b}')


def sha256_file(path):
    with open(path, 'rb') as f:
        return hashlib.sha256(f.read()).hexdigest()


def write_graph(model, path, reference=None):
    onnx.checker.check_model(model, full_check=True)
    if reference is not None:
        check_same_interface(reference, model)
    onnx.save(model, path)


def write_folder(args):
    src = args.source
    with open(os.path.join(src, 'tessera-model.json'), encoding='utf-8') as f:
        manifest = json.load(f)
    with open(args.ranges, encoding='utf-8') as f:
        calibration = json.load(f)
    float_path = os.path.join(src, manifest['image']['file'])
    float_model = onnx.load(float_path)
    int8_model, convs = quantize_model(float_model, calibration['tensors'], args.statistic, args.last)
    os.makedirs(args.out, exist_ok=True)
    write_graph(int8_model, os.path.join(args.out, manifest['image']['file']), float_model)
    text_dir = os.path.dirname(manifest['text']['tokenizer'])
    copied = [manifest['text']['file'], manifest['text']['tokenizer'], os.path.join(text_dir, 'tokenizer_config.json')]
    for name in copied:
        if os.path.exists(os.path.join(src, name)):
            os.makedirs(os.path.dirname(os.path.join(args.out, name)) or args.out, exist_ok=True)
            shutil.copyfile(os.path.join(src, name), os.path.join(args.out, name))
    source_id = manifest['id']
    manifest['id'] = args.id
    manifest['description'] = args.description
    hashed = [manifest['image']['file'], manifest['text']['file'], manifest['text']['tokenizer']]
    manifest['hashes'] = {name: sha256_file(os.path.join(args.out, name)) for name in hashed}
    with open(os.path.join(args.out, 'tessera-model.json'), 'w', encoding='utf-8') as f:
        json.dump(manifest, f, indent=2)
        f.write('\n')
    record = {
        'schema': 'tessera.quantization/1',
        'source': {'folder': os.path.normpath(src), 'id': source_id, 'image_encoder_sha256': sha256_file(float_path)},
        'method': 'static QDQ: weights int8 symmetric per output channel; activations uint8 per tensor; biases int32',
        'ranges': args.statistic,
        'last_layer': args.last,
        'quantized_convs': convs,
        'calibration': calibration,
        'copied_from_source': [c for c in copied if os.path.exists(os.path.join(src, c))],
    }
    with open(os.path.join(args.out, 'quantization.json'), 'w', encoding='utf-8') as f:
        json.dump(record, f, indent=1)
        f.write('\n')
    print(f'wrote {args.out}: {len(convs)} Conv layers int8, ranges {args.statistic}, last layer {args.last}')


def parse_args(argv):
    p = argparse.ArgumentParser(description=__doc__, formatter_class=argparse.RawDescriptionHelpFormatter)
    sub = p.add_subparsers(dest='command', required=True)
    c = sub.add_parser('calibration-graph', help='write the float graph with every Conv input and output as an extra output')
    c.add_argument('--model', required=True)
    c.add_argument('--out', required=True)
    for name, helptext in (('quantize', 'write the int8 QDQ graph'), ('folder', 'write a model folder with the int8 image encoder')):
        q = sub.add_parser(name, help=helptext)
        q.add_argument('--ranges', required=True, help='JSON written by calibrate.ts')
        q.add_argument('--out', required=True)
        q.add_argument('--statistic', default='minmax', help="'minmax' or a percentile pair calibrate.ts wrote, e.g. 'p99.99'")
        q.add_argument('--last', default='float', choices=('float', 'int8'), help='quantise the Conv that writes the graph output too')
        if name == 'quantize':
            q.add_argument('--model', required=True)
        else:
            q.add_argument('--source', required=True, help='the float model folder')
            q.add_argument('--id', required=True)
            q.add_argument('--description', required=True)
    return p.parse_args(argv)


def main(argv=None):
    args = parse_args(argv)
    if args.command == 'calibration-graph':
        model, added = calibration_graph(onnx.load(args.model))
        onnx.checker.check_model(model, full_check=True)
        onnx.save(model, args.out)
        print(f'wrote {args.out} with {len(added)} extra outputs')
    elif args.command == 'quantize':
        with open(args.ranges, encoding='utf-8') as f:
            ranges = json.load(f)['tensors']
        float_model = onnx.load(args.model)
        model, convs = quantize_model(float_model, ranges, args.statistic, args.last)
        write_graph(model, args.out, float_model)
        print(f'wrote {args.out}: {len(convs)} Conv layers int8')
    else:
        write_folder(args)


if __name__ == '__main__':
    sys.exit(main())
