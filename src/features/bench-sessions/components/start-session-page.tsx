import { useState, type FormEvent } from 'react';
import { Link, useNavigate } from 'react-router-dom';
import { createBenchSessionSchema, driveIsHazardous, type Drive } from '../../../../shared/schemas/bench-sessions';
import { CalibrationBadge } from '../../../components/badge';
import { Button } from '../../../components/button';
import { SelectField, TextAreaField, TextField } from '../../../components/field';
import { FormError } from '../../../components/form-error';
import { PageHeader } from '../../../components/page-header';
import { SafetyNote } from '../../../components/safety-note';
import { ErrorState, LoadingState } from '../../../components/states';
import { errorMessage } from '../../../lib/api-client';
import { focusFirstInvalid } from '../../../lib/focus-first-invalid';
import { formErrorsFrom } from '../../../lib/form-errors';
import { parseEngineeringNumber } from '../../../lib/parse-number';
import { useCreateSession } from '../api/create-session';
import { useDesignChoices, useDesignRevisions } from '../api/get-design-choices';
import { useInstrumentChoices } from '../api/get-instrument-choices';

type DriveDraft = { acVolts: string; acConvention: 'rms' | 'peak'; dcVolts: string };

/** A drive as typed, read into volts; NaN where the text is not a number (the schema then says so). */
function driveFrom(draft: DriveDraft): Drive {
  return {
    acVolts: parseEngineeringNumber(draft.acVolts) ?? Number.NaN,
    acConvention: draft.acConvention,
    dcVolts: draft.dcVolts.trim() === '' ? 0 : (parseEngineeringNumber(draft.dcVolts) ?? Number.NaN),
  };
}

