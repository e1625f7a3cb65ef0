export type TextSegment = { kind: 'text'; text: string } | { kind: 'link'; text: string; href: string };

const urlPattern = /\bhttps?:\/\/[^\s<>"']+/gi;
const trailingPunctuation = /[.,;:!?]+$/;

/** Drop sentence punctuation and an unbalanced closing bracket that ended up glued to a URL. */
function trimUrl(candidate: string): string {
  let url = candidate.replace(trailingPunctuation, '');
  while (url.endsWith(')') && (url.match(/\(/g)?.length ?? 0) < (url.match(/\)/g)?.length ?? 0)) {
    url = url.slice(0, -1).replace(trailingPunctuation, '');
  }
  return url;
}

/**
 * Split plain text into text and http(s) link segments, so an e-mail body can be shown as text with
 * clickable links and never as HTML. Only http and https become links. O(length of text).
 * Example: splitLinks('Open https://x.test/a.') → [text 'Open ', link 'https://x.test/a', text '.'].
 */
export function splitLinks(text: string): TextSegment[] {
  const segments: TextSegment[] = [];
  let position = 0;
  for (const match of text.matchAll(urlPattern)) {
    const start = match.index ?? 0;
    const url = trimUrl(match[0]);
    if (url.length <= 'https://'.length) continue;
    if (start > position) segments.push({ kind: 'text', text: text.slice(position, start) });
    segments.push({ kind: 'link', text: url, href: url });
    position = start + url.length;
  }
  if (position < text.length) segments.push({ kind: 'text', text: text.slice(position) });
  return segments;
}
