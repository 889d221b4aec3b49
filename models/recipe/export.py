"""Exports a trained checkpoint to a Tessera model folder (the model contract, tessera.model/1).

  /usr/bin/python3 models/recipe/export.py --checkpoint /tmp/demo-local.pt --out models/demo-local \
      --id demo-local --description "..."
  # the same architecture and tokenizer with random weights (a control that should not ground):
  /usr/bin/python3 models/recipe/export.py --checkpoint /tmp/demo-local.pt --untrained --seed 11 \
      --out tests/fixtures/untrained-control --id untrained-control --description "..."

Writes tessera-model.json, image-encoder.onnx, text-encoder.onnx, tokenizer.json (with
tokenizer_config.json beside it, naming the padding token), and
reference-outputs.json (fixed inputs with the PyTorch outputs, for ONNX Runtime parity tests), and
training.json (how the weights were made). Each graph is checked with onnx.checker.
"""

import argparse
import base64
import hashlib
import json
import os
import sys

import numpy as np
import onnx
import torch

sys.path.insert(0, os.path.dirname(os.path.abspath(__file__)))
from nets import build_model  # noqa: E402
from wordpiece import WordPieceTokenizer  # noqa: E402

OPSET = 17
IMAGE_FILE, TEXT_FILE, TOKENIZER_FILE = 'image-encoder.onnx', 'text-encoder.onnx', 'tokenizer.json'
REFERENCE_SENTENCES = [
    'There is a small nodule in the right upper zone.',
    'No pleural effusion.',
    'Heart size is normal.',
    'Patchy consolidation at the LEFT base, café-au-lait; re-check in 6/52!',
]


def f32_base64(array):
    return base64.b64encode(np.ascontiguousarray(array, dtype='<f4').tobytes()).decode('ascii')


def reference_pixels(size):
    """Two fixed 8-bit test images [2, size, size]: a smooth phantom-like picture, and seeded noise."""
    yy, xx = np.mgrid[0:size, 0:size].astype(np.float64) / size
    a = 200.0 - 60.0 * yy
    for cx in (0.3, 0.7):
        a = np.where(((xx - cx) / 0.18) ** 2 + ((yy - 0.5) / 0.35) ** 2 < 1.0, 60.0 + 30.0 * xx, a)
    a = np.where((xx - 0.25) ** 2 + (yy - 0.3) ** 2 < 0.004, 170.0, a)
    b = np.random.default_rng(20261201).integers(0, 256, (size, size))
    return np.stack([np.clip(np.rint(a), 0, 255), b]).astype(np.uint8)


def sha256(path):
    h = hashlib.sha256()
    with open(path, 'rb') as fh:
        for chunk in iter(lambda: fh.read(1 << 20), b''):
            h.update(chunk)
    return h.hexdigest()


def parse_args(argv):
    p = argparse.ArgumentParser(description=__doc__, formatter_class=argparse.RawDescriptionHelpFormatter)
    p.add_argument('--checkpoint', required=True)
    p.add_argument('--out', required=True)
    p.add_argument('--id', required=True)
    p.add_argument('--description', required=True)
    p.add_argument('--untrained', action='store_true', help='random weights, same architecture and tokenizer')
    p.add_argument('--seed', type=int, default=11, help='seed of the random weights with --untrained')
    p.add_argument('--evaluation', help='JSON file from evaluate.py to copy into training.json')
    return p.parse_args(argv)


