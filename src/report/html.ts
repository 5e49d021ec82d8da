/**
 * HTML escaping and the check that lets an SVG plot be inlined into a page.
 */
import { UsageError } from '../errors.js';

const ENTITIES: Readonly<Record<string, string>> = Object.freeze({
  '&': '&amp;',
  '<': '&lt;',
  '>': '&gt;',
  '"': '&quot;',
  "'": '&#39;',
});

/**
 * Escapes text for HTML element content and quoted attribute values: `& < > " '` become
 * entities. Any value is first turned into text with `String` (null and undefined give
 * an empty string), so header values of any type can be passed.
 *
 * @param value text or any value to show as text.
 * @returns text safe inside an element or a quoted attribute.
 * @example escapeHtml('<script>alert(1)</script> "&\''); // '&lt;script&gt;alert(1)&lt;/script&gt; &quot;&amp;&#39;'
 */
export function escapeHtml(value: unknown): string {
  const text = value === null || value === undefined ? '' : String(value);
  return text.replace(/[&<>"']/g, (c) => ENTITIES[c]);
}

/**
 * Checks an SVG document made by this library's renderer before it is inlined into HTML,
 * and returns it without an XML prolog. Refuses anything that could run code or fetch
 * something: `<script>`, `<foreignObject>`, `<style>`, `<image>`, `<use>`, `<a>` and
 * similar elements, event-handler attributes (`onload=` …), `javascript:` URLs, `src`
 * attributes, and links or `url(…)` references outside the document (not starting with
 * `#`); also comments, CDATA and anything else that is not a plain tag. Text content
 * is not inspected: the renderer escapes it.
 *
 * @param svg SVG text, e.g. from {@link renderSvg}.
 * @returns the `<svg …>…</svg>` element as text.
 * @throws {UsageError} `report.not-svg` when the text is not one SVG element;
 *   `report.unsafe-svg` naming what was found.
 * @example inlineSvg('<svg xmlns="http://www.w3.org/2000/svg"><rect width="1" height="1"/></svg>').startsWith('<svg'); // true
 */
export function inlineSvg(svg: string): string {
  const body = svg.replace(/^\s*(<\?xml[^>]*\?>\s*)?(<!DOCTYPE[^>]*>\s*)?/i, '').trimEnd();
  if (!/^<svg[\s>]/i.test(body) || !/<\/svg>$/i.test(body)) {
    throw new UsageError('report.not-svg', 'a plot must be one SVG element (<svg …>…</svg>), as made by renderSvg');
  }
  const problem = unsafePart(body);
  if (problem) throw new UsageError('report.unsafe-svg', `the SVG plot holds ${problem}; only plots made by renderSvg can be inlined`);
  return body;
}

const FORBIDDEN_ELEMENTS = new Set(['script', 'foreignobject', 'style', 'iframe', 'object', 'embed', 'image', 'use', 'a']);
const TAG = /<\/?([A-Za-z][\w:.-]*)((?:\s+[^\s=/>]+(?:\s*=\s*(?:"[^"]*"|'[^']*'|[^\s"'>]+))?)*)\s*\/?>/g;
const ATTRIBUTE = /([^\s=/>]+)(?:\s*=\s*(?:"([^"]*)"|'([^']*)'|([^\s"'>]+)))?/g;

/** What in an SVG text could run code or load something, or undefined when nothing. */
function unsafePart(svg: string): string | undefined {
  // Every "<" of markup must start a well-formed tag; text content has its "<" escaped by the renderer.
  const tagCount = (svg.match(/</g) ?? []).length;
  let seen = 0;
  for (const tag of svg.matchAll(TAG)) {
    seen++;
    const element = tag[1].toLowerCase();
    if (FORBIDDEN_ELEMENTS.has(element)) return `a <${tag[1]}> element`;
    for (const a of (tag[2] ?? '').matchAll(ATTRIBUTE)) {
      const name = a[1].toLowerCase();
      const value = a[2] ?? a[3] ?? a[4] ?? '';
      if (name.startsWith('on')) return `an event-handler attribute (${a[1]})`;
      if (name === 'src') return 'a src attribute';
      if ((name === 'href' || name === 'xlink:href') && !value.startsWith('#')) return 'a link to something outside the plot';
      if (/^\s*javascript\s*:/i.test(value)) return 'a javascript: URL';
      if (/url\(\s*["']?(?!#)/i.test(value)) return 'a reference to something outside the plot';
    }
  }
  return seen === tagCount ? undefined : 'markup that is not a plain tag';
}
