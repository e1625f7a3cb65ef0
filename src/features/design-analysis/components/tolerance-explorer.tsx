import { memo, useId, type ReactNode } from 'react';
import { circuitResistorLabels, topologyResistorKeys, type Topology } from '../../../../shared/schemas/designs';
import { parseEngineeringNumber } from '../../../lib/parse-number';
import {
  opAmpFieldKeys,
  toleranceSlider,
  type ExplorerErrors,
  type ExplorerState,
  type OpAmpFieldKey,
} from './explorer-state';

const opAmpLabels: Record<OpAmpFieldKey, string> = {
  openLoopGainDb: 'A0 (dB)',
  gainBandwidthHz: 'GBW (Hz)',
  cmrrDb: 'CMRR (dB)',
  cmrrCornerHz: 'CMRR corner (Hz)',
};

type Props = {
  topology: Topology;
  state: ExplorerState;
  errors: ExplorerErrors;
  onChange: (update: (current: ExplorerState) => ExplorerState) => void;
  storedOpAmpName: string | null;
};

/** The explorer's controls: tolerances (all at once or per resistor), distribution, source resistances and op-amp data. */
export const ToleranceExplorer = memo(function ToleranceExplorer({ topology, state, errors, onChange, storedOpAmpName }: Props) {
  const set = (changes: Partial<ExplorerState>) => onChange((current) => ({ ...current, ...changes }));
  const sharedPercent = parseEngineeringNumber(state.allTolerancePercent);
  const resistors = topologyResistorKeys[topology];
  return (
    <section className="rounded-lg border border-trace-300 bg-white p-4">
      <h2 className="text-lg font-semibold text-ink-900">Tolerance explorer</h2>
      <p className="mt-1 text-[0.9375rem] text-ink-700">Curves, histogram and yield follow every change, computed in a background worker by the same engine as the server. Nothing here is saved.</p>

      <Group title="Resistor tolerance">
        <div className="flex gap-4 text-[0.9375rem]" role="radiogroup" aria-label="Tolerance applies to">
          <label className="inline-flex items-center gap-2">
            <input type="radio" name="tolerance-mode" checked={state.toleranceMode === 'all'} onChange={() => set({ toleranceMode: 'all' })} />
            All resistors
          </label>
          <label className="inline-flex items-center gap-2">
            <input type="radio" name="tolerance-mode" checked={state.toleranceMode === 'each'} onChange={() => set({ toleranceMode: 'each' })} />
            Each resistor
          </label>
        </div>
        {state.toleranceMode === 'all' ? (
          <div className="mt-3 space-y-2">
            <SmallField label="Tolerance of every resistor (%)" value={state.allTolerancePercent} error={errors.allTolerancePercent} onChange={(text) => set({ allTolerancePercent: text })} />
            <input
              type="range"
              min={0}
              max={1000}
              step={1}
              aria-label="Tolerance, logarithmic slider from 0.001 % to 1 %"
              className="w-full accent-trace-600"
              value={toleranceSlider.toPosition(sharedPercent ?? 0.1)}
              onChange={(event) => set({ allTolerancePercent: String(toleranceSlider.toPercent(Number(event.target.value))) })}
            />
            <div className="flex justify-between text-[0.8125rem] text-ink-600">
              <span className="tabular">0.001 %</span>
              <span className="tabular">0.01 %</span>
              <span className="tabular">0.1 %</span>
              <span className="tabular">1 %</span>
            </div>
          </div>
        ) : (
          <div className="mt-3 grid grid-cols-2 gap-3">
            {resistors.map((key) => (
              <SmallField
                key={key}
                label={`${circuitResistorLabels[key]} (%)`}
                value={state.eachTolerancePercent[key]}
                error={errors[`each.${key}`]}
                onChange={(text) => onChange((current) => ({ ...current, eachTolerancePercent: { ...current.eachTolerancePercent, [key]: text } }))}
              />
            ))}
          </div>
        )}
        <label className="mt-3 block">
          <span className="block font-medium text-ink-900">Distribution</span>
          <select className="mt-1 w-full rounded-md border border-ink-300 bg-white px-3 py-1.5" value={state.distribution} onChange={(event) => set({ distribution: event.target.value as ExplorerState['distribution'] })}>
            <option value="uniform">Uniform within ±tol</option>
            <option value="normal">Normal, σ = tol/3</option>
          </select>
        </label>
      </Group>

      <Group title="Source resistances">
        <div className="grid grid-cols-2 gap-3">
          <SmallField label="Rs1 (Ω)" value={state.sourceResistance1Ohms} error={errors.sourceResistance1Ohms} onChange={(text) => set({ sourceResistance1Ohms: text })} />
          <SmallField label="Rs2 (Ω)" value={state.sourceResistance2Ohms} error={errors.sourceResistance2Ohms} onChange={(text) => set({ sourceResistance2Ohms: text })} />
        </div>
        {topology === 'instrumentation-amplifier' && <p className="mt-2 text-[0.875rem] text-ink-600">The input op-amps isolate them: an in-amp&apos;s prediction does not depend on them.</p>}
      </Group>

      <Group title="Op-amp">
        <label className="inline-flex items-center gap-2 text-[0.9375rem]">
          <input type="checkbox" checked={state.opAmpEnabled} onChange={(event) => set({ opAmpEnabled: event.target.checked })} />
          Use op-amp data {storedOpAmpName ? <span className="text-ink-600">({storedOpAmpName})</span> : null}
        </label>
        {state.opAmpEnabled ? (
          <div className="mt-3 grid grid-cols-2 gap-3">
            {opAmpFieldKeys.map((key) => (
              <SmallField
                key={key}
                label={opAmpLabels[key]}
                value={state.opAmp[key]}
                error={errors[`opAmp.${key}`]}
                onChange={(text) => onChange((current) => ({ ...current, opAmp: { ...current.opAmp, [key]: text } }))}
              />
            ))}
          </div>
        ) : (
          <p className="mt-2 text-[0.875rem] text-ink-600">Ideal op-amps: only resistor matching limits the rejection.</p>
        )}
      </Group>
    </section>
  );
});

function Group({ title, children }: { title: string; children: ReactNode }) {
  return (
    <fieldset className="mt-4 border-t border-ink-200 pt-3">
      <legend className="pr-2 font-semibold text-ink-900">{title}</legend>
      {children}
    </fieldset>
  );
}

function SmallField({ label, value, error, onChange }: { label: string; value: string; error?: string; onChange: (text: string) => void }) {
  const id = useId();
  return (
    <div>
      <label htmlFor={id} className="block text-[0.9375rem] font-medium text-ink-900">
        {label}
      </label>
      <input
        id={id}
        inputMode="decimal"
        className={`mt-1 w-full rounded-md border bg-white px-2.5 py-1.5 font-mono ${error ? 'border-fault-600' : 'border-ink-300'}`}
        value={value}
        aria-invalid={error ? true : undefined}
        aria-describedby={error ? `${id}-error` : undefined}
        onChange={(event) => onChange(event.target.value)}
      />
      {error && (
        <p id={`${id}-error`} className="mt-1 text-[0.875rem] font-medium text-fault-600">
          <span aria-hidden="true">▲ </span>
          {error}
        </p>
      )}
    </div>
  );
}
