"""Rebuilds a PyTorch checkpoint (the format train.py writes) from an exported Tessera model folder.

  /usr/bin/python3 models/recipe/rebuild_checkpoint.py --model models/demo-local --out /tmp/demo-local-rebuilt.pt

For when the training checkpoint is lost but the ONNX graphs made by export.py remain. The nets are
built from training.json's config, and each ONNX initializer is mapped to a parameter by the node
that reads it (its export scope and op), not by its own name, since constant folding renames,
transposes and shares tensors:
- each Conv of the image body had its BatchNorm folded in (weight w * g / sqrt(v + e),
  bias b - m * g / sqrt(v + e)); the folded weight goes to the Conv and the BatchNorm becomes the
  identity plus the folded bias (gamma 1, mean 0, var 1 - eps, beta the bias): the same function;
- the attention input projection and both feed-forward weights are stored transposed as MatMul
  operands, and are transposed back;
- parameters of equal value (layer norms at their initial ones and zeros, copies of one layer not yet
  trained) may share one tensor, handed on by Identity nodes.
The rebuilt nets are checked against reference-outputs.json (the PyTorch outputs recorded at export)
before anything is written; a mismatch above the recorded tolerance is an error.
"""

import argparse
import base64
import json
import os
import sys

import numpy as np
import onnx
import torch
from onnx import numpy_helper

sys.path.insert(0, os.path.dirname(os.path.abspath(__file__)))
from nets import DualEncoder  # noqa: E402
from wordpiece import WordPieceTokenizer  # noqa: E402


class RebuildError(Exception):
    """A model folder whose graphs cannot be mapped onto the recipe's nets; the message names the tensor."""


def module_path(node_name):
    """The module a node was exported from: '/encoder/layers.0/norm1/LayerNormalization' ->
    'encoder.layers.0.norm1'; a scope that repeats its parent's name ('/body/body.3/Conv') -> 'body.3'."""
    path = []
    for part in node_name.split('/')[1:-1]:
        if path and part.startswith(path[-1] + '.'):
            path[-1] = part
        else:
            path.append(part)
    return '.'.join(path)


def _attribute(node, name, default):
    for a in node.attribute:
        if a.name == name:
            return onnx.helper.get_attribute_value(a)
    return default


def _parameter_key(node, k, target):
    """(parameter name, transposed?) of input k of node, exported from module target; None if none fits."""
    op = node.op_type
    if isinstance(target, torch.nn.MultiheadAttention):
        if op == 'Gemm':  # the output projection is exported in the attention's own scope
            return ('out_proj.weight', not _attribute(node, 'transB', 0)) if k == 1 else ('out_proj.bias', False)
        return {'MatMul': ('in_proj_weight', True), 'Add': ('in_proj_bias', False)}.get(op)
    if isinstance(target, torch.nn.Linear):
        if op == 'MatMul':
            return 'weight', True
        if op == 'Add':
            return 'bias', False
        if op == 'Gemm':
            return ('weight', not _attribute(node, 'transB', 0)) if k == 1 else ('bias', False)
    if isinstance(target, (torch.nn.LayerNorm, torch.nn.Conv2d)) and op in ('LayerNormalization', 'Conv'):
        return ('weight' if k == 1 else 'bias'), False
    if isinstance(target, torch.nn.Embedding) and op == 'Gather' and k == 0:
        return 'weight', False
    return None


def _parameters_by_node(graph, module):
    """({state_dict key: array}, initializers, names used): each initializer named by the node reading it."""
    weights = {t.name: numpy_helper.to_array(t) for t in graph.initializer}
    modules = dict(module.named_modules())
    out, used = {}, set()
    # Equal tensors are stored once and handed on by Identity nodes (copies of one layer start equal).
    aliases = {}
    for node in graph.node:
        if node.op_type == 'Identity' and node.input[0] in weights:
            aliases[node.output[0]] = node.input[0]
    for node in graph.node:
        if node.op_type == 'Identity' and node.output[0] in aliases:
            continue
        path = module_path(node.name)
        for k, name in enumerate(node.input):
            name = aliases.get(name, name)
            if name not in weights or path not in modules:
                continue
            key = _parameter_key(node, k, modules[path])
            if key is None:
                raise RebuildError(f'{node.name} ({node.op_type}) reads {name}, which maps to no parameter of {path}')
            out[f'{path}.{key[0]}'] = weights[name].T if key[1] else weights[name]
            used.add(name)
    return out, weights, used


def _checked(out, target, weights, used, which):
    missing = [k for k in target if k not in out]
    unused = [k for k in weights if k not in used]
    wrong = [f'{k} {tuple(out[k].shape)} vs {tuple(target[k].shape)}' for k in out
             if k in target and tuple(out[k].shape) != tuple(target[k].shape)]
    problems = ([f'{which}: no ONNX tensor for {k}' for k in missing]
                + [f'{which}: unmapped ONNX tensor {k}' for k in unused]
                + [f'{which}: shape {w}' for w in wrong])
    if problems:
        raise RebuildError('; '.join(problems))
    return {k: torch.from_numpy(np.array(out[k])).to(target[k].dtype) for k in target}


