"""The demo dual encoder: a small CNN giving a grid of region embeddings, and a small transformer
giving one embedding per sentence.

Image encoder: [B, 1, H, W] float32 (already scaled and normalised by the caller, as the manifest
says) -> [B, D, H/s, W/s] (s = 16, or 8 for the fine layout). Two coordinate channels (CoordConv; Liu et al. 2018, "An intriguing
failing of convolutional neural networks and the CoordConv solution") are made inside the network
from the input's own shape, so the exported graph still takes 1 channel.
Text encoder: ids, mask int64 [B, T] -> [B, D], the masked mean of the token states, projected.
"""

import torch
from torch import nn

# (kind, out_channels, kernel, stride[, dilation]); the receptive field follows from these alone.
SMALL_FIELD = [
    ('conv', 24, 4, 4),  # patchify stem: early downsampling keeps training cheap on two CPU cores
    ('conv', 32, 3, 1),
    ('conv', 48, 3, 2),
    ('conv', 48, 3, 1),
    ('conv', 48, 3, 1),
    ('conv', 128, 2, 2),
    ('conv', 128, 1, 1),
]
# One more 3x3 layer at stride 16 with dilation 3 widens the field by 2 * 3 * 16 = 96 px at the cost
# of a single layer.
WIDE_FIELD = SMALL_FIELD[:6] + [('conv', 128, 3, 1, 3)] + SMALL_FIELD[6:]
# A stride-8 grid (28 x 28 at 224 px) with about the same field: small boxes (a nodule a few cells
# wide at stride 16) then hold cell centres, so the centre rule can be met at all.
FINE_FIELD = [
    ('conv', 24, 4, 4),
    ('conv', 32, 3, 1),
    ('conv', 48, 3, 2),
    ('conv', 48, 3, 1),
    ('conv', 64, 3, 1),
    ('conv', 128, 3, 1),
    ('conv', 128, 1, 1),
]
# Stride 8 with a 48 px field, and every downsampling step a patchify (kernel = stride, no padding),
# so each cell's field is centred on the cell: a 3x3 stride-2 convolution with padding 1 would centre
# it half an input step up and left of the cell. The coordinate channels tell a cell where it is, so
# it needs little context to match "left lower zone".
CENTRED_FIELD = [
    ('conv', 24, 4, 4),
    ('conv', 32, 3, 1),
    ('conv', 48, 2, 2),
    ('conv', 64, 3, 1),
    ('conv', 128, 3, 1),
    ('conv', 128, 1, 1),
]
# The centred stride-8 layout with one more 3x3 layer: a 64 px field, as wide as 'fine'.
CENTRED_WIDER_FIELD = CENTRED_FIELD[:4] + [('conv', 64, 3, 1)] + CENTRED_FIELD[4:]
LAYOUTS = {'small': SMALL_FIELD, 'wide': WIDE_FIELD, 'fine': FINE_FIELD, 'centred': CENTRED_FIELD, 'centred64': CENTRED_WIDER_FIELD}


def receptive_field(layers):
    """Theoretical receptive field in input pixels: 1 + sum (k_i - 1) * d_i * prod_{j<i} s_j."""
    field, jump = 1, 1
    for spec in layers:
        k, s = spec[2], spec[3]
        d = spec[4] if len(spec) > 4 else 1
        field += (k - 1) * d * jump
        jump *= s
    return field, jump


class CoordChannels(nn.Module):
    """Appends two channels, x and y of each pixel centre in [-1, 1], computed from the input's shape."""

    def forward(self, x):
        b, _, h, w = x.shape
        ys = (torch.arange(h, dtype=x.dtype, device=x.device) + 0.5) * (2.0 / h) - 1.0
        xs = (torch.arange(w, dtype=x.dtype, device=x.device) + 0.5) * (2.0 / w) - 1.0
        yy = ys.view(1, 1, -1, 1).expand(b, 1, h, w)
        xx = xs.view(1, 1, 1, -1).expand(b, 1, h, w)
        return torch.cat([x, xx, yy], dim=1)


class ImageEncoder(nn.Module):
    def __init__(self, field='small', dim=128, in_channels=1, coords=True):
        super().__init__()
        self.layers_spec = LAYOUTS[field]
        self.coords = CoordChannels() if coords else None
        blocks = []
        c = in_channels + (2 if coords else 0)
        for spec in self.layers_spec:
            out, k, s = spec[1], spec[2], spec[3]
            d = spec[4] if len(spec) > 4 else 1
            pad = d * (k - 1) // 2 if k % 2 == 1 else 0
            blocks += [nn.Conv2d(c, out, k, stride=s, padding=pad, dilation=d, bias=False), nn.BatchNorm2d(out),
                       nn.ReLU(inplace=True)]
            c = out
        self.body = nn.Sequential(*blocks)
        self.proj = nn.Conv2d(c, dim, 1)
        self.field_px, self.stride_px = receptive_field(self.layers_spec)

    def forward(self, image):
        x = self.coords(image) if self.coords is not None else image
        return self.proj(self.body(x))


class TextEncoder(nn.Module):
    def __init__(self, vocab_size, dim=128, width=128, layers=2, heads=4, max_tokens=32, dropout=0.1):
        super().__init__()
        self.max_tokens = max_tokens
        self.tok = nn.Embedding(vocab_size, width)
        self.pos = nn.Embedding(max_tokens, width)
        layer = nn.TransformerEncoderLayer(width, heads, dim_feedforward=2 * width, dropout=dropout,
                                           batch_first=True, norm_first=True)
        # enable_nested_tensor=False keeps the plain path, which torch 1.13 can export to ONNX.
        self.encoder = nn.TransformerEncoder(layer, layers, enable_nested_tensor=False)
        self.norm = nn.LayerNorm(width)
        self.proj = nn.Linear(width, dim)

    def forward(self, ids, mask):
        t = ids.shape[1]
        positions = torch.arange(t, device=ids.device).unsqueeze(0)
        h = self.tok(ids) + self.pos(positions)
        h = self.encoder(h, src_key_padding_mask=mask == 0)
        h = self.norm(h)
        m = mask.unsqueeze(-1).to(h.dtype)
        pooled = (h * m).sum(1) / m.sum(1).clamp(min=1.0)
        return self.proj(pooled)


class DualEncoder(nn.Module):
    def __init__(self, config):
        super().__init__()
        self.config = dict(config)
        self.image = ImageEncoder(config['field'], config['dim'], 1, config['coords'])
        self.text = TextEncoder(config['vocab_size'], config['dim'], max_tokens=config['max_tokens'])



def build_model(ckpt, untrained=False, seed=11):
    """The checkpoint's dual encoder in eval mode: trained weights, or (untrained) random weights
    drawn with the given seed, for the control that shows what chance grounding looks like."""
    if untrained:
        torch.manual_seed(seed)
    model = DualEncoder(ckpt['config'])
    if not untrained:
        model.load_state_dict(ckpt['state_dict'])
    model.eval()
    return model
