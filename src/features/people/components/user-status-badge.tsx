import type { User } from '../../../../shared/schemas/users';

const appearance: Record<User['status'], { label: string; symbol: string; classes: string }> = {
  active: { label: 'Active', symbol: '●', classes: 'bg-good-50 text-good-700 border-good-600/40' },
  invited: { label: 'Invited', symbol: '◌', classes: 'bg-amber-50 text-amber-900 border-amber-500/50' },
  deactivated: { label: 'Deactivated', symbol: '○', classes: 'bg-ink-100 text-ink-700 border-ink-300' },
};

/** Status in words with a shape beside it, so colour is never the only cue. */
export function UserStatusBadge({ status }: { status: User['status'] }) {
  const { label, symbol, classes } = appearance[status];
  return (
    <span className={`inline-flex items-center gap-1.5 rounded-full border px-2.5 py-0.5 text-[0.9375rem] font-medium ${classes}`}>
      <span aria-hidden="true">{symbol}</span>
      {label}
    </span>
  );
}
