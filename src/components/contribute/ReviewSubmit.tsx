import { useId } from 'react';
import type { RecordDetail } from '#lib/client/records.ts';
import type { RecordContent } from '#lib/shared/record.ts';
import { buttonPrimary, input, muted } from '../ui.tsx';
import { DISAGREE_V } from './AnalysisPreview.tsx';
import { Cautions } from './FormSteps.tsx';

// Step 7: what the record has and lacks, and the move to the review queue.

interface Check {
  label: string;
  ok: boolean;
  /** A missing "needed" item blocks submission; a missing "recommended" one lowers the evidence level. */
  need: 'needed' | 'recommended';
  detail?: string;
}

export function checklist(
  content: RecordContent | null,
  problems: number,
  record: RecordDetail | null,
  dirty: boolean,
): Check[] {
  const c = content;
  const analyses = record?.analyses ?? [];
  const off = c
    ? analyses.filter(
        (a) =>
          a.limitV !== null &&
          c.reportedLimits[a.direction] &&
          Math.abs(a.limitV - c.reportedLimits[a.direction]!.valueV) > DISAGREE_V,
      )
    : [];
  return [
    {
      label: 'Every step’s fields are valid',
      ok: problems === 0,
      need: 'needed',
      detail: problems ? `${problems} problem${problems > 1 ? 's' : ''} to fix` : undefined,
    },
    {
      label: 'Electrolyte components named from the vocabulary',
      ok: Boolean(c && c.electrolyte.solvents.length + c.electrolyte.salts.length > 0),
      need: 'needed',
    },
    {
      label: 'Working electrode and cell',
      ok: Boolean(
        c &&
        c.workingElectrode.material &&
        (c.cellType === 'two-electrode' || c.referenceElectrode),
      ),
      need: 'needed',
    },
    {
      label: 'Reported limit(s)',
      ok: Boolean(c && (c.reportedLimits.cathodic || c.reportedLimits.anodic)),
      need: 'needed',
    },
    {
      label: 'Criterion with its threshold',
      ok: Boolean(c?.criterion),
      need: 'recommended',
      detail: 'without it the record stays “stated”',
    },
    {
      label: 'Source (publication or measurement)',
      ok: Boolean(c?.source),
      need: 'recommended',
      detail: '“documented” needs full conditions and source',
    },
    {
      label: 'Raw files attached and verified',
      ok: (record?.rawFiles.length ?? 0) > 0,
      need: 'recommended',
      detail: 'lets Edgewise recompute the limits',
    },
    {
      label: 'Computed limits within 50 mV of the reported ones',
      ok: analyses.length > 0 && off.length === 0,
      need: 'recommended',
      detail: off.length
        ? `${off.length} of ${analyses.length} disagree by more than 50 mV`
        : analyses.length
          ? undefined
          : 'no analysis yet',
    },
    {
      label: 'Saved to Edgewise',
      ok: Boolean(record) && !dirty,
      need: 'needed',
      detail: dirty ? 'unsaved changes will be saved on submit' : undefined,
    },
  ];
}

export default function ReviewSubmit({
  checks,
  status,
  changeNote,
  onChangeNote,
  onSubmit,
  busy,
}: {
  checks: Check[];
  status: string | null;
  changeNote: string;
  onChangeNote: (s: string) => void;
  onSubmit: () => void;
  busy: boolean;
}) {
  const id = useId();
  const blocking = checks.filter(
    (c) => c.need === 'needed' && !c.ok && !c.label.startsWith('Saved'),
  );
  const resubmit = status === 'changes_requested';
  return (
    <div>
      <ul className="space-y-1" aria-label="Completeness checklist" data-testid="checklist">
        {checks.map((c) => (
          <li key={c.label} className="flex gap-2 text-sm">
            <span
              aria-hidden="true"
              className={
                c.ok
                  ? 'text-cobalt dark:text-night-cobalt'
                  : c.need === 'needed'
                    ? 'text-copper dark:text-night-copper'
                    : muted
              }
            >
              {c.ok ? '✓' : c.need === 'needed' ? '✗' : '○'}
            </span>
            <span>
              <span className="sr-only">
                {c.ok ? 'done: ' : c.need === 'needed' ? 'missing: ' : 'recommended: '}
              </span>
              {c.label}
              {!c.ok && c.detail && <span className={muted}> — {c.detail}</span>}
            </span>
          </li>
        ))}
      </ul>
      <Cautions />
      {resubmit && (
        <div className="mt-4">
          <label htmlFor={id} className="block text-sm font-semibold">
            What did you change? (change note for the curator)
          </label>
          <textarea
            id={id}
            className={`${input} mt-1 w-full`}
            rows={3}
            value={changeNote}
            onChange={(e) => onChangeNote(e.target.value)}
          />
        </div>
      )}
      <div className="mt-4 flex flex-wrap items-center gap-3">
        <button
          type="button"
          className={buttonPrimary}
          disabled={busy || blocking.length > 0 || (resubmit && !changeNote.trim())}
          onClick={onSubmit}
        >
          {resubmit ? 'Send back for review' : 'Submit for review'}
        </button>
        <span className={`${muted} text-sm`}>
          A curator checks the record before it is published; you get a receipt by e-mail.
        </span>
      </div>
    </div>
  );
}
