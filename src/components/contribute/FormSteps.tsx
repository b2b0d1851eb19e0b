import { useQuery } from '@tanstack/react-query';
import { useFieldArray, useFormContext, useWatch } from 'react-hook-form';
import { shortName, vocabularyQueries } from '#lib/client/records.ts';
import { CAUTION_AUTHORITY, GAS_CAUTION, cautionsFor } from '#lib/shared/cautions.ts';
import {
  CONCENTRATION_BASES,
  DOI_PATTERN,
  ELECTRODE_FORMS,
  FRACTION_BASES,
  LICENCES,
} from '#lib/shared/record.ts';
import { buttonQuiet, muted } from '../ui.tsx';
import { Choice, Field, FieldFoot, Group } from './fields.tsx';
import type { FormValues } from './form-model.ts';
import TermInput from './TermInput.tsx';

// Steps 1–4 of the contribute form: the electrolyte, the electrode and cell, the method with its
// criterion and the reported limits, and the source with licence and visibility.

/** Safety reminders for the chosen materials (docs/methods.md §9), deferring to local rules. */
export function Cautions() {
  const v = useWatch<FormValues>() as FormValues;
  const ids = [
    ...(v.electrolyte?.solvents ?? []).map((x) => x.term),
    ...(v.electrolyte?.salts ?? []).map((x) => x.term),
    ...(v.electrolyte?.additives ?? []).map((x) => x.term),
    v.workingElectrode?.material,
    v.counterElectrode?.material,
    v.referenceElectrode,
  ].filter((x): x is string => Boolean(x));
  const found = cautionsFor(ids);
  if (!found.length) return null;
  return (
    <aside
      className="mt-6 rounded-md border border-copper/50 bg-copper-soft/50 dark:bg-copper/15 p-3 text-sm"
      aria-label="Safety cautions"
      data-testid="cautions"
    >
      <p className="font-semibold">Safety cautions for these materials</p>
      <ul className="mt-1 list-disc pl-5">
        {found.map((c) => (
          <li key={c.id}>{c.text}</li>
        ))}
        <li>{GAS_CAUTION}</li>
      </ul>
      <p className="mt-1">{CAUTION_AUTHORITY}</p>
    </aside>
  );
}

