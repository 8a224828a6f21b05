import { zodResolver } from '@hookform/resolvers/zod';
import { useForm } from 'react-hook-form';
import type { z } from 'zod';
import { EVENT_TYPES } from '../../../../shared/domain/ledger/state-machine';
import { CreateInstrumentTokenSchema, CreateStationSchema, STATION_KINDS, STATION_KIND_LABELS } from '../../../../shared/schemas/stations';
import { useCreateStation, useCreateToken } from '../api/queries';

const input = 'h-11 rounded-md border border-ink-300 px-3';

/** Code, name and kind of a new station. */
export function NewStationForm() {
  const create = useCreateStation();
  const form = useForm<z.input<typeof CreateStationSchema>, unknown, z.output<typeof CreateStationSchema>>({
    resolver: zodResolver(CreateStationSchema),
    defaultValues: { code: '', name: '', kind: 'frame' },
  });
  const { errors } = form.formState;
  const onSubmit = form.handleSubmit(async (body) => {
    await create.mutateAsync(body).then(() => form.reset()).catch(() => undefined);
  });
  return (
    <form onSubmit={onSubmit} noValidate aria-label="New station" className="grid gap-3 md:grid-cols-[10rem_1fr_12rem_auto] md:items-start">
      <label className="flex flex-col gap-1"><span className="text-caption font-semibold">Code</span><input className={`${input} font-mono uppercase`} {...form.register('code')} />{errors.code ? <span className="text-caption text-stop-700">{errors.code.message}</span> : null}</label>
      <label className="flex flex-col gap-1"><span className="text-caption font-semibold">Name</span><input className={input} {...form.register('name')} />{errors.name ? <span className="text-caption text-stop-700">{errors.name.message}</span> : null}</label>
      <label className="flex flex-col gap-1"><span className="text-caption font-semibold">Kind</span>
        <select className={input} {...form.register('kind')}>{STATION_KINDS.map((k) => <option key={k} value={k}>{STATION_KIND_LABELS[k]}</option>)}</select>
      </label>
      <button type="submit" className="h-11 self-end rounded-md bg-ink-900 px-4 font-semibold text-white">Add station</button>
      {create.error ? <p role="alert" className="text-stop-700 md:col-span-4">▲ {create.error.message}</p> : null}
    </form>
  );
}

/** Name and event types of a new instrument token; the token shows once, here. */
export function NewTokenForm({ stationId }: { stationId: number }) {
  const create = useCreateToken(stationId);
  const form = useForm<z.infer<typeof CreateInstrumentTokenSchema>>({ resolver: zodResolver(CreateInstrumentTokenSchema), defaultValues: { name: '', eventTypes: [] } });
  const { errors } = form.formState;
  const onSubmit = form.handleSubmit(async (body) => {
    await create.mutateAsync(body).then(() => form.reset()).catch(() => undefined);
  });
  return (
    <form onSubmit={onSubmit} noValidate aria-label="New instrument token" className="flex flex-col gap-3">
      <label className="flex flex-col gap-1"><span className="text-caption font-semibold">Instrument name</span><input className={input} {...form.register('name')} />{errors.name ? <span className="text-caption text-stop-700">{errors.name.message}</span> : null}</label>
      <fieldset>
        <legend className="text-caption font-semibold">Event types it may post</legend>
        <div className="mt-1 flex flex-wrap gap-x-4 gap-y-1">
          {EVENT_TYPES.map((t) => (
            <label key={t} className="flex items-center gap-1 text-body"><input type="checkbox" value={t} {...form.register('eventTypes')} /> {t.replace(/_/g, ' ')}</label>
          ))}
        </div>
        {errors.eventTypes ? <span className="text-caption text-stop-700">{errors.eventTypes.message}</span> : null}
      </fieldset>
      <button type="submit" className="h-11 self-start rounded-md bg-ink-900 px-4 font-semibold text-white">Create token</button>
      {create.error ? <p role="alert" className="text-stop-700">▲ {create.error.message}</p> : null}
      {create.data ? (
        <div role="status" className="rounded-md bg-straw-100 p-3">
          <p className="font-semibold">▲ Copy this token now: it is shown once and cannot be read again.</p>
          <code className="mt-2 block break-all font-mono" data-testid="new-token">{create.data.token}</code>
        </div>
      ) : null}
    </form>
  );
}
