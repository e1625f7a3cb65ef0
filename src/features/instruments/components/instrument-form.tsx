import { useState, type FormEvent } from 'react';
import { instrumentInputSchema, instrumentKinds, type Instrument, type InstrumentInput } from '../../../../shared/schemas/instruments';
import { Button } from '../../../components/button';
import { SelectField, TextAreaField, TextField } from '../../../components/field';
import { FormError } from '../../../components/form-error';
import { focusFirstInvalid } from '../../../lib/focus-first-invalid';
import { formErrorsFrom } from '../../../lib/form-errors';
import { fieldErrorsFromIssues } from '../../../lib/zod-fields';
import { useCreateInstrument } from '../api/create-instrument';
import { useUpdateInstrument } from '../api/update-instrument';

type Draft = Omit<Required<InstrumentInput>, 'calibratedOn' | 'calibrationDueOn'> & { calibratedOn: string; calibrationDueOn: string };

function draftFrom(instrument: Instrument | null): Draft {
  return {
    name: instrument?.name ?? '',
    kind: instrument?.kind ?? 'oscilloscope',
    manufacturer: instrument?.manufacturer ?? '',
    model: instrument?.model ?? '',
    serialNumber: instrument?.serialNumber ?? '',
    calibratedOn: instrument?.calibratedOn ?? '',
    calibrationDueOn: instrument?.calibrationDueOn ?? '',
    notes: instrument?.notes ?? '',
    retired: instrument?.retired ?? false,
  };
}

/** Add an instrument, or edit one (lead only). `instrument` null means a new one. */
export function InstrumentForm({ instrument, onDone }: { instrument: Instrument | null; onDone: (message: string) => void }) {
  const create = useCreateInstrument();
  const update = useUpdateInstrument();
  const mutation = instrument ? update : create;
  const [draft, setDraft] = useState<Draft>(() => draftFrom(instrument));
  const [fieldErrors, setFieldErrors] = useState<Record<string, string>>({});
  const { formMessage, fields: serverFields } = formErrorsFrom(mutation.error);
  const errorFor = (name: keyof Draft) => fieldErrors[name] ?? serverFields[name];
  const set = <Key extends keyof Draft>(key: Key, value: Draft[Key]) => setDraft((current) => ({ ...current, [key]: value }));

  function handleSubmit(event: FormEvent<HTMLFormElement>) {
    event.preventDefault();
    const parsed = instrumentInputSchema.safeParse({
      ...draft,
      calibratedOn: draft.calibratedOn || null,
      calibrationDueOn: draft.calibrationDueOn || null,
    });
    if (!parsed.success) {
      setFieldErrors(fieldErrorsFromIssues(parsed.error.issues));
      focusFirstInvalid(event.currentTarget);
      return;
    }
    setFieldErrors({});
    const form = event.currentTarget;
    const done = { onSuccess: ({ instrument: saved }: { instrument: Instrument }) => onDone(`${saved.name} ${instrument ? 'saved' : 'added'}.`), onError: () => focusFirstInvalid(form) };
    if (instrument) update.mutate({ instrumentId: instrument.id, input: parsed.data }, done);
    else create.mutate(parsed.data, done);
  }

  const title = instrument ? `Edit ${instrument.name}` : 'Add an instrument';
  return (
    <section aria-label={title} className="rounded-lg border border-ink-200 bg-white p-5">
      <h2 className="text-lg font-semibold text-ink-900">{title}</h2>
      <form noValidate onSubmit={handleSubmit} className="mt-4 space-y-4" aria-label={title}>
        <FormError message={formMessage} />
        <div className="grid items-start gap-4 md:grid-cols-2 xl:grid-cols-3">
          <TextField label="Name" value={draft.name} onChange={(event) => set('name', event.target.value)} error={errorFor('name')} hint="What people call it at the bench, e.g. “Scope 2”." />
          <SelectField label="Kind" value={draft.kind} onChange={(event) => set('kind', event.target.value as Draft['kind'])} error={errorFor('kind')}>
            {instrumentKinds.map((kind) => (
              <option key={kind} value={kind}>
                {kind[0].toUpperCase() + kind.slice(1)}
              </option>
            ))}
          </SelectField>
          <TextField label="Serial number" value={draft.serialNumber} onChange={(event) => set('serialNumber', event.target.value)} error={errorFor('serialNumber')} className="font-mono" />
          <TextField label="Manufacturer" value={draft.manufacturer} onChange={(event) => set('manufacturer', event.target.value)} error={errorFor('manufacturer')} />
          <TextField label="Model" value={draft.model} onChange={(event) => set('model', event.target.value)} error={errorFor('model')} />
          <div className="grid grid-cols-2 gap-3">
            <TextField label="Calibrated on" type="date" value={draft.calibratedOn} onChange={(event) => set('calibratedOn', event.target.value)} error={errorFor('calibratedOn')} className="font-mono" />
            <TextField label="Due on" type="date" value={draft.calibrationDueOn} onChange={(event) => set('calibrationDueOn', event.target.value)} error={errorFor('calibrationDueOn')} className="font-mono" />
          </div>
        </div>
        <TextAreaField label="Notes" value={draft.notes} onChange={(event) => set('notes', event.target.value)} error={errorFor('notes')} hint="Optional: probe attenuation, calibration lab, known quirks." />
        {instrument && (
          <label className="flex items-center gap-2 font-medium text-ink-900">
            <input type="checkbox" className="h-4 w-4 accent-trace-600" checked={draft.retired} onChange={(event) => set('retired', event.target.checked)} />
            Retired — kept for the record of past sessions, no longer offered for new ones
          </label>
        )}
        <div className="flex gap-2">
          <Button type="submit" busy={mutation.isPending} busyLabel="Saving…">
            {instrument ? 'Save changes' : 'Add instrument'}
          </Button>
          <Button variant="secondary" onClick={() => onDone('')}>
            Cancel
          </Button>
        </div>
      </form>
    </section>
  );
}
