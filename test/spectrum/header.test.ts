import { describe, expect, it } from 'vitest';
import { Header } from '../../src/spectrum/header.js';

describe('Header', () => {
  const h = Header.from([
    { keyword: 'SIMPLE', value: true },
    { keyword: 'OBJECT', value: 'LVAC-7  ', comment: 'invented star' },
    { keyword: 'HISTORY', text: 'first' },
    { keyword: 'EXPTIME', value: 300 },
    { keyword: 'OBJECT', value: 'second' },
    { keyword: 'HISTORY', text: 'second' },
  ]);

  it('looks keywords up case-insensitively, first occurrence wins', () => {
    expect(h.get('object')).toBe('LVAC-7  ');
    expect(h.string('OBJECT')).toBe('LVAC-7');
    expect(h.number('exptime')).toBe(300);
    expect(h.position('EXPTIME')).toBe(4);
    expect(h.get('MISSING')).toBeUndefined();
  });

  it('keeps commentary cards in order', () => {
    expect(h.commentary('HISTORY')).toEqual(['first', 'second']);
    expect(h.size).toBe(6);
  });

  it('cannot be polluted by keywords such as __proto__ or constructor', () => {
    const evil = Header.from([
      { keyword: '__PROTO__', value: 'x' },
      { keyword: 'CONSTRUCTOR', value: 1 },
    ]);
    expect(evil.get('__proto__')).toBe('x');
    expect(evil.get('constructor')).toBe(1);
    expect(({} as Record<string, unknown>).x).toBeUndefined();
    expect(Header.empty().get('constructor')).toBeUndefined();
    expect(Header.empty().get('toString')).toBeUndefined();
  });

  it('returns new headers on change and leaves the original alone', () => {
    const h2 = h.with('EXPTIME', 600).without('SIMPLE').withCommentary('HISTORY', 'third');
    expect(h.number('EXPTIME')).toBe(300);
    expect(h.has('SIMPLE')).toBe(true);
    expect(h2.number('EXPTIME')).toBe(600);
    expect(h2.has('SIMPLE')).toBe(false);
    expect(h2.commentary('HISTORY')).toEqual(['first', 'second', 'third']);
    expect(Object.isFrozen(h.cards)).toBe(true);
  });
});
