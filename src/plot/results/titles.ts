/**
 * Titles of the plots made from library results: the object and date from the spectrum's
 * header, the main numbers with their uncertainties in the subtitle. Internal to the plot
 * area.
 */
import { observationOf } from '../../report/format.js';
import type { Spectrum } from '../../spectrum/spectrum.js';
import type { PlotOptions } from '../common.js';
import type { VegaLiteSpec } from '../spec.js';

/** `LVAC-7: what`, or `What` when the header names no object. */
export function objectTitle(what: string, spectrum: Spectrum | undefined): string {
  const object = spectrum ? observationOf(spectrum).object : undefined;
  return object ? `${object}: ${what}` : what.charAt(0).toUpperCase() + what.slice(1);
}

/** The observation date of a spectrum (`2026-05-14 03:12:45 UTC`), or undefined. */
export function observationDate(spectrum: Spectrum | undefined): string | undefined {
  return spectrum ? observationOf(spectrum).date : undefined;
}

/** The subtitle a builder wrote, as lines. */
function builderSubtitle(spec: VegaLiteSpec): string[] {
  const t = spec.title as { subtitle?: string | string[] } | undefined;
  const s = t?.subtitle;
  return s === undefined ? [] : Array.isArray(s) ? s : [s];
}

/**
 * Sets the spec's title and subtitle: the caller's `title`/`subtitle` options win;
 * otherwise `title` and a subtitle of the non-empty `lines` followed (when `keepBuilder`)
 * by the builder's own default subtitle. One line is written as a string, several as an
 * array (Vega-Lite draws one line each).
 */
export function retitle(spec: VegaLiteSpec, title: string, lines: readonly (string | undefined)[], options: PlotOptions, keepBuilder = true): VegaLiteSpec {
  const text = options.title ?? title;
  let subtitle: string[];
  if (options.subtitle !== undefined) subtitle = [options.subtitle];
  else subtitle = [...lines.filter((l): l is string => typeof l === 'string' && l.length > 0), ...(keepBuilder ? builderSubtitle(spec) : [])];
  const block = subtitle.length === 0 ? { text } : { text, subtitle: subtitle.length === 1 ? subtitle[0] : subtitle };
  return { ...spec, title: block };
}

/** Joins the defined parts with ` · `. */
export function joinParts(parts: readonly (string | undefined | false)[]): string {
  return parts.filter((p): p is string => typeof p === 'string' && p.length > 0).join(' · ');
}
