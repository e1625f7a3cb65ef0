// CSV exports: RFC 4180 quoting, one header line, `#` comment lines with the context.

export function csvCell(value: unknown): string {
  if (value === null || value === undefined) return '';
  const text = typeof value === 'number' ? (Number.isFinite(value) ? String(value) : '') : String(value);
  return /[",\n\r#]/.test(text) ? `"${text.replaceAll('"', '""')}"` : text;
}

export function csvDocument(comments: string[], header: string[], rows: unknown[][]): string {
  return [...comments.map((line) => `# ${line.replace(/[\r\n]+/g, ' ')}`), header.join(','), ...rows.map((row) => row.map(csvCell).join(','))].join('\n') + '\n';
}

/** A file name safe in a Content-Disposition header. */
export function safeFileName(name: string): string {
  return name.replace(/[^A-Za-z0-9._-]+/g, '-').replace(/^-+|-+$/g, '').slice(0, 80) || 'export';
}
