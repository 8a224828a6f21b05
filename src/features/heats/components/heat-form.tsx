import { zodResolver } from '@hookform/resolvers/zod';
import { useState } from 'react';
import { useForm } from 'react-hook-form';
import type { z } from 'zod';
import { HeatCreateSchema, type HeatCreate, type HeatView } from '../../../../shared/schemas/heats';
import { Button } from '../../../components/ui/button';
import { FormAlert, showServerErrors, TextField } from '../../../components/ui/form-field';
import { ApiError } from '../../../lib/api-client';

type Input = z.input<typeof HeatCreateSchema>;
const FIELDS = ['heatNumber', 'material', 'grade', 'producer', 'certificateRef'] as const;

/**
 * A heat's fields. `save` does the work (register, change, or register and add to an order);
 * `pathPrefix` strips the prefix a server puts before the fields (e.g. "heat." when the heat is
 * nested in an order's request), so its errors land beside these fields.
 */
export function HeatForm({
  heat,
  save,
  onSaved,
  onCancel,
  submitLabel,
  pathPrefix = '',
}: {
  heat?: HeatView;
  save: (body: HeatCreate) => Promise<HeatView>;
  onSaved: (h: HeatView) => void;
  onCancel?: () => void;
  submitLabel: string;
  pathPrefix?: string;
}) {
  const [alert, setAlert] = useState<string | null>(null);
  const form = useForm<Input, unknown, HeatCreate>({
    resolver: zodResolver(HeatCreateSchema),
    defaultValues: {
      heatNumber: heat?.heatNumber ?? '',
      material: heat?.material ?? '',
      grade: heat?.grade ?? '',
      producer: heat?.producer ?? '',
      certificateRef: heat?.certificateRef ?? '',
    },
  });
  const { errors } = form.formState;
  const onSubmit = form.handleSubmit(async (body) => {
    setAlert(null);
    try {
      onSaved(await save(body));
      if (!heat) form.reset();
    } catch (err) {
      const stripped =
        err instanceof ApiError && pathPrefix
          ? new ApiError(err.status, err.code, err.message, err.fieldIssues().map((i) => ({ ...i, path: i.path.startsWith(pathPrefix) ? i.path.slice(pathPrefix.length) : i.path })))
          : err;
      setAlert(showServerErrors(form, stripped, FIELDS));
    }
  });
  return (
    <form onSubmit={onSubmit} noValidate className="grid gap-4 sm:grid-cols-2" aria-label={heat ? 'Change heat' : 'New heat'}>
      <TextField label="Heat number" className="font-mono" autoCapitalize="characters" error={errors.heatNumber?.message} {...form.register('heatNumber')} />
      <TextField label="Producer" hint="The mill or moulder that made the heat." error={errors.producer?.message} {...form.register('producer')} />
      <TextField label="Material" placeholder="Carbon steel plate" error={errors.material?.message} {...form.register('material')} />
      <TextField label="Grade" placeholder="A36" error={errors.grade?.message} {...form.register('grade')} />
      <TextField label="Certificate reference" hint="The producer’s inspection certificate, if any." error={errors.certificateRef?.message} {...form.register('certificateRef')} />
      <div className="sm:col-span-2">
        <FormAlert>{alert}</FormAlert>
      </div>
      <div className="flex gap-2 sm:col-span-2">
        <Button type="submit" busy={form.formState.isSubmitting} busyLabel="Saving …">
          {submitLabel}
        </Button>
        {onCancel ? (
          <Button variant="ghost" onClick={onCancel}>
            Cancel
          </Button>
        ) : null}
      </div>
    </form>
  );
}
