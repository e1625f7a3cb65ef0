// The readable (non-JSON) output of every command: columns padded to their widest cell, two
// spaces apart, no trailing blanks.

/** Formats rows as aligned columns; `rightAligned(column)` says which columns align right (numbers). */
export function formatTable(rows: string[][], rightAligned: (column: number) => boolean = () => false): string {
  const widths = rows[0].map((_, column) => Math.max(...rows.map((row) => row[column].length)));
  return rows
    .map((row) =>
      row
        .map((cell, column) => (rightAligned(column) ? cell.padStart(widths[column]) : cell.padEnd(widths[column])))
        .join('  ')
        .trimEnd(),
    )
    .join('\n');
}
