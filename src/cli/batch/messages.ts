/** Every message of `lineshift batch`, in one place (one format: `FILE: what happened`). */
export const batchMessages = {
  noFrames: (inputs: readonly string[]) => `no FITS files (${['.fits', '.fit', '.fts'].join(', ')}) found in ${inputs.join(', ')}`,
  noSuchInput: (input: string) => `${input}: no such file or folder`,
  unknownFrameType: (file: string) =>
    `${file}: cannot tell whether this is a lamp or a star: no IMAGETYP (or FRAMETYP, OBSTYPE) card saying lamp/arc/comp or object/light, and the file name does not say; add the card or put "lamp" in a lamp file's name`,
  noTime: (file: string, kind: 'lamp' | 'star') => `${file}: this ${kind} frame has no DATE-OBS (or DATE-AVG, MJD-OBS ...), so it cannot be paired by time`,
  noLamp: (file: string) => `${file}: no lamp frame in the same folder; put the lamp exposures taken with this star beside it`,
  noAcceptedLamp: (file: string, problems: readonly string[]) => `${file}: no lamp gave an accepted dispersion solution (${problems.join('; ')})`,
  lampNotAccepted: (lamp: string, reason: string | null, message: string) => `${lamp}: NOT accepted (${reason ?? 'no reason'}): ${message}`,
  oneLampOnly: (role: 'before' | 'after') => `only the lamp ${role} the star was usable: the solution is not interpolated in time, so drifts during the exposure are not followed`,
  noVelocity: (file: string, why: string) => `${file}: no velocity: ${why}`,
  internal: (file: string, what: string) => `${file}: internal error: ${what} (please report this)`,
  workerDied: (file: string, what: string) => `${file}: the worker processing this file stopped: ${what}`,
  interrupted: (done: number, total: number) => `interrupted after ${done} of ${total} star exposures; no velocity table was written and no partial file was left`,
  summaryFailures: (failed: number, files: number) => `${failed} of ${files} file${files === 1 ? '' : 's'} failed (listed above); the results of the others were written`,
  noResults: () => 'no star exposure gave a velocity, so no velocity table was written',
  badWorkers: (value: number) => `--workers must be a whole number from 1 to 256, got ${value}`,
} as const;
