/** The parts of a zod error this helper reads; kept structural so it works for any zod version. */
type IssueLike = { path: readonly PropertyKey[]; message: string };

/**
 * Map validation issues to one message per top-level field (the first issue wins), the same shape
 * as the API's `fields` so forms show client and server messages alike.
 */
export function fieldErrorsFromIssues(issues: readonly IssueLike[]): Record<string, string> {
  const fields: Record<string, string> = {};
  for (const issue of issues) {
    const name = issue.path.length > 0 ? String(issue.path[0]) : 'form';
    if (!(name in fields)) fields[name] = issue.message;
  }
  return fields;
}
