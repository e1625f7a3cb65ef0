/**
 * Where to go after signing in: the in-app page that sent the person to sign in (kept in router
 * state as `from`), or the overview. Anything that is not a same-site path is ignored, so a
 * crafted state cannot send the person to another site.
 */
export function returnPath(state: unknown): string {
  const from = typeof state === 'object' && state !== null ? (state as { from?: unknown }).from : undefined;
  if (typeof from !== 'string' || !from.startsWith('/') || from.startsWith('//') || from.startsWith('/\\')) return '/';
  if (from === '/sign-in' || from.startsWith('/sign-in?')) return '/';
  return from;
}
