import { useEffect, useRef, useState } from 'react';
import { emptyMonteCarloView, MonteCarloClient, type MonteCarloRunInput, type MonteCarloView } from '../../../workers/monte-carlo-client';

/**
 * Runs the explorer's Monte Carlo in a Web Worker for the newest `input` (null: nothing to run).
 * The worker lives as long as the component; superseded runs are dropped (MonteCarloClient).
 */
export function useMonteCarlo(input: MonteCarloRunInput | null): MonteCarloView {
  const [view, setView] = useState<MonteCarloView>(emptyMonteCarloView);
  const client = useRef<MonteCarloClient | null>(null);

  useEffect(() => {
    const worker = new Worker(new URL('../../../workers/monte-carlo.worker.ts', import.meta.url), { type: 'module', name: 'monte-carlo' });
    const created = new MonteCarloClient(worker, setView);
    client.current = created;
    return () => {
      created.dispose();
      client.current = null;
    };
  }, []);

  // The input object is rebuilt on every render; its content decides whether to run again.
  const key = input ? JSON.stringify(input) : null;
  useEffect(() => {
    if (key !== null) client.current?.request(JSON.parse(key) as MonteCarloRunInput);
  }, [key]);

  return view;
}