def image_state_dict(graph, module):
    """state_dict for nets.ImageEncoder from its exported graph (BatchNorm folded into each body Conv)."""
    out, weights, used = _parameters_by_node(graph, module)
    for i, layer in enumerate(module.body):
        if not isinstance(layer, torch.nn.BatchNorm2d):
            continue
        bias = out.pop(f'body.{i - 1}.bias', None)
        if bias is None:
            raise RebuildError(f'image: no folded Conv bias for body.{i - 1} (BatchNorm body.{i}); the graph does '
                               f'not fit the {len(module.layers_spec)}-layer field in training.json')
        out[f'body.{i}.weight'] = np.ones_like(bias)
        out[f'body.{i}.bias'] = bias
        out[f'body.{i}.running_mean'] = np.zeros_like(bias)
        out[f'body.{i}.running_var'] = np.full_like(bias, 1.0 - layer.eps)
        out[f'body.{i}.num_batches_tracked'] = np.array(0, dtype=np.int64)
    return _checked(out, module.state_dict(), weights, used, 'image')


def text_state_dict(graph, module):
    """state_dict for nets.TextEncoder from its exported graph."""
    out, weights, used = _parameters_by_node(graph, module)
    return _checked(out, module.state_dict(), weights, used, 'text')


def _f32(doc):
    return np.frombuffer(base64.b64decode(doc['base64']), dtype='<f4').reshape(doc['dims'])


def reference_errors(model, reference):
    """Largest absolute differences (image, text) between the nets and reference-outputs.json."""
    image_in = torch.from_numpy(_f32(reference['image']['input']).copy())
    ids = torch.tensor(reference['text']['input_ids']['values'], dtype=torch.long)
    mask = torch.tensor(reference['text']['attention_mask']['values'], dtype=torch.long)
    with torch.no_grad():
        regions = model.image(image_in).numpy()
        sentences = model.text(ids, mask).numpy()
    return (float(np.abs(regions - _f32(reference['image']['output'])).max()),
            float(np.abs(sentences - _f32(reference['text']['output'])).max()))


def rebuild(folder):
    """(checkpoint dict as train.py writes it, (image error, text error) against the reference outputs)."""
    with open(os.path.join(folder, 'training.json'), encoding='utf-8') as fh:
        card = json.load(fh)
    with open(os.path.join(folder, 'tessera-model.json'), encoding='utf-8') as fh:
        manifest = json.load(fh)
    with open(os.path.join(folder, 'reference-outputs.json'), encoding='utf-8') as fh:
        reference = json.load(fh)
    config = card['config']
    model = DualEncoder(config).eval()
    image_graph = onnx.load(os.path.join(folder, manifest['image']['file'])).graph
    text_graph = onnx.load(os.path.join(folder, manifest['text']['file'])).graph
    model.image.load_state_dict(image_state_dict(image_graph, model.image))
    model.text.load_state_dict(text_state_dict(text_graph, model.text))
    errors = reference_errors(model, reference)
    tolerance = float(reference.get('tolerance', 1e-4))
    if max(errors) > tolerance:
        raise RebuildError(f'{folder}: rebuilt nets differ from reference-outputs.json by {errors} '
                           f'(image, text), above the tolerance {tolerance}')
    tokenizer = WordPieceTokenizer.load(os.path.join(folder, manifest['text']['tokenizer']))
    training = dict(card.get('training') or {})
    training['rebuilt_from'] = f'{folder} (ONNX graphs; BatchNorm kept folded into the Conv weights)'
    ckpt = {'config': config, 'state_dict': model.state_dict(), 'tokenizer': tokenizer.to_json(), 'training': training}
    return ckpt, errors


def main(argv=None):
    p = argparse.ArgumentParser(description=__doc__, formatter_class=argparse.RawDescriptionHelpFormatter)
    p.add_argument('--model', required=True, help='Tessera model folder made by export.py')
    p.add_argument('--out', required=True, help='checkpoint file to write (.pt)')
    args = p.parse_args(argv if argv is not None else sys.argv[1:])
    torch.set_num_threads(2)
    try:
        ckpt, errors = rebuild(args.model)
    except RebuildError as e:
        print(f'rebuild: {e}', file=sys.stderr)
        return 1
    torch.save(ckpt, args.out)
    print(f'rebuild: wrote {args.out}; max |diff| vs reference outputs: image {errors[0]:.2e}, text {errors[1]:.2e}')
    return 0


if __name__ == '__main__':
    sys.exit(main())
