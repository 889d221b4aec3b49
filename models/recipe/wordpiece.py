"""A WordPiece vocabulary built from training reports, written as a tokenizer.json.

The file follows the tokenizer.json layout that transformers.js reads (model WordPiece, BertNormalizer
with lowercasing, BertPreTokenizer, TemplateProcessing adding [CLS] and [SEP]; no padding or
truncation stored). `WordPieceTokenizer.encode` reproduces that pipeline in Python for training:
greedy longest-match-first WordPiece (Wu et al. 2016, "Google's Neural Machine Translation
System"; as in BERT, Devlin et al. 2019).
"""

import collections
import json
import unicodedata

SPECIAL_TOKENS = ['[PAD]', '[UNK]', '[CLS]', '[SEP]', '[MASK]']
PREFIX = '##'


def _is_punctuation(ch):
    cp = ord(ch)
    # ASCII non-letters/digits count as punctuation, as in BERT's basic tokenizer.
    if 33 <= cp <= 47 or 58 <= cp <= 64 or 91 <= cp <= 96 or 123 <= cp <= 126:
        return True
    return unicodedata.category(ch).startswith('P')


def _is_control(ch):
    if ch in '\t\n\r':
        return False
    return unicodedata.category(ch).startswith('C')


def _is_whitespace(ch):
    return ch in ' \t\n\r' or unicodedata.category(ch) == 'Zs'


def _is_cjk(cp):
    return (0x4E00 <= cp <= 0x9FFF or 0x3400 <= cp <= 0x4DBF or 0x20000 <= cp <= 0x2A6DF
            or 0x2A700 <= cp <= 0x2B73F or 0x2B740 <= cp <= 0x2B81F or 0x2B820 <= cp <= 0x2CEAF
            or 0xF900 <= cp <= 0xFAFF or 0x2F800 <= cp <= 0x2FA1F)


def normalize(text):
    """BertNormalizer: clean text, space around CJK characters, lowercase, strip accents."""
    out = []
    for ch in text:
        cp = ord(ch)
        if cp == 0 or cp == 0xFFFD or _is_control(ch):
            continue
        if _is_whitespace(ch):
            out.append(' ')
        elif _is_cjk(cp):
            out.append(f' {ch} ')
        else:
            out.append(ch)
    text = ''.join(out).lower()
    text = unicodedata.normalize('NFD', text)
    return ''.join(ch for ch in text if unicodedata.category(ch) != 'Mn')


def pre_tokenize(text):
    """BertPreTokenizer: split on whitespace, and isolate each punctuation character."""
    words = []
    for chunk in text.split():
        current = ''
        for ch in chunk:
            if _is_punctuation(ch):
                if current:
                    words.append(current)
                words.append(ch)
                current = ''
            else:
                current += ch
        if current:
            words.append(current)
    return words


