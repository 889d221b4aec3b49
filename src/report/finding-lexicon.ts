/**
 * A small lexicon of chest radiograph finding terms (our own list), used to decide whether a
 * sentence's finding lies in a negation scope. Words are regex sources over lower-case tokens.
 */
export const FINDING_TERMS: readonly string[] = [
  'opacit(?:y|ies)', 'opacification', 'opacified', 'consolidations?', 'consolidat(?:ed|ive)', 'effusions?',
  'pneumothora(?:x|ces)', 'hydropneumothorax', 'ha?emothorax', 'nodul(?:e|es|ar|arity)', 'micronodules?',
  'mass(?:es)?', 'atelecta(?:sis|ses|tic)', 'o?edema(?:tous)?', 'cardiomegaly', 'enlarged', 'enlargement',
  'infiltrat(?:e|es|ion|ive)', 'collapsed?', 'fractures?', 'fractured', 'pleural line', 'pneumonias?',
  'pneumonitis', 'lesions?', 'thickening', 'airspace disease', 'air space disease', 'airspace', 'densit(?:y|ies)', 'shadowing',
  'cavit(?:y|ies|ation|ary)', 'fibrosis', 'fibrotic', 'scarring', 'emphysema(?:tous)?', 'hyperinflat(?:ion|ed)',
  'granulomas?', 'calcifi(?:cation|cations|ed)', 'congestion', 'congested', 'lymphadenopathy', 'adenopathy',
  'bronchiectasis', 'pneumoperitoneum', 'pneumomediastinum', 'free (?:air|gas)', 'fluid', 'blunting', 'blunted',
  'widen(?:ed|ing)', 'abnormalit(?:y|ies)', 'abnormal', 'process', 'disease', 'findings?', 'tumou?rs?',
  'metasta(?:sis|ses|tic)', 'hernia', 'air bronchograms?', 'kerley lines', 'septal lines', 'prominence',
  'elevat(?:ed|ion)', 'shift', 'deviation', 'pneumatocoeles?', 'bullae?', 'cysts?', 'abscess(?:es)?',
  'empyema', 'hydrothorax',
];
