"""Reading a Tessera sample set (set.json, annotations.json, images) for training and evaluation.

The set is checked before any training starts; the first bad study stops the run with its id named.
When src/dataset/schemas/set.schema.json exists it is applied (a small JSON Schema subset: type,
required, properties, additionalProperties, items, enum, const, minimum, maximum, minLength,
minItems); the field checks of src/dataset/types.ts run in every case.
"""

import json
import os
import re

import numpy as np
from PIL import Image

SET_SCHEMA = 'tessera.set/1'
ANNOTATIONS_SCHEMA = 'tessera.annotations/2'
REPO_ROOT = os.path.abspath(os.path.join(os.path.dirname(__file__), '..', '..'))
SET_SCHEMA_FILE = os.path.join(REPO_ROOT, 'src', 'dataset', 'schemas', 'set.schema.json')


class SampleSetError(Exception):
    """A sample set that cannot be used; the message names the file, the study and the fix."""

    def __init__(self, code, message):
        super().__init__(message)
        self.code = code


_JSON_TYPES = {
    'object': dict, 'array': list, 'string': str, 'boolean': bool, 'null': type(None),
}


def _schema_problem(value, schema, root, path):
    """First problem of value against a JSON Schema subset, or None."""
    if '$ref' in schema:
        ref = schema['$ref']
        if not ref.startswith('#/'):
            return None
        target = root
        for part in ref[2:].split('/'):
            target = target[part]
        return _schema_problem(value, target, root, path)
    for key in ('allOf',):
        for sub in schema.get(key, []):
            problem = _schema_problem(value, sub, root, path)
            if problem:
                return problem
    if 'anyOf' in schema or 'oneOf' in schema:
        subs = schema.get('anyOf', schema.get('oneOf'))
        if all(_schema_problem(value, sub, root, path) for sub in subs):
            return f'{path}: matches none of the allowed forms'
    kind = schema.get('type')
    if kind is not None:
        kinds = kind if isinstance(kind, list) else [kind]
        ok = False
        for k in kinds:
            if k in ('number', 'integer'):
                if isinstance(value, (int, float)) and not isinstance(value, bool):
                    ok = ok or k == 'number' or float(value).is_integer()
            elif isinstance(value, _JSON_TYPES[k]) and not (k != 'boolean' and isinstance(value, bool)):
                ok = True
        if not ok:
            return f'{path}: expected {"/".join(kinds)}, got {type(value).__name__}'
    if 'const' in schema and value != schema['const']:
        return f'{path}: expected {schema["const"]!r}, got {value!r}'
    if 'enum' in schema and value not in schema['enum']:
        return f'{path}: expected one of {schema["enum"]}, got {value!r}'
    if isinstance(value, (int, float)) and not isinstance(value, bool):
        if 'minimum' in schema and value < schema['minimum']:
            return f'{path}: must be >= {schema["minimum"]}, got {value}'
        if 'maximum' in schema and value > schema['maximum']:
            return f'{path}: must be <= {schema["maximum"]}, got {value}'
    if isinstance(value, str):
        if 'minLength' in schema and len(value) < schema['minLength']:
            return f'{path}: must have at least {schema["minLength"]} characters'
        if 'pattern' in schema and not re.search(schema['pattern'], value):
            return f'{path}: does not match {schema["pattern"]}'
    if isinstance(value, list):
        if 'minItems' in schema and len(value) < schema['minItems']:
            return f'{path}: must have at least {schema["minItems"]} items'
        if isinstance(schema.get('items'), dict):
            for i, item in enumerate(value):
                problem = _schema_problem(item, schema['items'], root, f'{path}[{i}]')
                if problem:
                    return problem
    if isinstance(value, dict):
        for key in schema.get('required', []):
            if key not in value:
                return f'{path}: missing required field {key!r}'
        props = schema.get('properties', {})
        for key, sub in props.items():
            if key in value:
                problem = _schema_problem(value[key], sub, root, f'{path}.{key}')
                if problem:
                    return problem
        if schema.get('additionalProperties') is False:
            for key in value:
                if key not in props:
                    return f'{path}: unexpected field {key!r}'
    return None


def _study_problem(study):
    """First problem of one study against StudyRecord in src/dataset/types.ts, or None."""
    if not isinstance(study, dict):
        return 'is not an object'
    for key in ('id', 'image', 'report'):
        if not isinstance(study.get(key), str) or not study[key]:
            return f'field {key!r} must be a non-empty string'
    labels = study.get('labels')
    if labels is not None:
        if not isinstance(labels, dict):
            return "field 'labels' must be an object"
        findings = labels.get('findings', [])
        if not isinstance(findings, list):
            return "field 'labels.findings' must be a list"
        for f in findings:
            if not isinstance(f, dict) or not isinstance(f.get('finding'), str) or not isinstance(f.get('zones'), list):
                return "each of 'labels.findings' needs 'finding' (string) and 'zones' (list)"
    return None


