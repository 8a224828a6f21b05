import { zodResolver } from '@hookform/resolvers/zod';
import { useForm } from 'react-hook-form';
import type { z } from 'zod';
import { AREA_POLICIES } from '../../../../shared/domain/measurement';
import { getGeometry, SPECIMEN_GEOMETRIES } from '../../../../shared/domain/specimen-geometries';
import {
  ORDER_STATUS_LABELS,
  ORDER_STATUSES,
  OrderUpdateSchema,
  RETENTION_BASES,
  TEST_LABELS,
  TESTS,
  type OrderView,
} from '../../../../shared/schemas/orders';
import { Field, FormFooter, SelectField, TextField, useServerSubmit } from '../../../components/ui/form-field';
import { useSaveOrder } from '../api/save-order';

const AREA_LABELS: Record<(typeof AREA_POLICIES)[number], string> = {
  'min-dimensions': 'Least width × least thickness',
  'least-section': 'Least of the measured sections',
  'mean-section': 'Mean of the measured sections',
};

// One schema for both forms: it holds every field the form shows; a new order's status is "open"
// whatever the form says, because the create route does not take a status.
const EditSchema = OrderUpdateSchema.required({
  number: true,
  customerId: true,
  poReference: true,
  materialSpec: true,
  testsRequested: true,
  specimensPerHeat: true,
  geometryKey: true,
  testStandard: true,
  areaPolicy: true,
  retentionBasis: true,
  status: true,
});
type Input = z.input<typeof EditSchema>;
type Output = z.output<typeof EditSchema>;
const FIELDS = ['number', 'customerId', 'poReference', 'materialSpec', 'testsRequested', 'specimensPerHeat', 'geometryKey', 'testStandard', 'areaPolicy', 'retentionDays', 'retentionBasis', 'dueDate', 'status'] as const;

/**
 * Creates an order, or changes one when `order` is given. The customers to choose from come from
 * the screen, which loads them.
 */
export function OrderForm({
  order,
  customers,
  onSaved,
  onCancel,
}: {
  order?: OrderView;
  customers: readonly { value: number; label: string }[];
  onSaved: (o: OrderView) => void;
  onCancel?: () => void;
}) {
  const save = useSaveOrder(order?.id);
  const form = useForm<Input, unknown, Output>({
    resolver: zodResolver(EditSchema),
    defaultValues: {
      number: order?.number ?? '',
      customerId: order?.customerId ?? '',
      poReference: order?.poReference ?? '',
      materialSpec: order?.materialSpec ?? '',
      testsRequested: (order?.testsRequested as Input['testsRequested']) ?? ['tensile'],
      specimensPerHeat: order?.specimensPerHeat ?? 2,
      geometryKey: order?.geometryKey ?? 'astm-e8-flat-sheet-12.5',
      testStandard: order?.testStandard ?? 'ASTM E8/E8M',
      areaPolicy: (order?.areaPolicy as Input['areaPolicy']) ?? 'min-dimensions',
      retentionDays: order?.retentionDays ?? '',
      retentionBasis: (order?.retentionBasis as Input['retentionBasis']) ?? 'report',
      dueDate: order?.dueDate ?? '',
      status: order?.status ?? 'open',
    },
  });
  const { errors } = form.formState;
  const geometry = getGeometry(String(form.watch('geometryKey') ?? ''));
  const { onSubmit, alert } = useServerSubmit(form, FIELDS, async (body) => onSaved(await save.mutateAsync(body)));
  const geometryField = form.register('geometryKey');
  return (
    <form onSubmit={onSubmit} noValidate className="grid gap-4 sm:grid-cols-2 lg:grid-cols-3" aria-label={order ? 'Change order' : 'New order'}>
      <TextField label="Order number" className="font-mono" hint="The lab’s own number, e.g. LM-26-0104." error={errors.number?.message} {...form.register('number')} />
      <SelectField label="Customer" placeholder="Choose a customer" options={customers} error={errors.customerId?.message} {...form.register('customerId')} />
      <TextField label="Purchase order" error={errors.poReference?.message} {...form.register('poReference')} />
      <TextField label="Material specification" placeholder="ASTM A36" error={errors.materialSpec?.message} {...form.register('materialSpec')} />
      <Field label="Tests asked for" error={errors.testsRequested?.message}>
        {({ describedBy }) => (
          <div className="flex flex-wrap gap-3 py-2" aria-describedby={describedBy} role="group">
            {TESTS.map((test) => (
              <label key={test} className="inline-flex items-center gap-1.5 text-body">
                <input type="checkbox" value={test} className="size-4" {...form.register('testsRequested')} />
                {TEST_LABELS[test]}
              </label>
            ))}
          </div>
        )}
      </Field>
      <TextField label="Specimens per heat" inputMode="numeric" error={errors.specimensPerHeat?.message} {...form.register('specimensPerHeat')} />
      <SelectField
        label="Specimen geometry"
        options={SPECIMEN_GEOMETRIES.map((g) => ({ value: g.key, label: `${g.standard} · ${g.label}` }))}
        hint={geometry ? `Source: ${geometry.standard}, ${geometry.source}.` : undefined}
        error={errors.geometryKey?.message}
        className="sm:col-span-2"
        {...geometryField}
        onChange={(e) => {
          void geometryField.onChange(e);
          const picked = getGeometry(e.target.value);
          if (picked && !form.getFieldState('testStandard').isDirty) form.setValue('testStandard', picked.standard);
        }}
      />
      <TextField label="Test standard" error={errors.testStandard?.message} {...form.register('testStandard')} />
      <SelectField
        label="Cross-section area"
        options={AREA_POLICIES.map((p) => ({ value: p, label: AREA_LABELS[p] }))}
        hint="How S0 is taken from three readings of each dimension."
        error={errors.areaPolicy?.message}
        {...form.register('areaPolicy')}
      />
      <TextField label="Retention (days)" inputMode="numeric" hint="Empty: the customer’s rule." error={errors.retentionDays?.message} {...form.register('retentionDays')} />
      <SelectField
        label="Retention counts from"
        options={RETENTION_BASES.map((b) => ({ value: b, label: b === 'report' ? 'The report' : 'The test' }))}
        error={errors.retentionBasis?.message}
        {...form.register('retentionBasis')}
      />
      <TextField label="Due date" type="date" error={errors.dueDate?.message} {...form.register('dueDate')} />
      {order ? (
        <SelectField label="Status" options={ORDER_STATUSES.map((s) => ({ value: s, label: ORDER_STATUS_LABELS[s] }))} error={errors.status?.message} {...form.register('status')} />
      ) : null}
      <FormFooter alert={alert} busy={save.isPending} submitLabel={order ? 'Save changes' : 'Create order'} onCancel={onCancel} span="sm:col-span-2 lg:col-span-3" />
    </form>
  );
}
