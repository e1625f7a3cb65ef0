import { memo, useMemo, useState } from 'react';
import type { ESeriesName } from '../../../../shared/engine/e-series';
import type { Circuit } from '../../../../shared/schemas/designs';
import { Button } from '../../../components/button';
import { formatDb } from '../../../lib/charts/log-frequency-axis';
import { formatOhms, formatPercent } from '../../../lib/format-number';
import { numberToField, parseEngineeringNumber } from '../../../lib/parse-number';
import { designGains } from './explorer-state';
import { pairAnswers, stageToleranceFraction, toleranceAnswer, toleranceToTry } from './tolerance-answers';

type Props = {
  circuit: Circuit;
  defaultTargetDb: number;
  onTryTolerance: (percent: string) => void;
};

/** "What tolerance do I need for X dB" at the design's gain, and the nearest E-series pairs for a gain. */
export const ToleranceTarget = memo(function ToleranceTarget({ circuit, defaultTargetDb, onTryTolerance }: Props) {
  const [targetText, setTargetText] = useState(numberToField(defaultTargetDb));
  const gains = designGains(circuit);
  const [gainText, setGainText] = useState(numberToField(Number(gains.stageGain.toPrecision(6))));
  const [series, setSeries] = useState<ESeriesName>('E96');
  const inAmp = circuit.topology === 'instrumentation-amplifier';

  const targetDb = parseEngineeringNumber(targetText);
  const answer = useMemo(() => {
    if (targetDb === null) return { error: 'Type a target CMRR in dB.' } as const;
    if (!(targetDb > 0 && targetDb < 250)) return { error: 'The target must be between 0 and 250 dB.' } as const;
    try {
      return { value: toleranceAnswer(circuit, targetDb) } as const;
    } catch (error) {
      return { error: error instanceof Error ? error.message : String(error) } as const;
    }
  }, [circuit, targetDb]);

  const targetGain = parseEngineeringNumber(gainText);
  const tolerance = stageToleranceFraction(circuit);
  const pairs = useMemo(() => {
    if (targetGain === null || !(targetGain > 0) || targetGain > 1e4) return { error: 'Type a gain above 0 and at most 10,000.' } as const;
    try {
      return { value: pairAnswers(circuit, targetGain, series, tolerance) } as const;
    } catch (error) {
      return { error: error instanceof Error ? error.message : String(error) } as const;
    }
  }, [circuit, targetGain, series, tolerance]);

  return (
    <div className="grid gap-6 lg:grid-cols-2">
      <section className="rounded-lg border border-ink-200 bg-white p-4" aria-labelledby="tolerance-target-title">
        <h2 id="tolerance-target-title" className="text-lg font-semibold text-ink-900">
          What tolerance do I need?
        </h2>
        <p className="mt-1 text-[0.9375rem] text-ink-700">
          Resistor matching alone, at this design&apos;s gain (difference stage G = <span className="tabular">{formatGain(gains.stageGain)}</span>
          {inAmp && (
            <>
              , input stage <span className="tabular">{formatGain(gains.frontGain)}</span> adding <span className="tabular">{formatDb(gains.frontGainDb)}</span>
            </>
          )}
          ), ideal op-amps, no source-resistance imbalance.
        </p>
        <label className="mt-3 block w-48">
          <span className="block font-medium text-ink-900">Target CMRR (dB)</span>
          <input className="mt-1 w-full rounded-md border border-ink-300 bg-white px-3 py-1.5 font-mono" inputMode="decimal" value={targetText} onChange={(event) => setTargetText(event.target.value)} />
        </label>
        {'error' in answer ? (
          <p className="mt-3 font-medium text-fault-600">
            <span aria-hidden="true">▲ </span>
            {answer.error}
          </p>
        ) : (
          <ToleranceResult answer={answer.value} targetDb={targetDb!} inAmp={inAmp} onTry={onTryTolerance} />
        )}
      </section>

      <section className="rounded-lg border border-ink-200 bg-white p-4" aria-labelledby="resistor-pairs-title">
        <h2 id="resistor-pairs-title" className="text-lg font-semibold text-ink-900">
          Preferred-value pairs for a gain
        </h2>
        <p className="mt-1 text-[0.9375rem] text-ink-700">
          R1 = R3 and R2 = R4 from an IEC 60063 series, R1 from <span className="tabular">1 kΩ</span> to <span className="tabular">9.99 kΩ</span>, with the CMRR each pair gives at ±
          <span className="tabular">{formatPercent(tolerance)}</span> (the explorer&apos;s tolerance{inAmp ? '; in-amp input stage included' : ''}).
        </p>
        <div className="mt-3 flex flex-wrap items-end gap-3">
          <label className="block w-36">
            <span className="block font-medium text-ink-900">Gain R2/R1</span>
            <input className="mt-1 w-full rounded-md border border-ink-300 bg-white px-3 py-1.5 font-mono" inputMode="decimal" value={gainText} onChange={(event) => setGainText(event.target.value)} />
          </label>
          <label className="block">
            <span className="block font-medium text-ink-900">Series</span>
            <select className="mt-1 rounded-md border border-ink-300 bg-white px-3 py-1.5" value={series} onChange={(event) => setSeries(event.target.value as ESeriesName)}>
              <option value="E24">E24</option>
              <option value="E96">E96</option>
              <option value="E192">E192</option>
            </select>
          </label>
        </div>
        {'error' in pairs ? (
          <p className="mt-3 font-medium text-fault-600">
            <span aria-hidden="true">▲ </span>
            {pairs.error}
          </p>
        ) : (
          <div className="mt-3 overflow-x-auto">
            <table className="w-full text-left">
              <caption className="sr-only">Nearest {series} resistor pairs for gain {gainText}</caption>
              <thead className="text-[0.9375rem] text-ink-600">
                <tr>
                  <th scope="col" className="py-1 pr-3 text-right font-medium">R1 = R3</th>
                  <th scope="col" className="py-1 pr-3 text-right font-medium">R2 = R4</th>
                  <th scope="col" className="py-1 pr-3 text-right font-medium">Gain</th>
                  <th scope="col" className="py-1 pr-3 text-right font-medium">Gain error</th>
                  <th scope="col" className="py-1 pr-3 text-right font-medium" title="Exact worst case over the 16 tolerance corners">
                    Worst case
                  </th>
                  <th scope="col" className="py-1 text-right font-medium" title="(1 + G)/(4ε)">
                    Approx.
                  </th>
                </tr>
              </thead>
              <tbody>
                {pairs.value.map((pair) => (
                  <tr key={pair.r1Ohms} className="border-t border-ink-100">
                    <td className="tabular py-1 pr-3 text-right">{formatOhms(pair.r1Ohms)}</td>
                    <td className="tabular py-1 pr-3 text-right">{formatOhms(pair.r2Ohms)}</td>
                    <td className="tabular py-1 pr-3 text-right">{formatGain(pair.gain)}</td>
                    <td className="tabular py-1 pr-3 text-right">{formatSignedPercent(pair.gainErrorFraction)}</td>
                    <td className="tabular py-1 pr-3 text-right">{formatDb(pair.designWorstCaseDb)}</td>
                    <td className="tabular py-1 text-right text-ink-600">{formatDb(pair.designApproximationDb)}</td>
                  </tr>
                ))}
              </tbody>
            </table>
            <p className="mt-2 text-[0.875rem] text-ink-600">
              Worst case: the exact minimum over every resistor at ±tol. Approx.: (1 + G)/(4ε), the usual estimate, slightly optimistic. The pair&apos;s own gain error does not cost rejection when both halves use the same pair.
            </p>
          </div>
        )}
      </section>
    </div>
  );
});

