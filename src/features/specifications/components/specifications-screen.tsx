import { useQuery } from '@tanstack/react-query';
import { useState } from 'react';
import { LIMIT_PROPERTIES, LIMIT_PROPERTY_NAME, SpecificationInputSchema, type LimitProperty } from '../../../../shared/domain/tensile/specifications';
import { PageHeader } from '../../../components/ui/page-header';
import { ApiError } from '../../../lib/api-client';
import { specificationQueries, useAddSpecification } from '../api/queries';

const CONTROL = 'h-10 w-full rounded-md border border-ink-300 bg-white px-3 text-body';

interface LimitRow {
  property: LimitProperty;
  min: string;
  max: string;
  comparisonIncrement: string;
  thicknessFrom: string;
  thicknessUpTo: string;
  gaugeLength: string;
}

const blankLimit = (): LimitRow => ({ property: 'tensileStrength', min: '', max: '', comparisonIncrement: '1', thicknessFrom: '', thicknessUpTo: '', gaugeLength: '' });

/** The form a lab manager adds a specification with; checked by the same schema as the server. */
function AddSpecificationForm() {
  const [head, setHead] = useState({ key: '', designation: '', grade: '', strengthUnit: 'MPa', yieldMeasure: 'upper-or-offset', source: '', notes: '' });
  const [limits, setLimits] = useState<LimitRow[]>([blankLimit()]);
  const [issues, setIssues] = useState<{ path: string; message: string }[]>([]);
  const add = useAddSpecification();
  const opt = (v: string) => (v.trim() === '' ? undefined : v.trim());
  const issueAt = (path: string) => issues.find((i) => i.path === path)?.message;

  function submit() {
    const body = {
      ...head,
      notes: opt(head.notes),
      limits: limits.map((l) => ({
        property: l.property,
        min: opt(l.min),
        max: opt(l.max),
        comparisonIncrement: l.comparisonIncrement.trim(),
        ...(opt(l.thicknessFrom) || opt(l.thicknessUpTo) ? { thickness: { unit: 'mm', from: opt(l.thicknessFrom), upTo: opt(l.thicknessUpTo) } } : {}),
        ...(opt(l.gaugeLength) ? { gaugeLength: { value: l.gaugeLength.trim(), unit: 'mm' } } : {}),
      })),
    };
    const checked = SpecificationInputSchema.safeParse(body);
    if (!checked.success) {
      setIssues(checked.error.issues.map((i) => ({ path: i.path.join('.'), message: i.message })));
      return;
    }
    setIssues([]);
    add.mutate(checked.data, {
      onError: (e) => e instanceof ApiError && setIssues(e.fieldIssues()),
      onSuccess: () => {
        setHead({ key: '', designation: '', grade: '', strengthUnit: 'MPa', yieldMeasure: 'upper-or-offset', source: '', notes: '' });
        setLimits([blankLimit()]);
      },
    });
  }

  const headField = (key: keyof typeof head, label: string) => (
    <label className="block text-caption font-semibold text-ink-700">
      {label}
      <input className={CONTROL} value={head[key]} onChange={(e) => setHead({ ...head, [key]: e.target.value })} aria-invalid={issueAt(key) ? true : undefined} />
      {issueAt(key) ? <span className="block text-stop-700">{issueAt(key)}</span> : null}
    </label>
  );
  const limitField = (i: number, key: Exclude<keyof LimitRow, 'property'>, label: string) => (
    <label className="block text-caption font-semibold text-ink-700">
      {label}
      <input className={CONTROL} inputMode="decimal" value={limits[i]?.[key] ?? ''} onChange={(e) => setLimits(limits.map((l, j) => (j === i ? { ...l, [key]: e.target.value } : l)))} />
      {issueAt(`limits.${i}.${key}`) ? <span className="block text-stop-700">{issueAt(`limits.${i}.${key}`)}</span> : null}
    </label>
  );

  return (
    <section className="rounded-lg border border-ink-200 bg-white p-4" aria-labelledby="add-spec">
      <h2 id="add-spec" className="text-lead font-semibold">Add a specification</h2>
      <p className="mt-1 text-caption text-ink-500">Copy each limit from your own copy of the standard, and say where you read it.</p>
      <div className="mt-3 grid gap-3 sm:grid-cols-3">
        {headField('key', 'Key (e.g. en10025-2-s275jr)')}
        {headField('designation', 'Standard')}
        {headField('grade', 'Grade')}
        <label className="block text-caption font-semibold text-ink-700">
          Strength unit
          <select className={CONTROL} value={head.strengthUnit} onChange={(e) => setHead({ ...head, strengthUnit: e.target.value })}>
            <option>MPa</option>
            <option>ksi</option>
          </select>
        </label>
        <label className="block text-caption font-semibold text-ink-700">
          Yield limit applies to
          <select className={CONTROL} value={head.yieldMeasure} onChange={(e) => setHead({ ...head, yieldMeasure: e.target.value })}>
            <option value="upper-or-offset">ReH where there is a yield drop, else Rp0.2</option>
            <option value="offset">Rp0.2 always</option>
          </select>
        </label>
        {headField('source', 'Source (standard, edition, table)')}
      </div>
      {limits.map((_, i) => (
        <fieldset key={i} className="mt-3 grid gap-2 rounded-md border border-ink-200 p-3 sm:grid-cols-4">
          <legend className="px-1 text-caption font-semibold">Limit {i + 1}</legend>
          <label className="block text-caption font-semibold text-ink-700">
            Property
            <select className={CONTROL} value={limits[i]?.property} onChange={(e) => setLimits(limits.map((l, j) => (j === i ? { ...l, property: e.target.value as LimitProperty } : l)))}>
              {LIMIT_PROPERTIES.map((p) => <option key={p} value={p}>{LIMIT_PROPERTY_NAME[p]}</option>)}
            </select>
          </label>
          {limitField(i, 'min', 'Minimum')}
          {limitField(i, 'max', 'Maximum')}
          {limitField(i, 'comparisonIncrement', 'Round to before comparing')}
          {limitField(i, 'thicknessFrom', 'Thickness from (mm)')}
          {limitField(i, 'thicknessUpTo', 'Thickness up to (mm)')}
          {limitField(i, 'gaugeLength', 'Gauge length (mm, elongation)')}
        </fieldset>
      ))}
      {issueAt('limits') ? <p className="text-stop-700">{issueAt('limits')}</p> : null}
      {add.error && !(add.error instanceof ApiError && add.error.fieldIssues().length > 0) ? <p className="mt-2 text-stop-700" role="alert">⚠ {add.error.message}</p> : null}
      {add.data ? <p className="mt-2 text-good-700" role="status">✓ {add.data.designation} {add.data.grade} added.</p> : null}
      <div className="mt-3 flex gap-2">
        <button type="button" className="h-10 rounded-md px-4 ring-1 ring-ink-300" onClick={() => setLimits([...limits, blankLimit()])}>Add a limit</button>
        <button type="button" className="h-10 rounded-md bg-ink-900 px-4 font-semibold text-white disabled:bg-ink-400" disabled={add.isPending} onClick={submit}>Save specification</button>
      </div>
    </section>
  );
}

