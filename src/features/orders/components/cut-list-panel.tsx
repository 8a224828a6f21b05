import { zodResolver } from '@hookform/resolvers/zod';
import { useState } from 'react';
import { useForm } from 'react-hook-form';
import type { z } from 'zod';
import { CutListCreateSchema, type CutListCreate, type CutListResult } from '../../../../shared/schemas/cut-list';
import type { OrderDetail } from '../../../../shared/schemas/orders';
import { ORIENTATION_SUGGESTIONS } from '../../../../shared/schemas/samples';
import { Button } from '../../../components/ui/button';
import { FormAlert, TextField, useServerSubmit } from '../../../components/ui/form-field';
import { useMakeCutList } from '../api/cut-list';
import { CutListImport } from './cut-list-import';
import { CutListMade } from './cut-list-made';

type Input = z.input<typeof CutListCreateSchema>;
const FIELDS = ['specimensPerHeat', 'position', 'orientation', 'thicknessMm', 'sampleIds'] as const;

/**
 * The order's cut list: make one sample per heat and its specimens in one step, or import the
 * plan from a CSV file. Either way every row is written, or none.
 */
export function CutListPanel({ order }: { order: OrderDetail }) {
  const make = useMakeCutList(order.id);
  const [made, setMade] = useState<CutListResult | null>(null);
  const form = useForm<Input, unknown, CutListCreate>({
    resolver: zodResolver(CutListCreateSchema),
    defaultValues: { specimensPerHeat: order.specimensPerHeat, position: '', orientation: 'longitudinal', thicknessMm: '' },
  });
  const { errors } = form.formState;
  const { onSubmit, alert } = useServerSubmit(form, FIELDS, async (body) => {
    setMade(null);
    setMade(await make.mutateAsync(body));
  });
  const heats = order.heats.length;
  return (
    <div className="flex flex-col gap-6">
      <p className="rounded-md bg-straw-100 px-3 py-2 text-caption text-straw-700">
        <span aria-hidden>▲ </span>
        Halfmark records the plan; cutting and machining follow your lab’s procedures, the machine’s guarding and its safe-work rules.
      </p>
      <form onSubmit={onSubmit} noValidate aria-label="Make the cut list" className="grid gap-4 sm:grid-cols-2 lg:grid-cols-4">
        <TextField label="Specimens per heat" inputMode="numeric" error={errors.specimensPerHeat?.message} {...form.register('specimensPerHeat')} />
        <TextField label="Position on the product" placeholder="head end, mid-width" error={errors.position?.message} {...form.register('position')} />
        <TextField label="Orientation" list="orientation-suggestions" error={errors.orientation?.message} {...form.register('orientation')} />
        <TextField label="Thickness (mm)" inputMode="decimal" hint="Flat specimens keep the product’s thickness." error={errors.thicknessMm?.message} {...form.register('thicknessMm')} />
        <datalist id="orientation-suggestions">
          {ORIENTATION_SUGGESTIONS.map((o) => (
            <option key={o} value={o} />
          ))}
        </datalist>
        <div className="sm:col-span-2 lg:col-span-4">
          <FormAlert>{alert}</FormAlert>
        </div>
        <div className="flex flex-wrap items-center gap-3 sm:col-span-2 lg:col-span-4">
          <Button type="submit" busy={make.isPending} busyLabel="Registering …" disabled={heats === 0}>
            Make the cut list
          </Button>
          <span className="text-caption text-ink-500">
            {heats === 0
              ? 'Add the order’s heats first.'
              : `One new sample for each of the ${heats} heat${heats === 1 ? '' : 's'}, each with its specimens, in ${order.geometryKey}.`}
          </span>
        </div>
      </form>
      {made ? <CutListMade result={made} /> : null}
      <CutListImport orderId={order.id} />
    </div>
  );
}