export function StepElectrolyte() {
  const { control } = useFormContext<FormValues>();
  const solvents = useFieldArray({ control, name: 'electrolyte.solvents' });
  const salts = useFieldArray({ control, name: 'electrolyte.salts' });
  const additives = useFieldArray({ control, name: 'electrolyte.additives' });
  return (
    <>
      <Group title="Record">
        <Field
          path="title"
          label="Title (optional)"
          className="sm:col-span-2"
          placeholder="e.g. 1 M LiPF6 in PC on glassy carbon"
        />
      </Group>
      <Group title="Solvents" note="Fractions of the solvent mixture add up to 1.">
        {solvents.fields.map((f, i) => (
          <div
            key={f.id}
            className="grid gap-2 sm:col-span-2 lg:col-span-3 sm:grid-cols-[2fr_1fr_1fr_auto] items-end"
          >
            <TermInput
              path={`electrolyte.solvents.${i}.term`}
              title={`Solvent ${i + 1}`}
              kinds={['solvent']}
            />
            <Field path={`electrolyte.solvents.${i}.fraction`} label="Fraction" type="number" />
            <Choice
              path={`electrolyte.solvents.${i}.fractionBasis`}
              label="by"
              options={FRACTION_BASES}
            />
            <button
              type="button"
              className={buttonQuiet}
              onClick={() => solvents.remove(i)}
              aria-label={`Remove solvent ${i + 1}`}
            >
              Remove
            </button>
          </div>
        ))}
        <div className="sm:col-span-2 lg:col-span-3">
          <button
            type="button"
            className={buttonQuiet}
            onClick={() =>
              solvents.append({ term: '', fraction: undefined, fractionBasis: 'volume' })
            }
          >
            Add a solvent
          </button>
          <FieldFoot path="electrolyte.solvents" id="solvents" exact />
        </div>
      </Group>
      <Group title="Salts">
        {salts.fields.map((f, i) => (
          <div
            key={f.id}
            className="grid gap-2 sm:col-span-2 lg:col-span-3 sm:grid-cols-[2fr_1fr_1fr_auto] items-end"
          >
            <TermInput
              path={`electrolyte.salts.${i}.term`}
              title={`Salt ${i + 1}`}
              kinds={['salt']}
            />
            <Field
              path={`electrolyte.salts.${i}.concentration.value`}
              label="Concentration"
              type="number"
            />
            <Choice
              path={`electrolyte.salts.${i}.concentration.basis`}
              label="Basis"
              options={CONCENTRATION_BASES}
            />
            <button
              type="button"
              className={buttonQuiet}
              onClick={() => salts.remove(i)}
              aria-label={`Remove salt ${i + 1}`}
            >
              Remove
            </button>
          </div>
        ))}
        <div className="sm:col-span-2 lg:col-span-3">
          <button
            type="button"
            className={buttonQuiet}
            onClick={() =>
              salts.append({ term: '', concentration: { value: undefined, basis: 'mol/L' } })
            }
          >
            Add a salt
          </button>
        </div>
      </Group>
      <Group title="Additives">
        {additives.fields.map((f, i) => (
          <div key={f.id} className="grid gap-2 sm:col-span-2 sm:grid-cols-[1fr_auto] items-end">
            <TermInput
              path={`electrolyte.additives.${i}.term`}
              title={`Additive ${i + 1}`}
              kinds={['additive', 'salt', 'solvent']}
            />
            <button
              type="button"
              className={buttonQuiet}
              onClick={() => additives.remove(i)}
              aria-label={`Remove additive ${i + 1}`}
            >
              Remove
            </button>
          </div>
        ))}
        <div className="sm:col-span-2 lg:col-span-3">
          <button
            type="button"
            className={buttonQuiet}
            onClick={() => additives.append({ term: '' })}
          >
            Add an additive
          </button>
        </div>
      </Group>
      <Group title="Conditions">
        <Field path="electrolyte.waterContentPpm" label="Water content" unit="ppm" type="number" />
        <Field
          path="electrolyte.pH"
          label="pH"
          type="number"
          hint="Aqueous electrolytes; needed for the RHE scale."
        />
        <Field path="temperatureC" label="Temperature" unit="°C" type="number" />
      </Group>
      <Cautions />
    </>
  );
}

export function StepCell() {
  const cellType = useWatch<FormValues, 'cellType'>({ name: 'cellType' });
  return (
    <>
      <Group title="Working electrode">
        <TermInput
          path="workingElectrode.material"
          title="Material"
          kinds={['electrode-material']}
        />
        <Choice
          path="workingElectrode.form"
          label="Form"
          options={[['', '—'], ...ELECTRODE_FORMS.map((f) => [f, f] as [string, string])]}
        />
        <Field
          path="workingElectrode.geometricAreaCm2"
          label="Geometric area"
          unit="cm²"
          type="number"
        />
        <Field
          path="workingElectrode.activeMassMg"
          label="Active mass"
          unit="mg"
          type="number"
          hint="Composite electrodes: the active material, binder excluded."
        />
      </Group>
      <Group title="Cell">
        <Choice
          path="cellType"
          label="Cell type"
          options={[
            ['three-electrode', 'three-electrode (electrode potential)'],
            ['two-electrode', 'two-electrode (cell voltage)'],
          ]}
        />
        <TermInput
          path="counterElectrode.material"
          title="Counter electrode"
          kinds={['electrode-material']}
        />
        {cellType === 'three-electrode' ? (
          <TermInput
            path="referenceElectrode"
            title="Reference electrode"
            kinds={['reference-electrode']}
          />
        ) : (
          <p className={`${muted} text-sm sm:col-span-2`} data-testid="cell-voltage-note">
            A two-electrode cell gives a <strong>cell-voltage window</strong>: its limits are cell
            voltages (reference “cell”), never mixed with electrode potentials.
          </p>
        )}
      </Group>
      <Cautions />
    </>
  );
}

