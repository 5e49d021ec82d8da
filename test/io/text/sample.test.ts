import { describe, expect, it } from 'vitest';
import { readSpectrum } from '../../../src/io/read.js';
import { makeSample } from '../../../data/samples/make-text-sample.js';
import { repoPath } from '../../helpers/paths.js';

describe('data/samples/lvac7-sample.csv (invented)', () => {
  const s = readSpectrum(repoPath('data', 'samples', 'lvac7-sample.csv'));

  it('reads with its unit, medium, flux unit, header and provenance', () => {
    expect([s.unit, s.medium, s.fluxUnit]).toEqual(['angstrom', 'air', 'adu']);
    expect(s.header.get('OBJECT')).toBe('LVAC-7');
    expect(s.header.commentary('COMMENT')).toEqual(['INVENTED sample spectrum, not an observation']);
    expect(s.provenance.map((p) => p.step)).toEqual(['simulate', 'read-text']);
    expect(s.wavelength.length).toBe(621);
  });

  it('is what the committed, seeded script makes (regenerate with npx tsx data/samples/make-text-sample.ts)', () => {
    const fresh = makeSample();
    expect(Array.from(s.wavelength)).toEqual(Array.from(fresh.wavelength));
    expect(Array.from(s.flux)).toEqual(Array.from(fresh.flux));
    expect(Array.from(s.uncertainty!)).toEqual(Array.from(fresh.uncertainty!));
  });
});
