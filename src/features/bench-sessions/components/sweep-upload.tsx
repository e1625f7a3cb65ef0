import { useMemo, useState, type FormEvent } from 'react';
import { EngineInputError } from '../../../../shared/engine/errors';
import { amplitudeUnits, canonicalMapping, type ColumnMapping, type SweepMode } from '../../../../shared/schemas/sweeps';
import { Button } from '../../../components/button';
import { FormError, FormSuccess } from '../../../components/form-error';
import { errorMessage } from '../../../lib/api-client';
import { formatHz } from '../../../lib/format-number';
import type { UploadProgress } from '../../../lib/upload-with-progress';
import { useColumnMapping } from '../api/get-column-mapping';
import { useUploadSweep } from '../api/upload-sweep';
import { checkPreview, guessMapping, readPreview, rememberedMappingFor, type SweepPreview } from './column-mapping-draft';
import { ProgressBar } from './progress-bar';

const selectClasses = 'block w-full rounded-md border border-ink-300 bg-white px-2 py-1.5 text-ink-900';
const previewRowCount = 8;

/** Upload a sweep table: choose → preview → (map columns) → check → upload with progress. */
export function SweepUpload({ sessionId }: { sessionId: string }) {
  const upload = useUploadSweep();
  const remembered = useColumnMapping();
  const [mode, setMode] = useState<SweepMode>('differential');
  const [file, setFile] = useState<File | null>(null);
  const [preview, setPreview] = useState<SweepPreview | null>(null);
  const [readError, setReadError] = useState<string | null>(null);
  const [mapping, setMapping] = useState<ColumnMapping | null>(null);
  const [mappingSource, setMappingSource] = useState<'canonical' | 'remembered' | 'guessed'>('guessed');
  const [averageRepeats, setAverageRepeats] = useState(false);
  const [progress, setProgress] = useState<UploadProgress | null>(null);
  const [done, setDone] = useState<string | null>(null);
  const [inputKey, setInputKey] = useState(0);

  const check = useMemo(() => (preview && mapping ? checkPreview(preview, mapping, averageRepeats) : null), [preview, mapping, averageRepeats]);

  async function choose(chosen: File | null) {
    setFile(chosen);
    setPreview(null);
    setMapping(null);
    setReadError(null);
    setDone(null);
    upload.reset();
    if (!chosen) return;
    try {
      const read = await readPreview(chosen);
      const header = read.table.header;
      const canonical = canonicalMapping(header);
      const recalled = rememberedMappingFor(remembered.data?.columnMapping, header);
      setPreview(read);
      setMapping(canonical ?? recalled ?? guessMapping(header));
      setMappingSource(canonical ? 'canonical' : recalled ? 'remembered' : 'guessed');
    } catch (error) {
      setReadError(error instanceof EngineInputError || error instanceof Error ? error.message : errorMessage(error));
    }
  }

  function handleSubmit(event: FormEvent<HTMLFormElement>) {
    event.preventDefault();
    if (!file || !mapping || !check?.ok) return;
    setDone(null);
    setProgress({ sentBytes: 0, totalBytes: file.size });
    upload.mutate(
      { sessionId, file, mode, mapping: mappingSource === 'canonical' ? null : mapping, averageRepeats, onProgress: setProgress },
      {
        onSuccess: ({ sweeps }) => {
          const sweep = sweeps[0];
          setDone(`${file.name} added as a ${mode} sweep${sweep ? ` of ${sweep.pointCount} points` : ''}.`);
          setFile(null);
          setPreview(null);
          setMapping(null);
          setInputKey((key) => key + 1);
        },
        onSettled: () => setProgress(null),
      },
    );
  }

  const header = preview?.table.header ?? [];
  return (
    <form noValidate onSubmit={handleSubmit} aria-label="Upload a sweep file" className="space-y-4">
      <FormSuccess message={done} />
      <div className="grid items-end gap-4 md:grid-cols-[14rem_1fr]">
        <div className="space-y-1.5">
          <label htmlFor="sweep-mode" className="block font-medium text-ink-900">
            Sweep mode
          </label>
          <select id="sweep-mode" value={mode} onChange={(event) => setMode(event.target.value as SweepMode)} className="block w-full rounded-md border border-ink-300 bg-white px-3 py-2 text-ink-900">
            <option value="differential">Differential</option>
            <option value="common-mode">Common-mode</option>
          </select>
        </div>
        <div className="space-y-1.5">
          <label htmlFor="sweep-file" className="block font-medium text-ink-900">
            Sweep file (CSV, semicolon or tab separated)
          </label>
          <input
            key={inputKey}
            id="sweep-file"
            type="file"
            accept=".csv,.txt,.tsv,text/csv,text/plain"
            onChange={(event) => void choose(event.target.files?.[0] ?? null)}
            className="block w-full text-ink-900 file:mr-3 file:rounded-md file:border file:border-ink-300 file:bg-white file:px-3 file:py-1.5 file:font-medium"
          />
        </div>
      </div>
      <FormError message={readError} />

      {preview && (
        <div className="space-y-2">
          <h3 className="font-semibold text-ink-900">
            Preview of {preview.fileName}{' '}
            <span className="font-normal text-ink-600">
              (first {Math.min(previewRowCount, preview.table.rows.length)} of {preview.partial ? 'the first ' : ''}
              <span className="tabular">{preview.table.rows.length}</span> rows{preview.partial ? ', from the first 64 KB' : ''})
            </span>
          </h3>
          <div className="max-h-72 overflow-auto rounded-md border border-ink-200">
            <table className="w-full border-collapse text-left">
              <caption className="sr-only">First rows of {preview.fileName}</caption>
              <thead className="sticky top-0 bg-ink-50 text-[0.9375rem] text-ink-700">
                <tr>
                  <th scope="col" className="px-3 py-1.5 font-semibold">Line</th>
                  {header.map((name) => (
                    <th key={name} scope="col" className="px-3 py-1.5 font-semibold whitespace-nowrap">
                      {name}
                    </th>
                  ))}
                </tr>
              </thead>
              <tbody className="divide-y divide-ink-100">
                {preview.table.rows.slice(0, previewRowCount).map((row) => (
                  <tr key={row.line} className={check && !check.ok && check.row === row.line ? 'bg-fault-50' : ''}>
                    <td className="tabular px-3 py-1 text-ink-600">{row.line}</td>
                    {header.map((name, index) => (
                      <td key={name} className="tabular px-3 py-1">
                        {row.cells[index] ?? ''}
                      </td>
                    ))}
                  </tr>
                ))}
              </tbody>
            </table>
          </div>
        </div>
      )}

      {preview && mapping && mappingSource === 'canonical' && (
        <p className="rounded-md border border-good-600/40 bg-good-50 px-3 py-2 text-good-700">
          <span aria-hidden="true">✓ </span>
          This file has Rejectra's own header (frequency_hz, vin_v, vout_v in volts rms): no mapping needed.
        </p>
      )}
      {preview && mapping && mappingSource !== 'canonical' && (
        <MappingEditor header={header} mapping={mapping} onChange={setMapping} source={mappingSource} />
      )}

      {preview && (
        <label className="flex items-center gap-2 text-ink-900">
          <input type="checkbox" className="h-4 w-4 accent-trace-600" checked={averageRepeats} onChange={(event) => setAverageRepeats(event.target.checked)} />
          Average rows that repeat a frequency (otherwise a repeated frequency is refused)
        </label>
      )}

      {check && !check.ok && (
        <div role="alert" className="rounded-md border border-fault-600/40 bg-fault-50 px-3 py-2.5 text-fault-700">
          <p className="font-semibold">
            <span aria-hidden="true">▲ </span>The preview does not read as a sweep with this mapping
            {check.row !== null && (
              <>
                {' '}
                — row <span className="tabular">{check.row}</span>
              </>
            )}
            {check.column !== null && <>, column “{String(check.column)}”</>}
          </p>
          <p className="mt-1">{check.message}</p>
        </div>
      )}
      {check && check.ok && (
        <p role="status" className="text-good-700">
          <span aria-hidden="true">✓ </span>
          <span className="tabular">{check.rowsChecked}</span> previewed rows read as a sweep
          {check.firstFrequencyHz !== null && check.lastFrequencyHz !== null && (
            <>
              {' '}
              from <span className="tabular">{formatHz(check.firstFrequencyHz)}</span> to <span className="tabular">{formatHz(check.lastFrequencyHz)}</span>
            </>
          )}
          {preview?.partial ? '; the server checks the rest of the file.' : '.'}
        </p>
      )}

      {upload.isError && (
        <div role="alert" className="rounded-md border border-fault-600/40 bg-fault-50 px-3 py-2.5 text-fault-700">
          <p className="font-semibold">
            <span aria-hidden="true">▲ </span>The server refused {file?.name ?? 'the file'}
          </p>
          <p className="mt-1">{errorMessage(upload.error)}</p>
        </div>
      )}
      {progress && <ProgressBar progress={progress} label={`Uploading ${file?.name ?? 'the sweep'}`} />}
      <Button type="submit" disabled={!check?.ok} busy={upload.isPending} busyLabel="Uploading…">
        Upload {mode} sweep
      </Button>
    </form>
  );
}

