import { describe, expect, it } from 'vitest';
import { returnPath } from '../../../src/lib/return-path';

describe('returnPath', () => {
  it('returns the in-app page kept in router state', () => {
    expect(returnPath({ from: '/people' })).toBe('/people');
    expect(returnPath({ from: '/mailbox/m1?x=1' })).toBe('/mailbox/m1?x=1');
  });

  it('falls back to the overview without usable state', () => {
    expect(returnPath(null)).toBe('/');
    expect(returnPath(undefined)).toBe('/');
    expect(returnPath({})).toBe('/');
    expect(returnPath({ from: 42 })).toBe('/');
  });

  it('refuses addresses that would leave the site', () => {
    expect(returnPath({ from: 'https://elsewhere.test/' })).toBe('/');
    expect(returnPath({ from: '//elsewhere.test/' })).toBe('/');
    expect(returnPath({ from: '/\\elsewhere.test/' })).toBe('/');
  });

  it('does not send a person back to the sign-in page itself', () => {
    expect(returnPath({ from: '/sign-in' })).toBe('/');
  });
});
