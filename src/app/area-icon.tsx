import type { AreaId } from './navigation';

const strokes: Record<AreaId, string[]> = {
  overview: ['M3 10.5 10 4l7 6.5', 'M5 9v7h10V9'],
  designs: ['M4 4h12v12H4z', 'M7 8h3v4H7z', 'M10 10h3', 'M13 8v4'],
  sessions: ['M3 14h3l2-7 3 9 2-6 1.5 4H17'],
  compare: ['M3 13c3 0 4-7 7-7s4 7 7 7', 'M3 10h14'],
  instruments: ['M3 5h14v10H3z', 'M5.5 12c1.2-4 2.3-4 3.5 0s2.3 4 3.5 0', 'M14.5 7.5v.5'],
  people: ['M7.5 9a2.5 2.5 0 1 0 0-5 2.5 2.5 0 0 0 0 5z', 'M2.5 16c.5-3 2.5-4.5 5-4.5s4.5 1.5 5 4.5', 'M13 8.5a2 2 0 1 0 0-4', 'M14.5 11.5c1.6.5 2.6 2 3 4'],
  mailbox: ['M3 5h14v10H3z', 'm3.5 5.5 6.5 5 6.5-5'],
  settings: ['M10 12.5a2.5 2.5 0 1 0 0-5 2.5 2.5 0 0 0 0 5z', 'M10 2.5v2M10 15.5v2M2.5 10h2M15.5 10h2M4.7 4.7l1.4 1.4M13.9 13.9l1.4 1.4M4.7 15.3l1.4-1.4M13.9 6.1l1.4-1.4'],
};

export function AreaIcon({ id }: { id: AreaId }) {
  return (
    <svg viewBox="0 0 20 20" className="h-5 w-5 shrink-0" aria-hidden="true">
      {strokes[id].map((d) => (
        <path key={d} d={d} fill="none" stroke="currentColor" strokeWidth="1.6" strokeLinecap="round" strokeLinejoin="round" />
      ))}
    </svg>
  );
}
