/**
 * How well the shipped line lists know their wavelengths: the 1-σ accuracy a dispersion
 * solution gives each list line beside its measured centre (see DEVELOPERS.md, "Wavelength
 * calibration").
 */

/**
 * 1-σ accuracy of list wavelengths per spectrum, Å (air). For the spectra checked in
 * data/linelists/CHECKS.md §3 this is the largest difference between the NIST Handbook
 * (SRD 108) and the Ritz values from NIST ASD energy levels over the file, rounded up
 * (Ne I 0.0024, Ar I 0.0021, Kr I 0.0025, Xe I 0.0012, Na I 0.0005, Fe I 0.0013, Mg I
 * 0.0087, Ca I 0.0097, Ca II 0.0054, Si II 0.0134 Å): a conservative floor, since the rms
 * difference is smaller (Ne I 0.0005 Å against Sansonetti et al. 2004, §2). Hg I: ±0.01 Å
 * (§10: natural-mercury line shapes depend on the resolution; pencil lamps read 0.007 Å
 * longer). He I and H I: 0.01 Å, their lines being fine-structure multiplets whose blended
 * centre depends on the resolution (§4, "values where sources disagree" 1 and 6; up to
 * 0.05 Å between definitions, of which the merged blend removes most).
 */
export const LIST_ACCURACY_ANGSTROM: Readonly<Record<string, number>> = Object.freeze({
  'Ne I': 0.0025,
  'Ar I': 0.0025,
  'Kr I': 0.0025,
  'Xe I': 0.0015,
  'Na I': 0.001,
  'Fe I': 0.0015,
  'Mg I': 0.009,
  'Ca I': 0.01,
  'Ca II': 0.006,
  'Si II': 0.014,
  'Hg I': 0.01,
  'He I': 0.01,
  'H I': 0.01,
});

/** Accuracy assumed for a spectrum not in {@link LIST_ACCURACY_ANGSTROM} (a user's list, other shipped lists), Å: the upper end of the spread above (common practice for lists from level energies of this kind). */
export const DEFAULT_LIST_ACCURACY_ANGSTROM = 0.005;

/**
 * The 1-σ accuracy of a list line's wavelength from its spectrum.
 *
 * @param species `Ne I`, or several joined by `+` for a merged blend (`Ne I+Ar I`: the
 *   largest of theirs); null or empty for unknown.
 * @returns Å (> 0).
 * @example listAccuracyAngstrom('Ne I'); // 0.0025
 * @example listAccuracyAngstrom('Ar I+Hg I'); // 0.01
 */
export function listAccuracyAngstrom(species: string | null | undefined): number {
  const parts = (species ?? '').split('+').map((s) => s.trim()).filter((s) => s.length > 0);
  if (parts.length === 0) return DEFAULT_LIST_ACCURACY_ANGSTROM;
  return Math.max(...parts.map((s) => LIST_ACCURACY_ANGSTROM[s] ?? DEFAULT_LIST_ACCURACY_ANGSTROM));
}