/** Every specification with its limits and source; lab managers may add one. */
export function SpecificationsScreen() {
  const { data, error, isPending } = useQuery(specificationQueries.list());
  if (isPending) return <p className="text-body text-ink-500">Loading specifications…</p>;
  if (error || !data) return <p className="text-stop-700" role="alert">⚠ {error?.message}</p>;
  return (
    <div className="space-y-5">
      <PageHeader title="Specifications" subtitle="Limits results are judged against, each with where it was read. Confirm every row against your own copy of the standard." />
      {data.items.map((s) => (
        <section key={s.key} className="rounded-lg border border-ink-200 bg-white p-4 text-body">
          <h2 className="font-semibold">
            {s.designation} {s.grade} <span className="font-mono text-caption text-ink-500">{s.key}</span>
          </h2>
          <p className="text-caption text-ink-500">{s.source}{s.builtIn ? '' : ` · added by ${s.createdBy ?? '?'}`}</p>
          <ul className="mt-1 text-caption">
            {s.limits.map((l, i) => (
              <li key={i}>
                {LIMIT_PROPERTY_NAME[l.property]}: {l.min ? `≥ ${l.min}` : ''}{l.min && l.max ? ' and ' : ''}{l.max ? `≤ ${l.max}` : ''} {l.property === 'elongation' || l.property === 'reductionOfArea' ? '%' : s.strengthUnit}
                {l.thickness ? ` · thickness ${l.thickness.over ? `over ${l.thickness.over}` : l.thickness.from ? `from ${l.thickness.from}` : ''} ${l.thickness.upTo ? `up to ${l.thickness.upTo}` : ''} ${l.thickness.unit}` : ''}
                {l.gaugeLength ? ` · in ${l.gaugeLength.value} ${l.gaugeLength.unit}` : ''}
              </li>
            ))}
          </ul>
        </section>
      ))}
      {data.canWrite ? <AddSpecificationForm /> : null}
    </div>
  );
}