def read_sample_set(folder, check_images=True):
    """Reads and checks set.json and annotations.json of a sample-set folder.

    Returns (manifest, boxes): the manifest as read, and a dict study id -> list of box records.
    Raises SampleSetError naming the first bad study.
    """
    set_path = os.path.join(folder, 'set.json')
    if not os.path.isfile(set_path):
        raise SampleSetError('SET_MISSING', f'{set_path}: not found; pass --set a folder made by `tessera phantom`')
    with open(set_path, encoding='utf-8') as fh:
        manifest = json.load(fh)
    if not isinstance(manifest, dict) or manifest.get('schema') != SET_SCHEMA:
        got = manifest.get('schema') if isinstance(manifest, dict) else type(manifest).__name__
        raise SampleSetError('SET_SCHEMA', f"{set_path}: 'schema' must be {SET_SCHEMA!r}; got {got!r}")
    if not isinstance(manifest.get('studies'), list) or not manifest['studies']:
        raise SampleSetError('SET_EMPTY', f"{set_path}: 'studies' must be a non-empty list")
    schema = None
    if os.path.isfile(SET_SCHEMA_FILE):
        with open(SET_SCHEMA_FILE, encoding='utf-8') as fh:
            schema = json.load(fh)
        study_schema = schema.get('properties', {}).get('studies', {}).get('items')
        top = dict(schema)
        # Studies are checked one by one below, so that the first bad one can be named.
        top['properties'] = dict(schema.get('properties', {}), studies={'type': 'array'})
        problem = _schema_problem(manifest, top, schema, 'set')
        if problem:
            raise SampleSetError('SET_INVALID', f'{set_path}: {problem} (schema {SET_SCHEMA_FILE})')
    seen = set()
    for i, study in enumerate(manifest['studies']):
        problem = _study_problem(study)
        if problem is None and schema is not None and isinstance(study_schema, dict):
            problem = _schema_problem(study, study_schema, schema, f'studies[{i}]')
        sid = study.get('id') if isinstance(study, dict) else None
        if problem is None and sid in seen:
            problem = 'duplicate id'
        if problem is None and check_images and not os.path.isfile(os.path.join(folder, study['image'])):
            problem = f"image {study['image']!r} not found"
        if problem is not None:
            raise SampleSetError('STUDY_INVALID', f'{set_path}: study {i} (id {sid!r}): {problem}; fix or remove this study')
        seen.add(sid)
    boxes = {}
    ann_path = os.path.join(folder, manifest.get('annotations', 'annotations.json'))
    if os.path.isfile(ann_path):
        with open(ann_path, encoding='utf-8') as fh:
            ann = json.load(fh)
        if ann.get('schema') != ANNOTATIONS_SCHEMA:
            raise SampleSetError('ANNOTATIONS_SCHEMA', f"{ann_path}: 'schema' must be {ANNOTATIONS_SCHEMA!r}; got {ann.get('schema')!r}")
        for b in ann.get('boxes', []):
            boxes.setdefault(b['study'], []).append(b)
    return manifest, boxes


def load_image(path, size):
    """Decodes an 8- or 16-bit grey PNG to float32 [size, size] in [0, 1] (stretch resize, bilinear)."""
    img = Image.open(path)
    if img.mode in ('I;16', 'I;16B', 'I'):
        arr = np.asarray(img, dtype=np.float32) / 65535.0
    else:
        arr = np.asarray(img.convert('L'), dtype=np.float32) / 255.0
    original = arr.shape
    if arr.shape != (size, size):
        arr = np.asarray(Image.fromarray(arr, mode='F').resize((size, size), Image.BILINEAR), dtype=np.float32)
    return arr, original


_HEADING = re.compile(r'^\s*[A-Z][A-Z /]+:\s*')
_SPLIT = re.compile(r'(?<=[.!?])\s+|\n+')


def split_sentences(report):
    """Splits report text into sentences: on . ! ? followed by space, and on line breaks; drops headings."""
    out = []
    for part in _SPLIT.split(report):
        part = part.strip()
        while True:
            m = _HEADING.match(part)
            if not m:
                break
            part = part[m.end():].strip()
        if re.search(r'[A-Za-z]', part):
            out.append(part)
    return out


_NEGATION = re.compile(
    r"\b(no|not|without|negative for|free of|absence of|resolved|clear of|there is no|is not|are not|none)\b",
    re.IGNORECASE,
)


def sentence_negation(study, sentences):
    """Negated flag of each of a study's sentences (split_sentences order): the set's own label
    (labels.sentences[].negated, by sentence index, which the phantom writes) where there is one,
    else the trigger-word test is_negated."""
    labels = {l.get('index'): l for l in (study.get('labels') or {}).get('sentences', []) if isinstance(l, dict)}
    flags = []
    for i, text in enumerate(sentences):
        label = labels.get(i, {}).get('negated')
        flags.append(label if isinstance(label, bool) else is_negated(text))
    return flags


def is_negated(sentence):
    """A simple trigger-word negation test (training only; the tool's own NegEx-style rules live in src/report)."""
    return _NEGATION.search(sentence) is not None
