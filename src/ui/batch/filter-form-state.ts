import { parseDateBound, type BatchFilter } from '../../review/filter.js';

export const filterFields = ['plan', 'revision', 'from', 'to'] as const;
export type FilterField = (typeof filterFields)[number];

/** The batch filter as text fields being edited. */
export interface FilterForm {
  readonly field: number;
  readonly values: Readonly<Record<FilterField, string>>;
  readonly error: string;
}

export function formFromFilter(f: BatchFilter): FilterForm {
  const day = (ms: number | undefined) => (ms === undefined ? '' : new Date(ms).toISOString());
  return { field: 0, values: { plan: f.plan ?? '', revision: f.revision ?? '', from: day(f.from), to: day(f.to) }, error: '' };
}

/** The form with the focused field's text replaced (as the text field edited it). */
export function setFieldValue(form: FilterForm, value: string): FilterForm {
  const name = filterFields[form.field] ?? 'plan';
  if (form.values[name] === value) return form;
  return { ...form, values: { ...form.values, [name]: value }, error: '' };
}

export function moveField(form: FilterForm, delta: number): FilterForm {
  return { ...form, field: (form.field + delta + filterFields.length) % filterFields.length };
}

/** The filter the form describes, or what to fix. */
export function applyForm(form: FilterForm): { ok: true; filter: BatchFilter } | { ok: false; message: string } {
  const v = form.values;
  const plan = v.plan.trim();
  const revision = v.revision.trim().toLowerCase();
  if (revision !== '' && !/^[0-9a-f]{4,64}$/.test(revision)) return { ok: false, message: 'revision: give at least 4 hex digits of the plan hash' };
  const from = v.from.trim() === '' ? undefined : parseDateBound(v.from, 'from');
  const to = v.to.trim() === '' ? undefined : parseDateBound(v.to, 'to');
  if (from === null) return { ok: false, message: 'from: write a date such as 2026-11-30 or 2026-11-30T14:00:00Z' };
  if (to === null) return { ok: false, message: 'to: write a date such as 2026-11-30 or 2026-11-30T14:00:00Z' };
  if (from !== undefined && to !== undefined && from > to) return { ok: false, message: 'from is after to; swap them' };
  return {
    ok: true,
    filter: {
      ...(plan === '' ? {} : { plan }),
      ...(revision === '' ? {} : { revision }),
      ...(from === undefined ? {} : { from }),
      ...(to === undefined ? {} : { to }),
    },
  };
}
