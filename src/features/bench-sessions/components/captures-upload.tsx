import { useState, type FormEvent } from 'react';
import type { SweepMode } from '../../../../shared/schemas/sweeps';
import { Button } from '../../../components/button';
import { FormError, FormSuccess } from '../../../components/form-error';
import { errorMessage } from '../../../lib/api-client';
import { parseEngineeringNumber } from '../../../lib/parse-number';
import type { UploadProgress } from '../../../lib/upload-with-progress';
import { useUploadCaptures } from '../api/upload-captures';
import { ProgressBar } from './progress-bar';

type CaptureRow = { file: File; mode: SweepMode; frequency: string };
const inputClasses = 'block w-full rounded-md border border-ink-300 bg-white px-2 py-1.5 text-ink-900';

/** Upload many two-channel captures (CSV or WAV), each tagged with its mode and, optionally, frequency. */
export function CapturesUpload({ sessionId }: { sessionId: string }) {
  const upload = useUploadCaptures();
  const [rows, setRows] = useState<CaptureRow[]>([]);
  const [inputScale, setInputScale] = useState('');
  const [outputScale, setOutputScale] = useState('');
  const [problem, setProblem] = useState<string | null>(null);
  const [progress, setProgress] = useState<UploadProgress | null>(null);
  const [done, setDone] = useState<string | null>(null);
  const [inputKey, setInputKey] = useState(0);
  const hasWav = rows.some((row) => row.file.name.toLowerCase().endsWith('.wav'));

  function choose(files: FileList | null) {
    setDone(null);
    setProblem(null);
    upload.reset();
    setRows(Array.from(files ?? []).map((file) => ({ file, mode: /(^|[^a-z])(cm|common)/i.test(file.name) ? 'common-mode' : 'differential', frequency: '' })));
  }

  function handleSubmit(event: FormEvent<HTMLFormElement>) {
    event.preventDefault();
    setDone(null);
    if (rows.length === 0) {
      setProblem('Choose one or more capture files first.');
      return;
    }
    const tags = [];
    for (const row of rows) {
      const frequencyHz = row.frequency.trim() === '' ? null : parseEngineeringNumber(row.frequency);
      if (row.frequency.trim() !== '' && (frequencyHz === null || frequencyHz <= 0)) {
        setProblem(`${row.file.name}: the frequency “${row.frequency}” is not a positive number of hertz (leave it blank to estimate it).`);
        return;
      }
      tags.push({ file: row.file.name, mode: row.mode, frequencyHz });
    }
    const scale = (text: string, what: string) => {
      if (text.trim() === '') return null;
      const value = parseEngineeringNumber(text);
      if (value === null || value <= 0) throw new Error(`${what} must be a positive number of volts`);
      return value;
    };
    let inputVoltsPerFullScale: number | null;
    let outputVoltsPerFullScale: number | null;
    try {
      inputVoltsPerFullScale = scale(inputScale, 'Input volts per full scale');
      outputVoltsPerFullScale = scale(outputScale, 'Output volts per full scale');
    } catch (error) {
      setProblem(errorMessage(error));
      return;
    }
    setProblem(null);
    const files = rows.map((row) => row.file);
    setProgress({ sentBytes: 0, totalBytes: files.reduce((sum, file) => sum + file.size, 0) });
    upload.mutate(
      { sessionId, files, tags, inputVoltsPerFullScale, outputVoltsPerFullScale, onProgress: setProgress },
      {
        onSuccess: ({ sweeps }) => {
          setDone(`${files.length} capture${files.length === 1 ? '' : 's'} fitted and added: ${sweeps.map((sweep) => `${sweep.mode} sweep of ${sweep.pointCount} points`).join(', ')}.`);
          setRows([]);
          setInputKey((key) => key + 1);
        },
        onSettled: () => setProgress(null),
      },
    );
  }

  return (
    <form noValidate onSubmit={handleSubmit} aria-label="Upload captures" className="space-y-4">
      <FormSuccess message={done} />
      <p className="text-[0.9375rem] text-ink-700">
        Two-channel records (drive and output), as CSV or WAV. Each capture is fitted with a sine and becomes one point of the differential or
        common-mode sweep. Leave the frequency blank to have it estimated from the record.
      </p>
      <div className="space-y-1.5">
        <label htmlFor="capture-files" className="block font-medium text-ink-900">
          Capture files
        </label>
        <input
          key={inputKey}
          id="capture-files"
          type="file"
          multiple
          accept=".csv,.wav,.txt,text/csv,audio/wav"
          onChange={(event) => choose(event.target.files)}
          className="block w-full text-ink-900 file:mr-3 file:rounded-md file:border file:border-ink-300 file:bg-white file:px-3 file:py-1.5 file:font-medium"
        />
      </div>
      {rows.length > 0 && (
        <div className="max-h-80 overflow-auto rounded-md border border-ink-200">
          <table className="w-full text-left">
            <caption className="sr-only">Captures to upload</caption>
            <thead className="sticky top-0 bg-ink-50 text-[0.9375rem] text-ink-700">
              <tr>
                <th scope="col" className="px-3 py-1.5 font-semibold">File</th>
                <th scope="col" className="px-3 py-1.5 font-semibold">Mode</th>
                <th scope="col" className="px-3 py-1.5 font-semibold">Frequency (Hz)</th>
              </tr>
            </thead>
            <tbody className="divide-y divide-ink-100">
              {rows.map((row, index) => (
                <tr key={row.file.name}>
                  <th scope="row" className="px-3 py-1.5 font-medium break-all">
                    {row.file.name} <span className="tabular font-normal text-ink-600">{(row.file.size / 1024).toFixed(1)} KB</span>
                  </th>
                  <td className="px-3 py-1.5">
                    <select
                      aria-label={`Mode of ${row.file.name}`}
                      className={inputClasses}
                      value={row.mode}
                      onChange={(event) => setRows((current) => current.map((candidate, position) => (position === index ? { ...candidate, mode: event.target.value as SweepMode } : candidate)))}
                    >
                      <option value="differential">Differential</option>
                      <option value="common-mode">Common-mode</option>
                    </select>
                  </td>
                  <td className="px-3 py-1.5">
                    <input
                      aria-label={`Frequency of ${row.file.name} (Hz, blank to estimate)`}
                      inputMode="decimal"
                      placeholder="estimate"
                      className={`${inputClasses} font-mono`}
                      value={row.frequency}
                      onChange={(event) => setRows((current) => current.map((candidate, position) => (position === index ? { ...candidate, frequency: event.target.value } : candidate)))}
                    />
                  </td>
                </tr>
              ))}
            </tbody>
          </table>
        </div>
      )}
      {hasWav && (
        <fieldset className="grid gap-4 rounded-md border border-ink-200 px-4 pt-2 pb-4 md:grid-cols-2">
          <legend className="px-1 font-semibold text-ink-900">WAV scaling (optional)</legend>
          <p className="text-[0.9375rem] text-ink-700 md:col-span-2">WAV samples are fractions of full scale; say how many volts full scale is on each channel (default 1 V).</p>
          <div className="space-y-1.5">
            <label htmlFor="input-scale" className="block font-medium">Input channel, volts per full scale</label>
            <input id="input-scale" inputMode="decimal" className={`${inputClasses} font-mono`} value={inputScale} onChange={(event) => setInputScale(event.target.value)} placeholder="1" />
          </div>
          <div className="space-y-1.5">
            <label htmlFor="output-scale" className="block font-medium">Output channel, volts per full scale</label>
            <input id="output-scale" inputMode="decimal" className={`${inputClasses} font-mono`} value={outputScale} onChange={(event) => setOutputScale(event.target.value)} placeholder="1" />
          </div>
        </fieldset>
      )}
      <FormError message={problem} />
      {upload.isError && (
        <div role="alert" className="rounded-md border border-fault-600/40 bg-fault-50 px-3 py-2.5 text-fault-700">
          <p className="font-semibold">
            <span aria-hidden="true">▲ </span>The server refused the captures; nothing was added
          </p>
          <p className="mt-1">{errorMessage(upload.error)}</p>
        </div>
      )}
      {progress && <ProgressBar progress={progress} label="Uploading captures" />}
      <Button type="submit" disabled={rows.length === 0} busy={upload.isPending} busyLabel="Uploading and fitting…">
        Upload {rows.length > 0 ? rows.length : ''} capture{rows.length === 1 ? '' : 's'}
      </Button>
    </form>
  );
}