export default function StartSessionPage() {
  const navigate = useNavigate();
  const designs = useDesignChoices();
  const instruments = useInstrumentChoices();
  const create = useCreateSession();
  const [designId, setDesignId] = useState('');
  const [revisionId, setRevisionId] = useState('');
  const revisions = useDesignRevisions(designId);
  const [unitSerial, setUnitSerial] = useState('');
  const [fixture, setFixture] = useState('');
  const [temperature, setTemperature] = useState('');
  const [instrumentIds, setInstrumentIds] = useState<string[]>([]);
  const [differential, setDifferential] = useState<DriveDraft>({ acVolts: '0.1', acConvention: 'rms', dcVolts: '0' });
  const [commonMode, setCommonMode] = useState<DriveDraft>({ acVolts: '1', acConvention: 'rms', dcVolts: '0' });
  const [acknowledged, setAcknowledged] = useState(false);
  const [notes, setNotes] = useState('');
  const [clientErrors, setClientErrors] = useState<Record<string, string>>({});
  const { formMessage, fields: serverErrors } = formErrorsFrom(create.error);
  const errorFor = (key: string) => clientErrors[key] ?? serverErrors[key];

  const commonModeDrive = driveFrom(commonMode);
  const hazardous = Number.isFinite(commonModeDrive.acVolts) && Number.isFinite(commonModeDrive.dcVolts) && driveIsHazardous(commonModeDrive);
  const chosenRevisionId = revisionId || revisions.data?.design.revisions[0]?.id || '';
  const chosenInstruments = instruments.data?.instruments.filter((instrument) => instrumentIds.includes(instrument.id)) ?? [];
  const overdue = chosenInstruments.filter((instrument) => instrument.calibrationState === 'overdue');

  function handleSubmit(event: FormEvent<HTMLFormElement>) {
    event.preventDefault();
    const form = event.currentTarget;
    const errors: Record<string, string> = {};
    const temperatureC = temperature.trim() === '' ? null : parseEngineeringNumber(temperature);
    if (temperature.trim() !== '' && temperatureC === null) errors.ambientTemperatureC = 'Ambient temperature must be a number in °C';
    if (!designId) errors.designRevisionId = 'Choose the design this unit is built to';
    const parsed = createBenchSessionSchema.safeParse({
      designRevisionId: chosenRevisionId,
      unitSerial,
      fixture,
      ambientTemperatureC: temperatureC,
      instrumentIds,
      differentialDrive: driveFrom(differential),
      commonModeDrive,
      hazardAcknowledged: hazardous && acknowledged,
      notes,
    });
    if (!parsed.success) {
      for (const issue of parsed.error.issues) errors[issue.path.map(String).join('.')] ??= issue.message;
    }
    if (Object.keys(errors).length > 0 || !parsed.success) {
      setClientErrors(errors);
      focusFirstInvalid(form);
      return;
    }
    setClientErrors({});
    create.mutate(parsed.data, {
      onSuccess: ({ session }) => navigate(`/sessions/${session.id}`, { state: { notice: `Bench session for ${session.unitSerial} started. Add sweeps below.` } }),
      onError: () => focusFirstInvalid(form),
    });
  }

  if (designs.isPending || instruments.isPending) return <LoadingState label="Loading designs and instruments…" />;
  if (designs.isError || instruments.isError) {
    return (
      <ErrorState
        title="Designs or instruments could not be loaded"
        message={errorMessage(designs.error ?? instruments.error)}
        onRetry={() => {
          void designs.refetch();
          void instruments.refetch();
        }}
      />
    );
  }

  const usable = instruments.data.instruments.filter((instrument) => !instrument.retired);
  return (
    <>
      <title>Start a bench session · Rejectra</title>
      <Link to="/sessions" className="mb-3 inline-block text-[0.9375rem] font-medium text-trace-700 underline underline-offset-2">
        ← All bench sessions
      </Link>
      <PageHeader title="Start a bench session" lead="One board on the bench: what it is, what it is measured with and how it is driven. Sweeps are added on the session's page." />
      {designs.data.designs.length === 0 ? (
        <ErrorState title="No design to measure against yet" message="A designer or lead has to create the board's design first (Designs → Create a design)." />
      ) : (
        <form noValidate onSubmit={handleSubmit} aria-label="Start a bench session" className="max-w-5xl space-y-6 rounded-lg border border-ink-200 bg-white p-5">
          <FormError message={formMessage} />
          <div className="grid items-start gap-4 md:grid-cols-2">
            <SelectField
              label="Design"
              value={designId}
              onChange={(event) => {
                setDesignId(event.target.value);
                setRevisionId('');
              }}
              error={!designId ? errorFor('designRevisionId') : undefined}
            >
              <option value="">Choose a design…</option>
              {designs.data.designs.map((design) => (
                <option key={design.id} value={design.id}>
                  {design.name}
                </option>
              ))}
            </SelectField>
            <SelectField
              label="Design revision"
              value={chosenRevisionId}
              disabled={!designId || revisions.isPending}
              onChange={(event) => setRevisionId(event.target.value)}
              error={designId ? errorFor('designRevisionId') : undefined}
              hint={designId ? 'The revision this unit is built to; the newest is chosen for you.' : 'Choose the design first.'}
            >
              {!designId && <option value="">—</option>}
              {revisions.data?.design.revisions.map((revision, index) => (
                <option key={revision.id} value={revision.id}>
                  {revision.label} (r{revision.revision}){index === 0 ? ' — latest' : ''}
                </option>
              ))}
            </SelectField>
            <TextField label="Unit serial number" className="font-mono" value={unitSerial} onChange={(event) => setUnitSerial(event.target.value)} error={errorFor('unitSerial')} hint="As on the board's label, e.g. HRB204-0007." />
            <TextField label="Fixture" value={fixture} onChange={(event) => setFixture(event.target.value)} error={errorFor('fixture')} hint="How the board is held and connected." />
            <TextField label="Ambient temperature (°C)" inputMode="decimal" className="font-mono" value={temperature} onChange={(event) => setTemperature(event.target.value)} error={errorFor('ambientTemperatureC')} hint="Optional." />
          </div>

          <fieldset className="rounded-md border border-ink-200 px-4 pt-2 pb-4">
            <legend className="px-1 font-semibold text-ink-900">Instruments used</legend>
            {usable.length === 0 ? (
              <p className="text-ink-700">No instruments are registered; a lead adds them on the Instruments page. You can start the session without.</p>
            ) : (
              <ul className="grid gap-2 md:grid-cols-2">
                {usable.map((instrument) => (
                  <li key={instrument.id}>
                    <label className="flex cursor-pointer items-start gap-3 rounded-md border border-ink-200 px-3 py-2 hover:bg-ink-50">
                      <input
                        type="checkbox"
                        className="mt-1 h-4 w-4 accent-trace-600"
                        checked={instrumentIds.includes(instrument.id)}
                        onChange={(event) =>
                          setInstrumentIds((current) => (event.target.checked ? [...current, instrument.id] : current.filter((id) => id !== instrument.id)))
                        }
                      />
                      <span className="min-w-0 flex-1">
                        <span className="font-medium text-ink-900">{instrument.name}</span>{' '}
                        <span className="text-[0.9375rem] text-ink-600">
                          {instrument.manufacturer} {instrument.model} · <span className="tabular">{instrument.serialNumber}</span>
                        </span>
                        <span className="mt-1 flex items-center gap-2 text-[0.9375rem] text-ink-600">
                          <CalibrationBadge state={instrument.calibrationState} />
                          {instrument.calibrationDueOn && <span className="tabular">due {instrument.calibrationDueOn}</span>}
                        </span>
                      </span>
                    </label>
                  </li>
                ))}
              </ul>
            )}
            {errorFor('instrumentIds') && <p className="mt-2 font-medium text-fault-600">▲ {errorFor('instrumentIds')}</p>}
            {overdue.length > 0 && (
              <p role="status" className="mt-3 rounded-md border border-fault-600/40 bg-fault-50 px-3 py-2 text-fault-700">
                <span aria-hidden="true">▲ </span>
                {overdue.map((instrument) => instrument.name).join(', ')} {overdue.length === 1 ? 'is' : 'are'} past the calibration due date. The session
                will record this; consider another instrument or note why in the notes.
              </p>
            )}
          </fieldset>

          <div className="grid gap-4 lg:grid-cols-2">
            <DriveFields title="Differential drive" prefix="differentialDrive" drive={differential} onChange={setDifferential} errorFor={errorFor} />
            <DriveFields title="Common-mode drive" prefix="commonModeDrive" drive={commonMode} onChange={setCommonMode} errorFor={errorFor} />
          </div>

          {hazardous && (
            <div className="space-y-3">
              <SafetyNote />
              <p className="font-semibold text-amber-900">
                This common-mode drive is hazardous live (above about 30 V rms or 60 V dc). Use differential or isolated probes, never a
                ground-referenced probe, and follow your local electrical codes and licensed practice.
              </p>
              <label className={`flex items-center gap-3 rounded-md border px-3 py-2 font-medium ${errorFor('hazardAcknowledged') ? 'border-fault-600 bg-fault-50' : 'border-amber-500 bg-amber-50'}`}>
                <input
                  type="checkbox"
                  className="h-5 w-5 accent-trace-600"
                  checked={acknowledged}
                  aria-invalid={errorFor('hazardAcknowledged') ? true : undefined}
                  aria-describedby={errorFor('hazardAcknowledged') ? 'hazard-error' : undefined}
                  onChange={(event) => setAcknowledged(event.target.checked)}
                />
                I have read this caution
              </label>
              {errorFor('hazardAcknowledged') && (
                <p id="hazard-error" className="font-medium text-fault-600">
                  ▲ {errorFor('hazardAcknowledged')}
                </p>
              )}
            </div>
          )}

          <TextAreaField label="Notes" value={notes} onChange={(event) => setNotes(event.target.value)} error={errorFor('notes')} hint="Optional: anything the next person should know about this unit or set-up." />
          <Button type="submit" busy={create.isPending} busyLabel="Starting…">
            Start bench session
          </Button>
          {hazardous && !acknowledged && <p className="text-[0.9375rem] text-ink-700">Tick “I have read this caution” to go on.</p>}
        </form>
      )}
    </>
  );
}

