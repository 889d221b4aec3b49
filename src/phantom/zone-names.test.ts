import { describe, expect, it } from 'vitest';
import { zoneOf } from './zone-names';

describe('zoneOf', () => {
  it('zoneOf builds the zone name from a side and a row', () => {
    expect(zoneOf('left', 'middle')).toBe('left-middle');
    expect(zoneOf('right', 'upper')).toBe('right-upper');
  });
});
