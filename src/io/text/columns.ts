/**
 * Reading the header row of a text spectrum: which column holds what, in which unit.
 */
import { InputError, type ErrorLocation } from '../../errors.js';
import type { SpectralUnit } from '../../spectrum/spectrum.js';
import { parseSpectralUnit } from '../../spectrum/units.js';

/** What a column of a text spectrum holds. */
export type ColumnRole = 'wavelength' | 'flux' | 'uncertainty' | 'mask';

/** A header cell, read. */
export interface ColumnHeading {
  /** The cell as written. */
  readonly text: string;
  /** What the column holds, or null when the name is not one we know. */
  readonly role: ColumnRole | null;
  /** Spectral unit stated for a wavelength column (in brackets or as a word of the name). */
  readonly unit?: SpectralUnit;
  /** Medium stated for a wavelength column (`air`, `vac`, `vacuum` in the name or the brackets). */
  readonly medium?: 'air' | 'vacuum';
  /** Text in brackets after a flux column's name (its unit), when any. */
  readonly fluxUnit?: string;
}

const UNCERTAINTY_WORDS = new Set(['error', 'errors', 'err', 'sigma', 'uncertainty', 'uncertainties', 'unc']);
const MASK_WORDS = new Set(['mask', 'flag', 'flags']);
const WAVELENGTH_WORDS = new Set(['wavelength', 'wavelengths', 'wave', 'lambda', 'λ', 'wl', 'lam']);
const PIXEL_WORDS = new Set(['pixel', 'pixels', 'pix']);
const FLUX_WORDS = new Set(['flux', 'intensity', 'counts', 'count']);

function mediumWord(token: string): 'air' | 'vacuum' | undefined {
  if (token === 'air') return 'air';
  if (token === 'vac' || token === 'vacuum') return 'vacuum';
  return undefined;
}

/**
 * Reads one header cell such as `wavelength [nm]`, `lambda(Å)`, `Wavelength_air_angstrom`,
 * `flux (erg/s/cm2/A)` or `sigma`. Names are matched in any case.
 *
 * @throws {InputError} `text.unknown-unit` when a wavelength column states a unit we do not know.
 */
export function readColumnHeading(cell: string, where: ErrorLocation): ColumnHeading {
  const text = cell.normalize('NFC');
  const m = /^([^[(]*?)\s*[[(](.*)[\])]\s*$/.exec(text);
  const namePart = (m ? m[1] : text).trim().toLowerCase();
  const bracket = m ? m[2].trim() : undefined;
  const tokens = namePart.split(/[\s_\-.:/]+/).filter((t) => t.length > 0);
  let role: ColumnRole | null = null;
  if (tokens.some((t) => UNCERTAINTY_WORDS.has(t))) role = 'uncertainty';
  else if (tokens.some((t) => MASK_WORDS.has(t))) role = 'mask';
  else if (tokens.some((t) => WAVELENGTH_WORDS.has(t)) || (tokens.length === 1 && PIXEL_WORDS.has(tokens[0]))) role = 'wavelength';
  else if (tokens.some((t) => FLUX_WORDS.has(t))) role = 'flux';

  if (role === 'flux') return bracket !== undefined && bracket !== '' ? { text: cell, role, fluxUnit: bracket } : { text: cell, role };
  if (role !== 'wavelength') return { text: cell, role };

  let unit: SpectralUnit | undefined;
  let medium: 'air' | 'vacuum' | undefined;
  for (const t of tokens) {
    medium = mediumWord(t) ?? medium;
    if (!WAVELENGTH_WORDS.has(t)) unit = parseSpectralUnit(t) ?? unit;
  }
  if (bracket !== undefined) {
    const rest: string[] = [];
    for (const t of bracket.split(/\s*[,;]\s*|\s+/).filter((x) => x.length > 0)) {
      const md = mediumWord(t.toLowerCase());
      if (md) medium = md;
      else rest.push(t);
    }
    if (rest.length > 0) {
      const u = parseSpectralUnit(rest.join(' '));
      if (u === undefined) {
        throw new InputError('text.unknown-unit', `unknown wavelength unit "${rest.join(' ')}" in the header cell "${cell}" (known: Angstrom, nm, um, pixel)`, where);
      }
      unit = u;
    }
  }
  return { text: cell, role, ...(unit ? { unit } : {}), ...(medium ? { medium } : {}) };
}