function DriveFields({
  title,
  prefix,
  drive,
  onChange,
  errorFor,
}: {
  title: string;
  prefix: string;
  drive: DriveDraft;
  onChange: (drive: DriveDraft) => void;
  errorFor: (key: string) => string | undefined;
}) {
  return (
    <fieldset className="rounded-md border border-ink-200 px-4 pt-2 pb-4">
      <legend className="px-1 font-semibold text-ink-900">{title}</legend>
      <div className="grid items-start gap-3 sm:grid-cols-[1fr_6rem_1fr]">
        <TextField
          label="AC amplitude (V)"
          aria-label={`${title} AC amplitude (V)`}
          inputMode="decimal"
          className="font-mono"
          value={drive.acVolts}
          onChange={(event) => onChange({ ...drive, acVolts: event.target.value })}
          error={errorFor(`${prefix}.acVolts`)}
          hint="Volts; 100m = 0.1 V."
        />
        <SelectField label="As" aria-label={`${title} amplitude as rms or peak`} value={drive.acConvention} onChange={(event) => onChange({ ...drive, acConvention: event.target.value as DriveDraft['acConvention'] })}>
          <option value="rms">rms</option>
          <option value="peak">peak</option>
        </SelectField>
        <TextField
          label="DC level (V)"
          aria-label={`${title} DC level (V)`}
          inputMode="decimal"
          className="font-mono"
          value={drive.dcVolts}
          onChange={(event) => onChange({ ...drive, dcVolts: event.target.value })}
          error={errorFor(`${prefix}.dcVolts`)}
        />
      </div>
    </fieldset>
  );
}