def main(argv=None):
    args = parse_args(argv if argv is not None else sys.argv[1:])
    torch.set_num_threads(2)
    ckpt = torch.load(args.checkpoint, map_location='cpu')
    config = ckpt['config']
    model = build_model(ckpt, untrained=args.untrained, seed=args.seed)
    tokenizer = WordPieceTokenizer(ckpt['tokenizer']['model']['vocab'])
    os.makedirs(args.out, exist_ok=True)
    size = config['size']

    pixels = reference_pixels(size)
    image_in = torch.from_numpy(((pixels.astype(np.float32) / 255.0) * 1.0 - config['mean']) / config['std'])
    image_in = image_in.unsqueeze(1).contiguous()
    ids, mask = tokenizer.batch(REFERENCE_SENTENCES, config['max_tokens'])
    ids_t, mask_t = torch.tensor(ids, dtype=torch.long), torch.tensor(mask, dtype=torch.long)

    # Gradients stay on during export: torch 1.13 exports the TransformerEncoder only on its plain path.
    image_path = os.path.join(args.out, IMAGE_FILE)
    torch.onnx.export(model.image, (image_in,), image_path, input_names=['image'], output_names=['regions'],
                      dynamic_axes={'image': {0: 'batch'}, 'regions': {0: 'batch'}}, opset_version=OPSET,
                      do_constant_folding=True)
    text_path = os.path.join(args.out, TEXT_FILE)
    torch.onnx.export(model.text, (ids_t, mask_t), text_path, input_names=['input_ids', 'attention_mask'],
                      output_names=['sentence_embedding'],
                      dynamic_axes={'input_ids': {0: 'batch', 1: 'tokens'}, 'attention_mask': {0: 'batch', 1: 'tokens'},
                                    'sentence_embedding': {0: 'batch'}},
                      opset_version=OPSET, do_constant_folding=True)
    for path in (image_path, text_path):
        onnx.checker.check_model(onnx.load(path), full_check=True)
    tokenizer.save(os.path.join(args.out, TOKENIZER_FILE))
    # tokenizer.json stores no padding; the loader takes the padding token from this file beside it.
    with open(os.path.join(args.out, 'tokenizer_config.json'), 'w', encoding='utf-8') as fh:
        json.dump({'pad_token': '[PAD]', 'unk_token': '[UNK]', 'cls_token': '[CLS]', 'sep_token': '[SEP]',
                   'mask_token': '[MASK]', 'do_lower_case': True, 'model_max_length': config['max_tokens']}, fh, indent=1)
        fh.write('\n')

    with torch.no_grad():
        regions = model.image(image_in).numpy()
        sentences = model.text(ids_t, mask_t).numpy()
    grid = {'h': int(regions.shape[2]), 'w': int(regions.shape[3])}
    reference = {
        'schema': 'tessera.reference-outputs/1',
        'note': 'PyTorch outputs for fixed inputs; ONNX Runtime must agree within tolerance. Float arrays are '
                'base64 of little-endian float32, row-major; the image pixels are base64 of uint8.',
        'made_by': f'models/recipe/export.py --checkpoint <{os.path.basename(args.checkpoint)}> --out {args.out}'
                   + (' --untrained' if args.untrained else ''),
        'torch': torch.__version__,
        'tolerance': 1e-4,
        'image': {
            'pixels': {'dims': list(pixels.shape), 'dtype': 'uint8', 'base64': base64.b64encode(pixels.tobytes()).decode()},
            'preprocess': {'value': 'pixels / 255', 'scale': 1.0, 'mean': config['mean'], 'std': config['std']},
            'input': {'name': 'image', 'dims': list(image_in.shape), 'dtype': 'float32', 'base64': f32_base64(image_in.numpy())},
            'output': {'name': 'regions', 'dims': list(regions.shape), 'dtype': 'float32', 'base64': f32_base64(regions),
                       'first_values': [round(float(v), 6) for v in regions.reshape(-1)[:8]]},
        },
        'text': {
            'sentences': REFERENCE_SENTENCES,
            'max_tokens': config['max_tokens'],
            'input_ids': {'name': 'input_ids', 'dims': list(ids_t.shape), 'dtype': 'int64', 'values': ids},
            'attention_mask': {'name': 'attention_mask', 'dims': list(mask_t.shape), 'dtype': 'int64', 'values': mask},
            'output': {'name': 'sentence_embedding', 'dims': list(sentences.shape), 'dtype': 'float32',
                       'base64': f32_base64(sentences), 'first_values': [round(float(v), 6) for v in sentences.reshape(-1)[:8]]},
        },
    }
    with open(os.path.join(args.out, 'reference-outputs.json'), 'w', encoding='utf-8') as fh:
        json.dump(reference, fh, indent=1)
        fh.write('\n')

    manifest = {
        'schema': 'tessera.model/1',
        'id': args.id,
        'description': args.description,
        'synthetic_demo': True,
        'image': {
            'file': IMAGE_FILE,
            'input': {'name': 'image', 'channels': 1, 'height': size, 'width': size, 'scale': 1.0,
                      'mean': [config['mean']], 'std': [config['std']], 'resize': 'stretch', 'pad_value': 0},
            'output': {'name': 'regions', 'layout': 'BDHW', 'grid': grid},
            'receptive_field_px': int(config['receptive_field_px']),
        },
        'text': {
            'file': TEXT_FILE,
            'tokenizer': TOKENIZER_FILE,
            'input': {'ids': 'input_ids', 'mask': 'attention_mask'},
            'max_tokens': config['max_tokens'],
            'output': {'name': 'sentence_embedding', 'kind': 'sentence'},
        },
        'embedding_dim': config['dim'],
        'similarity': 'cosine',
        'temperature': 0.07,
        'hashes': {f: sha256(os.path.join(args.out, f)) for f in (IMAGE_FILE, TEXT_FILE, TOKENIZER_FILE)},
    }
    with open(os.path.join(args.out, 'tessera-model.json'), 'w', encoding='utf-8') as fh:
        json.dump(manifest, fh, indent=2)
        fh.write('\n')

    card = {'config': config, 'weights': 'random (untrained control)' if args.untrained else 'trained',
            'untrained_seed': args.seed if args.untrained else None, 'export_opset': OPSET}
    if not args.untrained:
        training = dict(ckpt['training'])
        card['training'] = training
    if args.evaluation:
        with open(args.evaluation, encoding='utf-8') as fh:
            card['evaluation'] = json.load(fh)
    with open(os.path.join(args.out, 'training.json'), 'w', encoding='utf-8') as fh:
        json.dump(card, fh, indent=1)
        fh.write('\n')
    total = sum(os.path.getsize(os.path.join(args.out, f)) for f in os.listdir(args.out))
    print(f'export: wrote {args.out} ({total / 1e6:.1f} MB), grid {grid["h"]}x{grid["w"]}, '
          f'field {config["receptive_field_px"]} px')
    return 0


if __name__ == '__main__':
    sys.exit(main())
