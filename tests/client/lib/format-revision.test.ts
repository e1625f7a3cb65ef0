import { describe, expect, it } from 'vitest';
import { revisionName } from '../../../src/lib/format-revision';

describe('revisionName', () => {
  it('prefixes a bare label', () => {
    expect(revisionName('B')).toBe('rev B');
    expect(revisionName('1.2', true)).toBe('Rev 1.2');
  });

  it('leaves a label that already says "rev" alone', () => {
    expect(revisionName('rev D')).toBe('rev D');
    expect(revisionName('rev D', true)).toBe('Rev D');
    expect(revisionName('Revision 3')).toBe('Revision 3');
  });

  it('does not mistake a label that merely starts with the letters for a prefix', () => {
    expect(revisionName('Reverse-polarity fix')).toBe('rev Reverse-polarity fix');
  });
});