function ToleranceResult({ answer, targetDb, inAmp, onTry }: { answer: ReturnType<typeof toleranceAnswer>; targetDb: number; inAmp: boolean; onTry: (percent: string) => void }) {
  if (answer.stageTargetDb <= 0) {
    return <p className="mt-3 text-ink-800">The input stage&apos;s gain alone gives {formatDb(targetDb)}: any resistor tolerance will do for this target.</p>;
  }
  const tryPercent = toleranceToTry(answer.worstCaseToleranceFraction);
  return (
    <div className="mt-3 space-y-2" data-testid="tolerance-answer">
      <dl className="grid grid-cols-[1fr_auto] gap-x-4 gap-y-1.5">
        <dt className="text-ink-800">
          <span className="font-medium">Exact worst case</span> <span className="text-[0.875rem] text-ink-600">(every resistor at a corner; guaranteed)</span>
        </dt>
        <dd className="tabular text-right text-lg font-semibold" data-testid="tolerance-worst-case">
          ±{formatTolerance(answer.worstCaseToleranceFraction)}
        </dd>
        <dt className="text-ink-800">
          <span className="font-medium">Approximation</span> <span className="text-[0.875rem] text-ink-600">ε = (1 + G)/(4·CMRR)</span>
        </dt>
        <dd className="tabular text-right" data-testid="tolerance-approximation">
          ±{formatTolerance(answer.approximationToleranceFraction)}
        </dd>
      </dl>
      {inAmp && (
        <p className="text-[0.875rem] text-ink-600">
          The difference stage needs <span className="tabular">{formatDb(answer.stageTargetDb)}</span> of the <span className="tabular">{formatDb(targetDb)}</span>; the input stage supplies the rest.
        </p>
      )}
      {answer.opAmpLimitDb !== null && (
        <p className="rounded-md bg-amber-50 px-3 py-2 text-[0.9375rem] text-amber-900">
          <span aria-hidden="true">◐ </span>The op-amp&apos;s own CMRR is <span className="tabular">{formatDb(answer.opAmpLimitDb)}</span>: no resistor tolerance reaches the target with this part.
        </p>
      )}
      <Button size="sm" variant="secondary" onClick={() => onTry(tryPercent)}>
        Try ±{tryPercent} % in the explorer
      </Button>
    </div>
  );
}

/** A tolerance fraction in percent to four significant figures (enough to tell the two answers apart where they differ). */
function formatTolerance(fraction: number): string {
  return `${Number((fraction * 100).toPrecision(4))} %`;
}

function formatGain(gain: number): string {
  return Number(gain.toPrecision(5)).toString();
}

function formatSignedPercent(fraction: number): string {
  const percent = fraction * 100;
  if (percent === 0) return '0 %';
  return `${percent > 0 ? '+' : '−'}${Math.abs(percent).toPrecision(2)} %`;
}
