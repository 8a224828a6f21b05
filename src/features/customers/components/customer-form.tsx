import { zodResolver } from '@hookform/resolvers/zod';
import { useForm } from 'react-hook-form';
import type { z } from 'zod';
import { CustomerCreateSchema, type CustomerCreate, type CustomerView } from '../../../../shared/schemas/customers';
import { FormFooter, TextField, useServerSubmit } from '../../../components/ui/form-field';
import { useSaveCustomer } from '../api/save-customer';

type Input = z.input<typeof CustomerCreateSchema>;
const FIELDS = ['name', 'contactEmail', 'retentionDays'] as const;

/** Creates a customer, or changes one when `customer` is given. */
export function CustomerForm({ customer, onSaved, onCancel }: { customer?: CustomerView; onSaved: (c: CustomerView) => void; onCancel?: () => void }) {
  const save = useSaveCustomer(customer?.id);
  const form = useForm<Input, unknown, CustomerCreate>({
    // A change sends every field again: the form always shows them all.
    resolver: zodResolver(CustomerCreateSchema),
    defaultValues: { name: customer?.name ?? '', contactEmail: customer?.contactEmail ?? '', retentionDays: customer?.retentionDays ?? '' },
  });
  const { errors } = form.formState;
  const { onSubmit, alert } = useServerSubmit(form, FIELDS, async (body) => onSaved(await save.mutateAsync(body)));
  return (
    <form onSubmit={onSubmit} noValidate className="grid gap-4 sm:grid-cols-2" aria-label={customer ? 'Change customer' : 'New customer'}>
      <TextField label="Name" autoComplete="organization" error={errors.name?.message} className="sm:col-span-2" {...form.register('name')} />
      <TextField label="Contact e-mail" type="email" hint="Where reports and notices go." error={errors.contactEmail?.message} {...form.register('contactEmail')} />
      <TextField label="Retention (days)" inputMode="numeric" hint="How long halves are kept; empty for the lab’s default." error={errors.retentionDays?.message} {...form.register('retentionDays')} />
      <FormFooter alert={alert} busy={save.isPending} submitLabel={customer ? 'Save changes' : 'Add customer'} onCancel={onCancel} />
    </form>
  );
}
