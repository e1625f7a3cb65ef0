import { useState, type FormEvent, type ReactNode } from 'react';
import {
  circuitResistorLabels,
  topologies,
  topologyLabels,
  topologyResistorKeys,
  type CircuitResistorKey,
  type DesignDetail,
  type Topology,
} from '../../../../shared/schemas/designs';
import { Button } from '../../../components/button';
import { SelectField, TextAreaField, TextField } from '../../../components/field';
import { FormError } from '../../../components/form-error';
import { focusFirstInvalid } from '../../../lib/focus-first-invalid';
import { formErrorsFrom } from '../../../lib/form-errors';
import { revisionName } from '../../../lib/format-revision';
import { useAddDesignRevision } from '../api/add-design-revision';
import { useCreateDesign } from '../api/create-design';
import {
  draftFromRevision,
  emptyDesignDraft,
  maskRow,
  revisionInputFromDraft,
  withoutRevisionPrefix,
  type DesignDraft,
  type OpAmpField,
} from './design-draft';

/**
 * Create a design with its first revision, or (given `design`) edit it: the form starts from the
 * latest revision and saving adds a new revision; nothing stored is changed.
 */
export function DesignForm({ design, onSaved, onCancel }: { design?: DesignDetail; onSaved: (designId: string, message: string) => void; onCancel: () => void }) {
  const create = useCreateDesign();
  const revise = useAddDesignRevision();
  const mutation = design ? revise : create;
  const latest = design?.revisions[0];
  const [name, setName] = useState('');
  const [description, setDescription] = useState('');
  const [draft, setDraft] = useState<DesignDraft>(() => (latest ? draftFromRevision(latest) : emptyDesignDraft()));
  const [clientErrors, setClientErrors] = useState<Record<string, string>>({});
  const { formMessage, fields } = formErrorsFrom(mutation.error);
  const serverErrors = withoutRevisionPrefix(fields);
  const errorFor = (key: string) => clientErrors[key] ?? serverErrors[key];

  const update = (changes: Partial<DesignDraft>) => setDraft((current) => ({ ...current, ...changes }));
  const setResistor = (resistor: CircuitResistorKey, part: 'ohms' | 'tolerancePercent', value: string) =>
    setDraft((current) => ({ ...current, resistors: { ...current.resistors, [resistor]: { ...current.resistors[resistor], [part]: value } } }));
  const setOpAmp = (field: OpAmpField, value: string) => setDraft((current) => ({ ...current, opAmp: { ...current.opAmp, [field]: value } }));
  const setMask = (key: number, part: 'frequencyHz' | 'minimumCmrrDb', value: string) =>
    setDraft((current) => ({ ...current, maskRows: current.maskRows.map((row) => (row.key === key ? { ...row, [part]: value } : row)) }));

  function handleSubmit(event: FormEvent<HTMLFormElement>) {
    event.preventDefault();
    const form = event.currentTarget;
    const { input, errors } = revisionInputFromDraft(draft);
    if (!design && name.trim() === '') errors.name = 'Design name is required';
    if (!input || Object.keys(errors).length > 0) {
      setClientErrors(errors);
      focusFirstInvalid(form);
      return;
    }
    setClientErrors({});
    if (design) {
      revise.mutate(
        { designId: design.id, input },
        {
          onSuccess: ({ revision }) => onSaved(design.id, `Saved as revision ${revision.label} (r${revision.revision}).`),
          onError: () => focusFirstInvalid(form),
        },
      );
    } else {
      create.mutate(
        { name, description, revision: input },
        {
          onSuccess: ({ design: created }) => onSaved(created.id, `${created.name} created.`),
          onError: () => focusFirstInvalid(form),
        },
      );
    }
  }

  const title = design ? `New revision of ${design.name}` : 'Create a design';
  const resistors = topologyResistorKeys[draft.topology];
  const maskMessage = errorFor('limitMask.points') ?? errorFor('limitMask');

  return (
    <section aria-label={title} className="rounded-lg border border-ink-200 bg-white p-5">
      <h2 className="text-lg font-semibold text-ink-900">{title}</h2>
      {design && latest && (
        <p className="mt-1 max-w-3xl text-[0.9375rem] text-ink-700">
          Starts from {revisionName(latest.label)} (r{latest.revision}). Saving creates a <strong className="font-semibold">new revision</strong>;{' '}
          {revisionName(latest.label)} and the bench sessions measured against it stay exactly as they are.
        </p>
      )}
      <form noValidate onSubmit={handleSubmit} className="mt-4 space-y-6" aria-label={title}>
        <FormError message={formMessage} />
        {!design && (
          <div className="grid items-start gap-4 md:grid-cols-2">
            <TextField label="Design name" value={name} onChange={(event) => setName(event.target.value)} error={errorFor('name')} hint="The board or stage, e.g. “LC-Bridge front-end HRB-204”." />
            <TextAreaField label="Description" rows={2} value={description} onChange={(event) => setDescription(event.target.value)} error={errorFor('description')} hint="Optional." />
          </div>
        )}
        <div className="grid items-start gap-4 md:grid-cols-[minmax(10rem,14rem)_1fr]">
          <TextField label="Revision label" value={draft.label} onChange={(event) => update({ label: event.target.value })} error={errorFor('label')} hint="As printed on the board, e.g. “B” or “1.2”." />
          <SelectField label="Topology" value={draft.topology} onChange={(event) => update({ topology: event.target.value as Topology })} error={errorFor('circuit.topology') ?? errorFor('circuit')}>
            {topologies.map((topology) => (
              <option key={topology} value={topology}>
                {topologyLabels[topology]}
              </option>
            ))}
          </SelectField>
        </div>

        <FormSection title="Resistors" hint="Values in ohms; you may write 10k, 4.99k or 1M. Tolerances in percent (0.1 means 0.1 %).">
          <div className="grid gap-x-6 gap-y-3 md:grid-cols-2 xl:grid-cols-4">
            {resistors.map((resistor) => (
              <div key={resistor} className="grid grid-cols-[1fr_6.5rem] gap-2">
                <TextField
                  label={`${circuitResistorLabels[resistor]} (Ω)`}
                  inputMode="decimal"
                  className="font-mono"
                  value={draft.resistors[resistor].ohms}
                  onChange={(event) => setResistor(resistor, 'ohms', event.target.value)}
                  error={errorFor(`circuit.${resistor}.ohms`)}
                />
                <TextField
                  label={`${circuitResistorLabels[resistor]} tol. (%)`}
                  aria-label={`${circuitResistorLabels[resistor]} tolerance (%)`}
                  inputMode="decimal"
                  className="font-mono"
                  value={draft.resistors[resistor].tolerancePercent}
                  onChange={(event) => setResistor(resistor, 'tolerancePercent', event.target.value)}
                  error={errorFor(`circuit.${resistor}.tolerance`)}
                />
              </div>
            ))}
          </div>
          <div className="mt-4 grid items-start gap-4 md:grid-cols-3">
            <SelectField
              label="Tolerance distribution"
              value={draft.toleranceDistribution}
              onChange={(event) => update({ toleranceDistribution: event.target.value as DesignDraft['toleranceDistribution'] })}
              hint={draft.toleranceDistribution === 'uniform' ? 'Any value within the tolerance equally likely.' : 'Tolerance taken as three standard deviations.'}
            >
              <option value="uniform">Uniform</option>
              <option value="normal">Normal</option>
            </SelectField>
            <TextField label="Source resistance Rs1 (Ω)" inputMode="decimal" className="font-mono" value={draft.sourceResistance1Ohms} onChange={(event) => update({ sourceResistance1Ohms: event.target.value })} error={errorFor('circuit.sourceResistance1Ohms')} hint="In series with the + input path." />
            <TextField label="Source resistance Rs2 (Ω)" inputMode="decimal" className="font-mono" value={draft.sourceResistance2Ohms} onChange={(event) => update({ sourceResistance2Ohms: event.target.value })} error={errorFor('circuit.sourceResistance2Ohms')} hint="In series with the − input path." />
          </div>
        </FormSection>

        <FormSection title="Op-amp (optional)" hint="Single-pole data from the datasheet. Fill in all of them, or none for an ideal op-amp.">
          <div className="grid items-start gap-4 md:grid-cols-3 xl:grid-cols-5">
            <TextField label="Part number" value={draft.opAmp.partNumber} onChange={(event) => setOpAmp('partNumber', event.target.value)} error={errorFor('circuit.opAmp.partNumber')} />
            <TextField label="A0 (dB)" inputMode="decimal" className="font-mono" value={draft.opAmp.openLoopGainDb} onChange={(event) => setOpAmp('openLoopGainDb', event.target.value)} error={errorFor('circuit.opAmp.openLoopGainDb')} />
            <TextField label="GBW (Hz)" inputMode="decimal" className="font-mono" value={draft.opAmp.gainBandwidthHz} onChange={(event) => setOpAmp('gainBandwidthHz', event.target.value)} error={errorFor('circuit.opAmp.gainBandwidthHz')} hint="e.g. 8M" />
            <TextField label="CMRR (dB)" inputMode="decimal" className="font-mono" value={draft.opAmp.cmrrDb} onChange={(event) => setOpAmp('cmrrDb', event.target.value)} error={errorFor('circuit.opAmp.cmrrDb')} />
            <TextField label="CMRR corner (Hz)" inputMode="decimal" className="font-mono" value={draft.opAmp.cmrrCornerHz} onChange={(event) => setOpAmp('cmrrCornerHz', event.target.value)} error={errorFor('circuit.opAmp.cmrrCornerHz')} />
          </div>
        </FormSection>

        <FormSection title="Limit mask" hint="Minimum CMRR the board must reach, point by point with rising frequency; straight lines on log frequency in between.">
          {maskMessage && (
            <p role="alert" className="mb-3 flex items-start gap-1.5 text-[0.9375rem] font-medium text-fault-600">
              <span aria-hidden="true">▲</span>
              {maskMessage}
            </p>
          )}
          <ol className="space-y-2">
            {draft.maskRows.map((row, index) => (
              <li key={row.key} className="grid grid-cols-[2rem_minmax(8rem,14rem)_minmax(8rem,14rem)_auto] items-start gap-3">
                <span className="tabular pt-9 text-ink-600">{index + 1}.</span>
                <TextField label="Frequency (Hz)" inputMode="decimal" className="font-mono" value={row.frequencyHz} onChange={(event) => setMask(row.key, 'frequencyHz', event.target.value)} error={errorFor(`limitMask.points.${index}.frequencyHz`)} aria-label={`Mask point ${index + 1} frequency (Hz)`} />
                <TextField label="Minimum CMRR (dB)" inputMode="decimal" className="font-mono" value={row.minimumCmrrDb} onChange={(event) => setMask(row.key, 'minimumCmrrDb', event.target.value)} error={errorFor(`limitMask.points.${index}.minimumCmrrDb`)} aria-label={`Mask point ${index + 1} minimum CMRR (dB)`} />
                <Button
                  size="sm"
                  variant="quiet"
                  className="mt-8"
                  disabled={draft.maskRows.length <= 1}
                  aria-label={`Remove mask point ${index + 1}`}
                  onClick={() => update({ maskRows: draft.maskRows.filter((candidate) => candidate.key !== row.key) })}
                >
                  Remove
                </Button>
              </li>
            ))}
          </ol>
          <div className="mt-3 flex flex-wrap items-end gap-4">
            <Button size="sm" variant="secondary" disabled={draft.maskRows.length >= 50} onClick={() => update({ maskRows: [...draft.maskRows, maskRow()] })}>
              + Add mask point
            </Button>
            <div className="w-56">
              <TextField label="Guard band (dB)" inputMode="decimal" className="font-mono" value={draft.guardBandDb} onChange={(event) => update({ guardBandDb: event.target.value })} error={errorFor('limitMask.guardBandDb')} hint="Margin for measurement uncertainty." />
            </div>
          </div>
        </FormSection>

        <TextAreaField
          label="Change note"
          rows={2}
          value={draft.changeNote}
          onChange={(event) => update({ changeNote: event.target.value })}
          error={errorFor('changeNote')}
          hint={design ? 'What changed from the previous revision, and why.' : 'Optional.'}
        />
        <div className="flex gap-2">
          <Button type="submit" busy={mutation.isPending} busyLabel="Saving…">
            {design ? 'Save as new revision' : 'Create design'}
          </Button>
          <Button variant="secondary" onClick={onCancel}>
            Cancel
          </Button>
        </div>
      </form>
    </section>
  );
}

function FormSection({ title, hint, children }: { title: string; hint: string; children: ReactNode }) {
  return (
    <fieldset className="rounded-md border border-ink-200 px-4 pt-2 pb-4">
      <legend className="px-1 font-semibold text-ink-900">{title}</legend>
      <p className="mb-3 text-[0.9375rem] text-ink-600">{hint}</p>
      {children}
    </fieldset>
  );
}