const CRITERIA: Record<FormValues['method']['kind'], [string, string][]> = {
  'cv-window-opening': [
    ['s-value', 'S-value ≤ x'],
    ['ce', 'coulombic efficiency ≥ x %'],
    ['j-area', 'current density ≤ x µA cm⁻²'],
    ['j-mass', 'current per mass ≤ x mA g⁻¹'],
  ],
  lsv: [
    ['j-area', 'current density ≤ x µA cm⁻²'],
    ['j-mass', 'current per mass ≤ x mA g⁻¹'],
  ],
  'potentiostatic-holds': [
    ['hold-leakage', 'end-of-hold leakage ≤ x'],
    ['j-area', 'current density ≤ x µA cm⁻²'],
    ['j-mass', 'current per mass ≤ x mA g⁻¹'],
  ],
};

export function StepMethod() {
  const { setValue, getValues } = useFormContext<FormValues>();
  const method = useWatch<FormValues, 'method.kind'>({ name: 'method.kind' });
  const criterion = useWatch<FormValues, 'criterion.kind'>({ name: 'criterion.kind' });
  const cellType = useWatch<FormValues, 'cellType'>({ name: 'cellType' });
  const reference = useWatch<FormValues, 'referenceElectrode'>({ name: 'referenceElectrode' });
  const onMethod = (kind: FormValues['method']['kind']) => {
    const allowed = CRITERIA[kind].map(([k]) => k);
    if (getValues('criterion.kind') && !allowed.includes(getValues('criterion.kind'))) {
      setValue('criterion.kind', allowed[0] as FormValues['criterion']['kind']);
      setValue('criterion.threshold', undefined);
    }
  };
  const { register } = useFormContext<FormValues>();
  const vocab = useQuery(vocabularyQueries.all());
  const refName = reference
    ? shortName(new Map((vocab.data ?? []).map((t) => [t.id, t])), reference)
    : 'the reference electrode';
  const scale = cellType === 'two-electrode' ? 'cell voltage' : `vs ${refName}`;
  return (
    <>
      <Group title="Method">
        <div>
          <label htmlFor="method-kind" className="block text-sm font-semibold">
            Method
          </label>
          <select
            id="method-kind"
            className="mt-1 w-full rounded-md border border-rule dark:border-night-rule bg-panel dark:bg-night-panel px-2 py-1.5"
            {...register('method.kind', { onChange: (e) => onMethod(e.target.value) })}
          >
            <option value="cv-window-opening">CV window opening</option>
            <option value="lsv">linear sweep (LSV)</option>
            <option value="potentiostatic-holds">potentiostatic holds</option>
          </select>
        </div>
        {method !== 'potentiostatic-holds' && (
          <Field path="method.scanRateMVs" label="Scan rate" unit="mV s⁻¹" type="number" />
        )}
        {method === 'cv-window-opening' && (
          <Field path="method.vertexStepMV" label="Vertex step" unit="mV" type="number" />
        )}
        {method === 'potentiostatic-holds' && (
          <Field path="method.stepMV" label="Potential step" unit="mV" type="number" />
        )}
        {method === 'potentiostatic-holds' && (
          <Field path="method.holdTimeS" label="Hold time" unit="s" type="number" />
        )}
      </Group>
      <Group
        title="Criterion"
        note="How the limit was decided. The cutoff is always stored: a tenfold change moves the limit by a Tafel slope."
      >
        <Choice
          path="criterion.kind"
          label="Criterion"
          options={[['', 'not stated'], ...CRITERIA[method]]}
        />
        {criterion && (
          <Field
            path="criterion.threshold"
            label="Threshold"
            type="number"
            unit={
              criterion === 's-value'
                ? 'S'
                : criterion === 'ce'
                  ? '%'
                  : criterion === 'j-area'
                    ? 'µA cm⁻²'
                    : criterion === 'j-mass'
                      ? 'mA g⁻¹'
                      : undefined
            }
          />
        )}
        {criterion === 'hold-leakage' && (
          <Choice
            path="criterion.per"
            label="Leakage per"
            options={[
              ['mass', 'active mass (mA g⁻¹)'],
              ['area', 'geometric area (µA cm⁻²)'],
            ]}
          />
        )}
      </Group>
      <Group
        title="Reported limits"
        note={`As stated by you or the source, in volts (${scale}). Give one or both.`}
      >
        <Field
          path="reportedLimits.cathodic.valueV"
          label="Cathodic limit"
          unit="V"
          type="number"
        />
        <Field path="reportedLimits.anodic.valueV" label="Anodic limit" unit="V" type="number" />
        <div className="sm:col-span-2 lg:col-span-3">
          <FieldFoot path="reportedLimits" id="limits" exact />
        </div>
      </Group>
    </>
  );
}

