import { zodResolver } from '@hookform/resolvers/zod';
import { useForm } from 'react-hook-form';
import type { z } from 'zod';
import { HeatCreateSchema, type HeatCreate, type HeatView } from '../../../../shared/schemas/heats';
import { FormFooter, TextField, useServerSubmit } from '../../../components/ui/form-field';

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
  const { onSubmit, alert } = useServerSubmit(
    form,
    FIELDS,
    async (body) => {
      onSaved(await save(body));
      if (!heat) form.reset();
    },
    pathPrefix,
  );
  return (
    <form onSubmit={onSubmit} noValidate className="grid gap-4 sm:grid-cols-2" aria-label={heat ? 'Change heat' : 'New heat'}>
      <TextField label="Heat number" className="font-mono" autoCapitalize="characters" error={errors.heatNumber?.message} {...form.register('heatNumber')} />
      <TextField label="Producer" hint="The mill or moulder that made the heat." error={errors.producer?.message} {...form.register('producer')} />
      <TextField label="Material" placeholder="Carbon steel plate" error={errors.material?.message} {...form.register('material')} />
      <TextField label="Grade" placeholder="A36" error={errors.grade?.message} {...form.register('grade')} />
      <TextField label="Certificate reference" hint="The producer’s inspection certificate, if any." error={errors.certificateRef?.message} {...form.register('certificateRef')} />
      <FormFooter alert={alert} busy={form.formState.isSubmitting} submitLabel={submitLabel} onCancel={onCancel} />
    </form>
  );
}
