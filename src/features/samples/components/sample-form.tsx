import { zodResolver } from '@hookform/resolvers/zod';
import { useForm } from 'react-hook-form';
import type { z } from 'zod';
import { ORIENTATION_SUGGESTIONS, SampleCreateSchema, type SampleCreate, type SampleView } from '../../../../shared/schemas/samples';
import { FormFooter, SelectField, TextField, useServerSubmit } from '../../../components/ui/form-field';
import { useSaveSample } from '../api/save-sample';

type Input = z.input<typeof SampleCreateSchema>;
const FIELDS = ['heatId', 'position', 'orientation', 'thicknessMm'] as const;

/**
 * Registers a sample of one of the order's heats, or changes where and how a sample was taken
 * (its order and heat stay).
 */
export function SampleForm({
  orderId,
  heats,
  sample,
  onSaved,
  onCancel,
}: {
  orderId: number;
  heats: readonly { value: number; label: string }[];
  sample?: SampleView;
  onSaved: (s: SampleView) => void;
  onCancel?: () => void;
}) {
  const save = useSaveSample(sample?.id);
  const form = useForm<Input, unknown, SampleCreate>({
    resolver: zodResolver(SampleCreateSchema),
    defaultValues: {
      orderId,
      heatId: sample?.heatId ?? (heats.length === 1 ? heats[0]!.value : ''),
      position: sample?.position ?? '',
      orientation: sample?.orientation ?? 'longitudinal',
      thicknessMm: sample?.thicknessMm ?? '',
    },
  });
  const { errors } = form.formState;
  const { onSubmit, alert } = useServerSubmit(form, FIELDS, async ({ orderId: _order, heatId: _heat, ...fields }) => {
    onSaved(await save.mutateAsync(sample ? fields : { orderId: _order, heatId: _heat, ...fields }));
    if (!sample) form.reset();
  });
  return (
    <form onSubmit={onSubmit} noValidate aria-label={sample ? 'Change sample' : 'New sample'} className="grid gap-4 sm:grid-cols-2">
      <SelectField label="Heat" placeholder="Choose a heat" options={heats} disabled={Boolean(sample)} error={errors.heatId?.message} {...form.register('heatId')} />
      <TextField label="Position on the product" placeholder="head end, mid-width" error={errors.position?.message} {...form.register('position')} />
      <TextField label="Orientation" list="sample-orientations" error={errors.orientation?.message} {...form.register('orientation')} />
      <TextField label="Thickness (mm)" inputMode="decimal" error={errors.thicknessMm?.message} {...form.register('thicknessMm')} />
      <datalist id="sample-orientations">
        {ORIENTATION_SUGGESTIONS.map((o) => (
          <option key={o} value={o} />
        ))}
      </datalist>
      <FormFooter alert={alert} busy={save.isPending} submitLabel={sample ? 'Save changes' : 'Add sample'} onCancel={onCancel} />
    </form>
  );
}
