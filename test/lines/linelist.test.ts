import { mkdtempSync, readFileSync, rmSync, writeFileSync } from 'node:fs';
import { tmpdir } from 'node:os';
import { join } from 'node:path';
import { afterAll, describe, expect, it } from 'vitest';
import { InputError, UsageError } from '../../src/errors.js';
import {
  LAMP_PRESETS,
  availableSpecies,
  filterLineList,
  lampLineList,
  lineListToAir,
  lineListToVacuum,
  loadLineList,
  mergeLineLists,
  parseLineListCsv,
  readLineList,
} from '../../src/lines/linelist.js';
import { airToVacuum } from '../../src/spectrum/air-vacuum.js';
import { repoPath } from '../helpers/paths.js';

const dir = mkdtempSync(join(tmpdir(), 'lineshift-lines-'));
afterAll(() => rmSync(dir, { recursive: true, force: true }));

describe('shipped line lists', () => {
  it('has one list per spectrum, with the row counts SOURCES.md gives', () => {
    // Source: data/linelists/SOURCES.md, "Files" table.
    const rows: Record<string, number> = {
      'Ne I': 160, 'Ar I': 110, 'Kr I': 73, 'Xe I': 100, 'Hg I': 20, 'He I': 77, 'He II': 7, 'H I': 20,
      'Na I': 25, 'Mg I': 33, 'Ca I': 44, 'Ca II': 15, 'Si II': 20, 'Fe I': 134, 'Fe II': 34, 'O I': 32,
      'O III': 3, 'N II': 3, 'S II': 4, 'O II': 6, 'Ne III': 2, 'Ar III': 2, 'S III': 2, 'O2 telluric': 9,
    };
    expect(availableSpecies().sort()).toEqual(Object.keys(rows).sort());
    for (const [species, n] of Object.entries(rows)) expect(loadLineList(species).entries.length, species).toBe(n);
  });

  it('holds sorted air wavelengths in 3500–9500 Å, sources from the SOURCES.md table, and frozen entries', () => {
    const table = readFileSync(repoPath('data', 'linelists', 'SOURCES.md'), 'utf8');
    const ids = new Set([...table.matchAll(/^\| ([A-Z0-9_]+|memory) \|/gm)].map((m) => m[1]));
    const all = loadLineList(availableSpecies());
    expect(all.medium).toBe('air');
    let prev = 0;
    for (const e of all.entries) {
      expect(e.wavelengthAngstrom).toBeGreaterThanOrEqual(prev);
      prev = e.wavelengthAngstrom;
      expect(e.wavelengthAngstrom).toBeGreaterThanOrEqual(3500);
      expect(e.wavelengthAngstrom).toBeLessThanOrEqual(9500);
      expect(e.medium).toBe('air');
      for (const id of e.source.split('+')) expect(ids.has(id), `${e.species} ${e.wavelengthAngstrom}: ${e.source}`).toBe(true);
      expect(e.relativeIntensity === null || e.relativeIntensity >= 0).toBe(true);
    }
    expect(Object.isFrozen(all.entries[0])).toBe(true);
  });

  it('flags blends: all H I rows, the He I multiplet centroids, no Ne I row', () => {
    expect(loadLineList('H I').entries.every((e) => e.blend)).toBe(true);
    const he = loadLineList('He I').entries;
    expect(he.filter((e) => e.blend).every((e) => e.note.includes('multiplet centroid'))).toBe(true);
    expect(he.filter((e) => e.blend).length).toBe(11);
    expect(loadLineList('Ne I').entries.some((e) => e.blend)).toBe(false);
  });

  it('matches species names in any case and with _ for the space', () => {
    expect(loadLineList('ne_i').entries.length).toBe(160);
    expect(loadLineList(' NE  I ').species).toEqual(['Ne I']);
    expect(() => loadLineList('Unobtainium IV')).toThrow(/^no line list for "Unobtainium IV" \(available: Ar I, Ar III, /);
    expect(() => loadLineList([])).toThrow(UsageError);
  });
});

describe('lamp presets', () => {
  it('names the lamps clubs use', () => {
    expect(Object.keys(LAMP_PRESETS)).toEqual(['neon', 'argon', 'mercury', 'helium', 'krypton', 'xenon', 'hydrogen']);
    for (const lamp of Object.keys(LAMP_PRESETS)) expect(lampLineList(lamp).entries.length).toBeGreaterThan(0);
  });

  it('joins combinations, sorted by wavelength', () => {
    const l = lampLineList('Neon, argon');
    expect(l.species).toEqual(['Ne I', 'Ar I']);
    expect(l.entries.length).toBe(270);
    for (let i = 1; i < l.entries.length; i++) expect(l.entries[i].wavelengthAngstrom).toBeGreaterThanOrEqual(l.entries[i - 1].wavelengthAngstrom);
    expect(lampLineList('mercury+argon').species).toEqual(['Hg I', 'Ar I']);
    expect(lampLineList('neon,neon').entries.length).toBe(160);
  });

  it('rejects unknown lamps with the list of known ones', () => {
    expect(() => lampLineList('sodium')).toThrow('unknown lamp "sodium" (known: neon, argon, mercury, helium, krypton, xenon, hydrogen; combine them as "neon,argon")');
    expect(() => lampLineList(' , ')).toThrow(UsageError);
  });
});

describe('filterLineList', () => {
  const ne = loadLineList('Ne I');

  it('keeps a wavelength range (ends included) and a minimum intensity, dropping lines of unknown intensity', () => {
    const f = filterLineList(ne, { minWavelengthAngstrom: 5852.4879, maxWavelengthAngstrom: 7032.4131, minRelativeIntensity: 150 });
    expect(f.entries.map((e) => e.wavelengthAngstrom)).toEqual([5852.4879, 6402.248, 6506.5281, 6929.4673, 7024.0504, 7032.4131]);
    expect(filterLineList(ne, { minRelativeIntensity: 0 }).entries.length).toBe(128);
    expect(filterLineList(ne).entries.length).toBe(160);
  });

  it('selects blends and species', () => {
    const he = loadLineList(['He I', 'H I']);
    expect(filterLineList(he, { blends: 'only', species: ['he i'] }).entries.length).toBe(11);
    expect(filterLineList(he, { blends: 'exclude' }).entries.length).toBe(66);
    expect(filterLineList(he, { species: ['H I'] }).species).toEqual(['H I']);
  });

  it('rejects an empty range and leaves the input alone', () => {
    expect(() => filterLineList(ne, { minWavelengthAngstrom: 7000, maxWavelengthAngstrom: 6000 })).toThrow('the wavelength range of the filter is empty or not a number (7000 to 6000 Å)');
    const before = ne.entries.length;
    filterLineList(ne, { maxWavelengthAngstrom: 6000 });
    expect(ne.entries.length).toBe(before);
    expect(Object.isFrozen(ne.entries)).toBe(true);
  });
});

describe('air and vacuum lists', () => {
  it('converts to vacuum with Peck & Reeder and back to the same air values', () => {
    const hg = loadLineList('Hg I');
    const vac = lineListToVacuum(hg);
    expect(vac.medium).toBe('vacuum');
    expect(vac.entries[0].medium).toBe('vacuum');
    expect(vac.entries[0].wavelengthAngstrom).toBe(airToVacuum(3650.153));
    const back = lineListToAir(vac);
    for (let i = 0; i < hg.entries.length; i++) expect(Math.abs(back.entries[i].wavelengthAngstrom - hg.entries[i].wavelengthAngstrom)).toBeLessThan(1e-9);
    expect(lineListToVacuum(vac)).toBe(vac);
    expect(hg.entries[0].medium).toBe('air');
  });

  it('refuses to join air and vacuum lists', () => {
    expect(() => mergeLineLists([loadLineList('Ne I'), lineListToVacuum(loadLineList('Ar I'))])).toThrow(
      'cannot join air and vacuum line lists; convert one first (lineListToVacuum or lineListToAir)',
    );
  });
});

describe("a user's own CSV line list", () => {
  it('reads the shipped format, unsorted rows, quoted notes and a species from the file name', () => {
    const text = '# my lamp\nwavelength_air_angstrom,relative_intensity,source_id,note\n6402.248,200,club,"red, strong"\n5852.4879,,club,\n';
    const l = parseLineListCsv(text, 'lamps/Ne_I.csv');
    expect(l.species).toEqual(['Ne I']);
    expect(l.entries.map((e) => [e.wavelengthAngstrom, e.relativeIntensity, e.note])).toEqual([
      [5852.4879, null, ''],
      [6402.248, 200, 'red, strong'],
    ]);
  });

  it('takes other wavelength units and media from the header, a species column, and options', () => {
    const l = parseLineListCsv('wavelength [nm, vacuum]\tspecies\n656.461\tH I\n486.27\tH I\n', 'x.tsv');
    expect([l.medium, l.species]).toEqual(['vacuum', ['H I']]);
    expect(l.entries[1].wavelengthAngstrom).toBeCloseTo(6564.61, 10);
    const m = parseLineListCsv('wavelength\n5000\n', 'x.csv', { medium: 'air', species: 'Fe I' });
    expect([m.medium, m.species]).toEqual(['air', ['Fe I']]);
  });

  it('reads from a file', () => {
    const path = join(dir, 'Ar_I.csv');
    writeFileSync(path, 'wavelength_air_angstrom,relative_intensity\n6965.4307,10000\n');
    expect(readLineList(path).entries[0].species).toBe('Ar I');
    expect(() => readLineList(join(dir, 'missing.csv'))).toThrow(`${join(dir, 'missing.csv')}: no such file`);
  });

  const BAD: [string, string, string][] = [
    ['6402.248,200\n', 'linelist.no-header', 'u.csv: line 1: the first row is not a header row; name the columns, e.g. "wavelength_air_angstrom,relative_intensity,source_id,note"'],
    ['intensity,note\n200,x\n', 'linelist.no-wavelength', 'u.csv: line 1: the header row names no wavelength column (columns: "intensity", "note"); expected e.g. "wavelength_air_angstrom"'],
    ['wavelength,intensity\n6402,200\n', 'linelist.no-medium', 'u.csv: line 1: column 1: the wavelength column "wavelength" does not say air or vacuum; name it wavelength_air_angstrom or wavelength_vacuum_angstrom, or pass the medium option'],
    ['wavelength_air_angstrom,relative_intensity\n6402.248,200\n5852.49\n', 'linelist.ragged-row', 'u.csv: line 3: the row has 1 column, but the header row (line 1) has 2'],
    ['wavelength_air_angstrom,relative_intensity\n6402.248,200\n-5,1\n', 'linelist.bad-wavelength', 'u.csv: line 3: column 1: the wavelength "-5" is not a positive number'],
    ['# c\nwavelength_air_angstrom,relative_intensity\n6402.248,strong\n', 'linelist.bad-intensity', 'u.csv: line 3: column 2: the relative intensity "strong" is not a non-negative number'],
    ['wavelength_air_angstrom,note\n', 'linelist.empty', 'u.csv: line 1: the file holds a header row but no lines'],
    ['# nothing\n', 'linelist.empty', 'u.csv: the file holds no header row and no lines'],
    ['wavelength [pixel, air]\n5\n', 'linelist.bad-unit', 'u.csv: line 1: column 1: a line list needs wavelengths, not pixels'],
  ];
  it.each(BAD)('rejects %j with an InputError naming the line', (text, code, message) => {
    try {
      parseLineListCsv(text, 'u.csv');
      expect.unreachable();
    } catch (e) {
      expect(e).toBeInstanceOf(InputError);
      expect((e as InputError).code).toBe(code);
      expect((e as InputError).message).toBe(message);
    }
  });
});
