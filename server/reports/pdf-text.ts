// Text in the PDF with the app's own fonts (shipped by @fontsource, as the client uses them).
// The latin subsets lack a few symbols engineers write (Ω), so runs of text switch to the greek
// subset where needed; characters in no shipped subset get a plain spelling.
import { createRequire } from 'node:module';
import path from 'node:path';
import type PDFDocument from 'pdfkit';

const require = createRequire(import.meta.url);
const fontFile = (family: string, subset: string, weight: number) =>
  path.join(path.dirname(require.resolve(`@fontsource/${family}/package.json`)), 'files', `${family}-${subset}-${weight}-normal.woff`);

export const pdfFonts = {
  body: { latin: fontFile('ibm-plex-sans', 'latin', 400), greek: fontFile('ibm-plex-sans', 'greek', 400) },
  bold: { latin: fontFile('ibm-plex-sans', 'latin', 600), greek: fontFile('ibm-plex-sans', 'greek', 600) },
  mono: { latin: fontFile('jetbrains-mono', 'latin', 400), greek: fontFile('jetbrains-mono', 'greek', 400) },
} as const;
export type PdfFont = keyof typeof pdfFonts;

// Symbols in none of the shipped subsets (checked with fontkit against the woff files).
const plainSpellings: Record<string, string> = { '≥': '>=', '≤': '<=', '→': '->', '−': '-', '≈': '~', '✓': 'ok', '×': 'x', '\u2126': '\u03a9' };
const isGreek = (codePoint: number) => codePoint >= 0x0370 && codePoint <= 0x03ff;

export function registerPdfFonts(doc: PDFKit.PDFDocument): void {
  for (const [name, files] of Object.entries(pdfFonts)) {
    doc.registerFont(`${name}-latin`, files.latin);
    doc.registerFont(`${name}-greek`, files.greek);
  }
}

/** Splits text into runs, each in the subset that has its glyphs. */
export function fontRuns(font: PdfFont, text: string): { subset: 'latin' | 'greek'; text: string }[] {
  const runs: { subset: 'latin' | 'greek'; text: string }[] = [];
  for (const character of text) {
    const piece = plainSpellings[character] ?? character;
    const subset: 'latin' | 'greek' = isGreek(piece.codePointAt(0)!) ? 'greek' : 'latin';
    const last = runs[runs.length - 1];
    if (last && last.subset === subset) last.text += piece;
    else runs.push({ subset, text: piece });
  }
  return runs;
}

/** Writes text at the current position (or x, y) in the given font, switching subsets as needed. */
export function writeText(
  doc: PDFKit.PDFDocument,
  font: PdfFont,
  size: number,
  text: string,
  options: PDFKit.Mixins.TextOptions & { x?: number; y?: number } = {},
): void {
  const { x, y, ...rest } = options;
  if (x !== undefined && y === undefined) doc.x = x;
  const runs = fontRuns(font, text);
  // No ligatures: JetBrains Mono's (">=" and the like) are not in the shipped subsets.
  const noLigatures = { liga: false, calt: false, dlig: false } as unknown as PDFKit.Mixins.OpenTypeFeatures[];
  runs.forEach((run, index) => {
    doc.font(`${font}-${run.subset}`).fontSize(size);
    const continued = index < runs.length - 1;
    if (index === 0 && x !== undefined && y !== undefined) doc.text(run.text, x, y, { features: noLigatures, ...rest, continued });
    else doc.text(run.text, { features: noLigatures, ...rest, continued });
  });
}

export type { PDFDocument };
