import { describe, expect, it } from 'vitest';
import { splitLinks } from '../../../src/lib/split-links';

describe('splitLinks', () => {
  it('returns the whole text as one segment when there is no link', () => {
    expect(splitLinks('No links here.')).toEqual([{ kind: 'text', text: 'No links here.' }]);
  });

  it('returns nothing for empty text', () => {
    expect(splitLinks('')).toEqual([]);
  });

  it('turns an http(s) URL into a link and keeps the text around it', () => {
    expect(splitLinks('Open http://127.0.0.1:5480/link/abcDEF123 to set a password')).toEqual([
      { kind: 'text', text: 'Open ' },
      { kind: 'link', text: 'http://127.0.0.1:5480/link/abcDEF123', href: 'http://127.0.0.1:5480/link/abcDEF123' },
      { kind: 'text', text: ' to set a password' },
    ]);
  });

  it('leaves sentence punctuation after a URL outside the link', () => {
    const segments = splitLinks('Go to https://rejectra.test/link/x1.');
    expect(segments).toEqual([
      { kind: 'text', text: 'Go to ' },
      { kind: 'link', text: 'https://rejectra.test/link/x1', href: 'https://rejectra.test/link/x1' },
      { kind: 'text', text: '.' },
    ]);
  });

  it('drops an unbalanced closing bracket but keeps a balanced one', () => {
    expect(splitLinks('(see https://a.test/x)')[1]).toEqual({ kind: 'link', text: 'https://a.test/x', href: 'https://a.test/x' });
    expect(splitLinks('https://a.test/wiki/Op_(amp)')[0]).toEqual({
      kind: 'link',
      text: 'https://a.test/wiki/Op_(amp)',
      href: 'https://a.test/wiki/Op_(amp)',
    });
  });

  it('finds several links across lines', () => {
    const links = splitLinks('one https://a.test/1\ntwo https://a.test/2\n').filter((segment) => segment.kind === 'link');
    expect(links.map((segment) => segment.text)).toEqual(['https://a.test/1', 'https://a.test/2']);
  });

  it('never makes links of other schemes, so script URLs stay text', () => {
    expect(splitLinks('javascript:alert(1) and mailto:a@b.test')).toEqual([
      { kind: 'text', text: 'javascript:alert(1) and mailto:a@b.test' },
    ]);
  });

  it('keeps markup characters out of the link and as text', () => {
    const segments = splitLinks('<a href="https://evil.test/">x</a>');
    expect(segments.find((segment) => segment.kind === 'link')).toEqual({
      kind: 'link',
      text: 'https://evil.test/',
      href: 'https://evil.test/',
    });
    expect(segments.map((segment) => segment.text).join('')).toBe('<a href="https://evil.test/">x</a>');
  });
});