export function StepSource({
  labs,
  hasLab,
}: {
  labs: { slug: string; name: string }[];
  hasLab: boolean;
}) {
  const { control } = useFormContext<FormValues>();
  const kind = useWatch<FormValues, 'source.kind'>({ name: 'source.kind' });
  const visibility = useWatch<FormValues, 'visibility'>({ name: 'visibility' });
  const doi = useWatch<FormValues, 'source.doi'>({ name: 'source.doi' });
  const authors = useFieldArray({ control, name: 'source.authors' });
  const doiOk = !doi?.trim() || DOI_PATTERN.test(doi.trim());
  return (
    <>
      <Group title="Source">
        <Choice
          path="source.kind"
          label="Where the numbers come from"
          options={[
            ['published', 'a publication'],
            ['unpublished', 'an unpublished measurement'],
            ['', 'not stated'],
          ]}
        />
      </Group>
      {kind === 'published' && (
        <Group title="Publication" note="Typed by hand; Edgewise looks nothing up elsewhere.">
          <div>
            <Field path="source.doi" label="DOI" placeholder="10.5555/…" />
            <p
              className={`mt-1 text-xs ${doiOk ? muted : 'text-copper dark:text-night-copper'}`}
              role="status"
            >
              {doi?.trim()
                ? doiOk
                  ? 'DOI syntax looks right.'
                  : 'Not DOI syntax: 10.NNNN/suffix, without “https://doi.org/”.'
                : 'Optional.'}
            </p>
          </div>
          <Field path="source.title" label="Title" className="sm:col-span-2" />
          <Field path="source.containerTitle" label="Journal or book" />
          <Field path="source.year" label="Year" type="number" />
          <Field path="source.volume" label="Volume" />
          <Field path="source.pages" label="Pages" />
          <div className="sm:col-span-2 lg:col-span-3">
            <p className="text-sm font-semibold">Authors</p>
            {authors.fields.map((f, i) => (
              <div key={f.id} className="mt-2 grid gap-2 sm:grid-cols-[1fr_1fr_auto] items-end">
                <Field path={`source.authors.${i}.family`} label={`Family name ${i + 1}`} />
                <Field path={`source.authors.${i}.given`} label={`Given names ${i + 1}`} />
                <button
                  type="button"
                  className={buttonQuiet}
                  onClick={() => authors.remove(i)}
                  aria-label={`Remove author ${i + 1}`}
                >
                  Remove
                </button>
              </div>
            ))}
            <button
              type="button"
              className={`${buttonQuiet} mt-2`}
              onClick={() => authors.append({ family: '', given: '' })}
            >
              Add an author
            </button>
            <FieldFoot path="source.authors" id="authors" exact />
          </div>
        </Group>
      )}
      {kind === 'unpublished' && (
        <Group title="Unpublished measurement">
          <Field path="source.measuredBy" label="Measured by (lab or people)" />
          <Field path="source.measuredOn" label="Measured on" type="date" />
          <Field path="source.note" label="Note" className="sm:col-span-2 lg:col-span-3" />
        </Group>
      )}
      <Group title="Licence and visibility">
        <Choice
          path="licence"
          label="Licence"
          options={LICENCES}
          hint="CC-BY-4.0 unless your data need another."
        />
        <Choice
          path="visibility"
          label="Visibility"
          options={[
            ['public', 'public once published'],
            ['lab', 'private to the lab'],
          ]}
          hint={
            hasLab
              ? undefined
              : labs.length
                ? 'Lab-private records belong to a lab: choose it above before the first save.'
                : 'You are not a member of a lab, so records are public.'
          }
        />
        {visibility === 'lab' && (
          <Field
            path="embargoUntil"
            label="Embargo until"
            type="date"
            hint="The record becomes readable by everyone on this date."
          />
        )}
        <Field path="notes" label="Notes" className="sm:col-span-2 lg:col-span-3" />
      </Group>
    </>
  );
}