class WordPieceTokenizer:
    def __init__(self, vocab, max_input_chars_per_word=100):
        self.vocab = dict(vocab)
        self.max_chars = max_input_chars_per_word
        self.pad_id = self.vocab['[PAD]']
        self.unk_id = self.vocab['[UNK]']
        self.cls_id = self.vocab['[CLS]']
        self.sep_id = self.vocab['[SEP]']

    def word_ids(self, word):
        if len(word) > self.max_chars:
            return [self.unk_id]
        ids, start = [], 0
        while start < len(word):
            end, found = len(word), None
            while start < end:
                piece = word[start:end] if start == 0 else PREFIX + word[start:end]
                if piece in self.vocab:
                    found = self.vocab[piece]
                    break
                end -= 1
            if found is None:
                return [self.unk_id]
            ids.append(found)
            start = end
        return ids

    def encode(self, sentence, max_tokens):
        """Token ids with [CLS] ... [SEP], truncated so the whole fits in max_tokens."""
        ids = []
        for word in pre_tokenize(normalize(sentence)):
            ids.extend(self.word_ids(word))
        ids = ids[: max_tokens - 2]
        return [self.cls_id] + ids + [self.sep_id]

    def batch(self, sentences, max_tokens):
        """(ids, mask) as lists of equal-length int lists, right-padded with [PAD] to the longest."""
        encoded = [self.encode(s, max_tokens) for s in sentences]
        width = max(len(e) for e in encoded)
        ids = [e + [self.pad_id] * (width - len(e)) for e in encoded]
        mask = [[1] * len(e) + [0] * (width - len(e)) for e in encoded]
        return ids, mask

    def to_json(self):
        """The tokenizer.json document (transformers.js / tokenizers layout)."""
        added = [
            {'id': self.vocab[t], 'content': t, 'single_word': False, 'lstrip': False, 'rstrip': False,
             'normalized': False, 'special': True}
            for t in SPECIAL_TOKENS
        ]
        cls = {'id': '[CLS]', 'ids': [self.cls_id], 'tokens': ['[CLS]']}
        sep = {'id': '[SEP]', 'ids': [self.sep_id], 'tokens': ['[SEP]']}
        return {
            'version': '1.0',
            'truncation': None,
            'padding': None,
            'added_tokens': added,
            'normalizer': {'type': 'BertNormalizer', 'clean_text': True, 'handle_chinese_chars': True,
                           'strip_accents': None, 'lowercase': True},
            'pre_tokenizer': {'type': 'BertPreTokenizer'},
            'post_processor': {
                'type': 'TemplateProcessing',
                'single': [{'SpecialToken': {'id': '[CLS]', 'type_id': 0}}, {'Sequence': {'id': 'A', 'type_id': 0}},
                           {'SpecialToken': {'id': '[SEP]', 'type_id': 0}}],
                'pair': [{'SpecialToken': {'id': '[CLS]', 'type_id': 0}}, {'Sequence': {'id': 'A', 'type_id': 0}},
                         {'SpecialToken': {'id': '[SEP]', 'type_id': 0}}, {'Sequence': {'id': 'B', 'type_id': 1}},
                         {'SpecialToken': {'id': '[SEP]', 'type_id': 1}}],
                'special_tokens': {'[CLS]': cls, '[SEP]': sep},
            },
            'decoder': {'type': 'WordPiece', 'prefix': PREFIX, 'cleanup': True},
            'model': {'type': 'WordPiece', 'unk_token': '[UNK]', 'continuing_subword_prefix': PREFIX,
                      'max_input_chars_per_word': self.max_chars, 'vocab': self.vocab},
        }

    def save(self, path):
        with open(path, 'w', encoding='utf-8') as fh:
            json.dump(self.to_json(), fh, ensure_ascii=False, indent=1)
            fh.write('\n')

    @classmethod
    def load(cls, path):
        with open(path, encoding='utf-8') as fh:
            doc = json.load(fh)
        return cls(doc['model']['vocab'], doc['model'].get('max_input_chars_per_word', 100))


def build_vocab(texts, min_count=2, max_words=4000):
    """Vocabulary: special tokens, every character seen (plain and ## form), then words seen at least
    min_count times, most frequent first. Characters keep unseen words out of [UNK]."""
    words = collections.Counter()
    chars = set()
    for text in texts:
        for w in pre_tokenize(normalize(text)):
            words[w] += 1
            chars.update(w)
    tokens = list(SPECIAL_TOKENS)
    for ch in sorted(chars):
        tokens.append(ch)
    for ch in sorted(chars):
        tokens.append(PREFIX + ch)
    have = set(tokens)
    for w, c in sorted(words.items(), key=lambda kv: (-kv[1], kv[0])):
        if c < min_count or len(tokens) >= max_words + len(SPECIAL_TOKENS):
            break
        if w not in have:
            tokens.append(w)
            have.add(w)
    return WordPieceTokenizer({t: i for i, t in enumerate(tokens)})
