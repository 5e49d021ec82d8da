import { VERSION, LIBRARY_NAME } from '../version.js';

/** One step in the making of a result: what was done, with which parameters, by which library version. */
export interface ProvenanceEntry {
  /** Short step name, e.g. `read-fits`, `resample`, `calibrate`. */
  readonly step: string;
  /** The parameters that matter for reproducing the step (JSON-serialisable). */
  readonly parameters: Readonly<Record<string, unknown>>;
  /** `lineshift x.y.z`. */
  readonly version: string;
}

/** Builds a provenance entry stamped with this library's version. */
export function provenanceEntry(step: string, parameters: Record<string, unknown> = {}): ProvenanceEntry {
  return Object.freeze({ step, parameters: Object.freeze({ ...parameters }), version: `${LIBRARY_NAME} ${VERSION}` });
}

/** One line of text per entry, as written into FITS HISTORY cards: `lineshift 0.1.0 resample {"grid":"log"}`. */
export function formatProvenance(entry: ProvenanceEntry): string {
  return `${entry.version} ${entry.step} ${JSON.stringify(entry.parameters)}`;
}
