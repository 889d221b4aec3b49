import { describe, expect, it } from 'vitest';
import { LUNG_ZONES } from '../core/types';
import { createRng } from '../core/seeded-random';
import { findLocations, sentenceZones } from './locations';

function zonesOf(sentence: string): string[] {
  return sentenceZones(findLocations(sentence));
}
function phrases(sentence: string): string[] {
  return findLocations(sentence).map((m) => m.phrase);
}
const ALL_RIGHT = ['right-upper', 'right-middle', 'right-lower'];
const ALL_LEFT = ['left-upper', 'left-middle', 'left-lower'];

describe('findLocations', () => {
  it('findLocations(empty or location-free text) gives []', () => {
    expect(findLocations('')).toEqual([]);
    expect(findLocations('The heart is normal in size.')).toEqual([]);
  });

  it('findLocations(non-string) throws a TypeError naming the parameter', () => {
    expect(() => findLocations(7 as unknown as string)).toThrow(/'sentence' must be a string; got number/);
  });

  it('findLocations(sentence) maps side + level + lobe or zone to one zone, with an exact span', () => {
    const s = 'Dense consolidation in the right upper lobe.';
    const [m] = findLocations(s);
    expect(m).toEqual({ phrase: 'right upper lobe', span: { start: 27, end: 43 }, zones: ['right-upper'], tags: [] });
    expect(s.slice(m.span.start, m.span.end)).toBe(m.phrase);
    expect(zonesOf('Collapse of the left lower lobe.')).toEqual(['left-lower']);
    expect(zonesOf('Patchy shadowing in the Left Upper Zone.')).toEqual(['left-upper']);
    expect(zonesOf('Right middle lobe opacity.')).toEqual(['right-middle']);
  });

  it('findLocations(sentence) reads the lingula as left-middle and the middle lobe as right-middle', () => {
    expect(findLocations('Subsegmental atelectasis in the lingula.')[0]).toMatchObject({ zones: ['left-middle'], tags: ['lingula'] });
    expect(zonesOf('Lingular scarring.')).toEqual(['left-middle']);
    expect(zonesOf('Middle lobe collapse.')).toEqual(['right-middle']);
  });

  it('findLocations(sentence) maps bases to the lower zones', () => {
    expect(zonesOf('Atelectasis at the right base.')).toEqual(['right-lower']);
    expect(zonesOf('Right basilar atelectasis.')).toEqual(['right-lower']);
    expect(zonesOf('Opacity at the right lung base.')).toEqual(['right-lower']);
    expect(findLocations('Bibasilar atelectasis.')[0]).toMatchObject({ zones: ['right-lower', 'left-lower'], tags: ['base', 'bilateral'] });
    expect(zonesOf('Linear atelectasis at both bases.')).toEqual(['right-lower', 'left-lower']);
    expect(zonesOf('Bilateral lower zone opacities.')).toEqual(['right-lower', 'left-lower']);
    expect(zonesOf('Minor atelectasis at the lung bases.')).toEqual(['right-lower', 'left-lower']);
  });

  it('findLocations(sentence) maps the apex and apical with a side to the upper zone', () => {
    expect(findLocations('Left apical pneumothorax.')[0]).toMatchObject({ zones: ['left-upper'], tags: ['apex'] });
    expect(zonesOf('Pleural thickening at the right apex.')).toEqual(['right-upper']);
    expect(zonesOf('Biapical pleural thickening.')).toEqual(['right-upper', 'left-upper']);
  });

  it('findLocations(sentence) maps bilateral and both lungs to all six zones, or to one level on both sides', () => {
    expect(zonesOf('Bilateral pleural effusions.')).toEqual([...LUNG_ZONES]);
    expect(zonesOf('Both lungs are hyperinflated.')).toEqual([...LUNG_ZONES]);
    expect(zonesOf('Bilateral upper lobe fibrosis.')).toEqual(['right-upper', 'left-upper']);
    expect(findLocations('Bilateral pleural effusions.')[0].tags).toEqual(['bilateral']);
  });

  it('findLocations(sentence) tags perihilar, retrocardiac and costophrenic locations', () => {
    expect(findLocations('Bilateral perihilar haziness.')[0]).toMatchObject({
      zones: ['right-middle', 'left-middle'],
      tags: ['bilateral', 'perihilar'],
    });
    expect(findLocations('Right perihilar opacity.')[0]).toMatchObject({ zones: ['right-middle'], tags: ['perihilar'] });
    expect(findLocations('Retrocardiac opacity.')[0]).toMatchObject({ zones: ['left-lower'], tags: ['retrocardiac'] });
    expect(findLocations('Blunting of the right costophrenic angle.')[0]).toMatchObject({
      phrase: 'right costophrenic angle',
      zones: ['right-lower'],
      tags: ['costophrenic'],
    });
    expect(zonesOf('Both costophrenic angles are sharp.')).toEqual(['right-lower', 'left-lower']);
  });

  it('findLocations(sentence) reads a level without a side as both sides, tagged unsided', () => {
    expect(findLocations('Patchy opacity in the mid zone.')[0]).toMatchObject({ zones: ['right-middle', 'left-middle'], tags: ['unsided'] });
    expect(zonesOf('The upper zones are clear.')).toEqual(['right-upper', 'left-upper']);
    expect(zonesOf('Reticulation in the midzones.')).toEqual(['right-middle', 'left-middle']);
  });

  it('findLocations(sentence) maps the right hemithorax, right lung and a sided finding to all zones of that side', () => {
    expect(zonesOf('Opacification of the right hemithorax.')).toEqual(ALL_RIGHT);
    expect(zonesOf('The left lung is clear.')).toEqual(ALL_LEFT);
    expect(findLocations('Left-sided pleural effusion.')[0]).toMatchObject({ phrase: 'Left-sided', zones: ALL_LEFT });
    expect(zonesOf('Small right pleural effusion.')).toEqual(ALL_RIGHT);
    expect(zonesOf('Moderate effusion on the left.')).toEqual(ALL_LEFT);
  });

  it('findLocations(sentence) joins sides and levels with and, or, commas and to', () => {
    expect(findLocations('Opacities in the right and left lower lobes.')[0]).toMatchObject({
      phrase: 'right and left lower lobes',
      zones: ['right-lower', 'left-lower'],
    });
    expect(findLocations('Shadowing in the right upper and middle zones.')[0]).toMatchObject({
      phrase: 'right upper and middle zones',
      zones: ['right-upper', 'right-middle'],
    });
    expect(zonesOf('Nodules in the right lower and left upper lobes.')).toEqual(['right-lower', 'left-upper']);
    expect(zonesOf('Consolidation in the left lower lobe and lingula.')).toEqual(['left-middle', 'left-lower']);
    expect(zonesOf('Changes in the right upper, middle and lower zones.')).toEqual(ALL_RIGHT);
    expect(zonesOf('Interstitial change in the left mid to lower zones.')).toEqual(['left-middle', 'left-lower']);
    expect(zonesOf('Right upper to lower zone shadowing.')).toEqual(ALL_RIGHT);
  });

  it('findLocations(sentence) handles hyphens, plurals and capitals', () => {
    expect(findLocations('Right-upper-lobe mass.')[0]).toMatchObject({ phrase: 'Right-upper-lobe', zones: ['right-upper'] });
    expect(zonesOf('RIGHT LOWER LOBE COLLAPSE.')).toEqual(['right-lower']);
    expect(zonesOf('Opacity in the left mid-zone.')).toEqual(['left-middle']);
    expect(zonesOf('Both lower lobes show bronchiectasis.')).toEqual(['right-lower', 'left-lower']);
  });

  it('findLocations(sentence) keeps a lateral modifier as a tag and ignores the lateral view', () => {
    expect(findLocations('Lateral right lower zone opacity.')[0]).toMatchObject({ zones: ['right-lower'], tags: ['lateral'] });
    expect(findLocations('PA and lateral views of the chest.')).toEqual([]);
    expect(findLocations('Left lateral decubitus view.')).toEqual([]);
  });

  it('findLocations(sentence) ignores sides and levels outside the lungs', () => {
    expect(findLocations('Surgical clips in the right upper quadrant.')).toEqual([]);
    expect(findLocations('Degenerative change in the lower thoracic spine.')).toEqual([]);
    expect(findLocations('The line was left in place.')).toEqual([]);
    expect(findLocations('Right internal jugular line in place.')).toEqual([]);
  });

  it('findLocations(sentence) maps a hemidiaphragm to the lower zone of its side', () => {
    expect(findLocations('Elevated right hemidiaphragm.')[0]).toMatchObject({ zones: ['right-lower'], tags: ['hemidiaphragm'] });
  });

  it('findLocations(sentence) finds several locations in one sentence, in order, spans exact', () => {
    const s = 'Left lower lobe collapse with a small right pleural effusion and retrocardiac opacity.';
    const matches = findLocations(s);
    expect(matches.map((m) => m.phrase)).toEqual(['Left lower lobe', 'right', 'retrocardiac']);
    for (const m of matches) expect(s.slice(m.span.start, m.span.end)).toBe(m.phrase);
    expect(sentenceZones(matches)).toEqual(['right-upper', 'right-middle', 'right-lower', 'left-lower']);
  });

  it('findLocations(sentence) spans never overlap and stay in bounds on seeded random word salad', () => {
    const words = [
      'right', 'left', 'bilateral', 'both', 'upper', 'middle', 'mid', 'lower', 'lobe', 'zones', 'lung', 'base', 'bases',
      'apex', 'apical', 'perihilar', 'lingula', 'retrocardiac', 'costophrenic', 'angle', 'and', 'or', ',', 'to', 'the',
      'effusion', 'pleural', 'lateral', 'sided', '-', 'opacity', 'quadrant', '.',
    ];
    const rng = createRng(7);
    for (let trial = 0; trial < 400; trial++) {
      const n = 1 + rng.int(20);
      let s = '';
      for (let k = 0; k < n; k++) s += words[rng.int(words.length)] + (rng.next() < 0.8 ? ' ' : '');
      let previousEnd = 0;
      for (const m of findLocations(s)) {
        expect(m.span.start).toBeGreaterThanOrEqual(previousEnd);
        expect(m.span.end).toBeLessThanOrEqual(s.length);
        expect(s.slice(m.span.start, m.span.end)).toBe(m.phrase);
        expect(m.zones.length).toBeGreaterThan(0);
        expect(m.zones).toEqual(LUNG_ZONES.filter((z) => m.zones.includes(z)));
        previousEnd = m.span.end;
      }
    }
  });
});

describe('sentenceZones', () => {
  it('sentenceZones([]) is []', () => {
    expect(sentenceZones([])).toEqual([]);
  });

  it('sentenceZones(matches) is the union in LUNG_ZONES order without duplicates', () => {
    const matches = findLocations('Left lower lobe and right upper lobe opacities, also at the left base.');
    expect(phrases('Left lower lobe and right upper lobe opacities, also at the left base.')).toHaveLength(2);
    expect(sentenceZones(matches)).toEqual(['right-upper', 'left-lower']);
  });
});