function MappingEditor({
  header,
  mapping,
  onChange,
  source,
}: {
  header: string[];
  mapping: ColumnMapping;
  onChange: (mapping: ColumnMapping) => void;
  source: 'remembered' | 'guessed';
}) {
  const columnOptions = header.map((name) => (
    <option key={name} value={name}>
      {name}
    </option>
  ));
  const amplitudeRow = (key: 'vin' | 'vout' | 'floor', label: string, optional: boolean) => {
    const value = mapping[key];
    return (
      <tr className="border-t border-ink-100">
        <th scope="row" className="px-3 py-2 text-left font-medium text-ink-900">
          {label}
        </th>
        <td className="px-3 py-2">
          <select
            aria-label={`${label} column`}
            className={selectClasses}
            value={value?.column ?? ''}
            onChange={(event) =>
              onChange({
                ...mapping,
                [key]: event.target.value === '' ? null : { unit: value?.unit ?? 'V', convention: value?.convention ?? 'rms', column: event.target.value },
              })
            }
          >
            {optional && <option value="">— none —</option>}
            {columnOptions}
          </select>
        </td>
        <td className="px-3 py-2">
          <select
            aria-label={`${label} unit`}
            className={selectClasses}
            disabled={!value}
            value={value?.unit ?? 'V'}
            onChange={(event) => value && onChange({ ...mapping, [key]: { ...value, unit: event.target.value as ColumnMapping['vin']['unit'] } })}
          >
            {amplitudeUnits.map((unit) => (
              <option key={unit} value={unit}>
                {unit}
              </option>
            ))}
          </select>
        </td>
        <td className="px-3 py-2">
          <select
            aria-label={`${label} convention`}
            className={selectClasses}
            disabled={!value || value.unit === 'dBV'}
            value={value?.unit === 'dBV' ? 'rms' : (value?.convention ?? 'rms')}
            onChange={(event) => value && onChange({ ...mapping, [key]: { ...value, convention: event.target.value as 'peak' | 'rms' } })}
          >
            <option value="rms">RMS</option>
            <option value="peak">Peak</option>
          </select>
        </td>
      </tr>
    );
  };

  return (
    <fieldset className="rounded-md border border-ink-200 px-4 pt-2 pb-4">
      <legend className="px-1 font-semibold text-ink-900">Which column is which</legend>
      <p className="mb-3 text-[0.9375rem] text-ink-700">
        {source === 'remembered'
          ? 'Filled in from the mapping you used last time for this same header. Check it, then upload.'
          : 'This header is not Rejectra’s own, so say which column holds what and in which unit. The guess below is from the column names. Amplitudes are stored as volts RMS; dBV is RMS by definition.'}
      </p>
      <div className="overflow-x-auto">
        <table className="w-full min-w-[36rem] text-left">
          <caption className="sr-only">Column mapping</caption>
          <thead className="text-[0.9375rem] text-ink-600">
            <tr>
              <th scope="col" className="px-3 py-1 font-medium">Quantity</th>
              <th scope="col" className="px-3 py-1 font-medium">Column</th>
              <th scope="col" className="px-3 py-1 font-medium">Unit</th>
              <th scope="col" className="px-3 py-1 font-medium">Peak or RMS</th>
            </tr>
          </thead>
          <tbody>
            <tr>
              <th scope="row" className="px-3 py-2 text-left font-medium text-ink-900">
                Frequency
              </th>
              <td className="px-3 py-2">
                <select aria-label="Frequency column" className={selectClasses} value={mapping.frequency.column} onChange={(event) => onChange({ ...mapping, frequency: { ...mapping.frequency, column: event.target.value } })}>
                  {columnOptions}
                </select>
              </td>
              <td className="px-3 py-2">
                <select aria-label="Frequency unit" className={selectClasses} value={mapping.frequency.unit} onChange={(event) => onChange({ ...mapping, frequency: { ...mapping.frequency, unit: event.target.value as ColumnMapping['frequency']['unit'] } })}>
                  <option value="Hz">Hz</option>
                  <option value="kHz">kHz</option>
                  <option value="MHz">MHz</option>
                </select>
              </td>
              <td />
            </tr>
            {amplitudeRow('vin', 'Drive (vin)', false)}
            {amplitudeRow('vout', 'Output (vout)', false)}
            <tr className="border-t border-ink-100">
              <th scope="row" className="px-3 py-2 text-left font-medium text-ink-900">
                Phase (degrees)
              </th>
              <td className="px-3 py-2">
                <select aria-label="Phase (degrees) column" className={selectClasses} value={mapping.phase?.column ?? ''} onChange={(event) => onChange({ ...mapping, phase: event.target.value === '' ? null : { column: event.target.value } })}>
                  <option value="">— none —</option>
                  {columnOptions}
                </select>
              </td>
              <td />
              <td />
            </tr>
            {amplitudeRow('floor', 'Noise floor', true)}
          </tbody>
        </table>
      </div>
    </fieldset>
  );
}
