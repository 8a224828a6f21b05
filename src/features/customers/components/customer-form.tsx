import { zodResolver } from '@hookform/resolvers/zod';
import { useState } from 'react';
import { useForm } from 'react-hook-form';
import type { z } from 'zod';
import { CustomerCreateSchema, type CustomerCreate, type CustomerView } from '../../../../shared/schemas/customers';
import { Button } from '../../../components/ui/button';
import { FormAlert, showServerErrors, TextField } from '../../../components/ui/form-field';
import { useSaveCustomer } from '../api/save-customer';

type Input = z.input<typeof CustomerCreateSchema>;
const FIELDS = ['name', 'contactEmail', 'retentionDays'] as const;

/** Creates a customer, or changes one when `customer` is given. */
export function CustomerForm({ customer, onSaved, onCancel }: { customer?: CustomerView; onSaved: (c: CustomerView) => void; onCancel?: () => void }) {
  const save = useSaveCustomer(customer?.id);
  const [alert, setAlert] = useState<string | null>(null);
  const form = useForm<Input, unknown, CustomerCreate>({
    // A change sends every field again: the form always shows them all.
    resolver: zodResolver(CustomerCreateSchema),
    defaultValues: { name: customer?.name ?? '', contactEmail: customer?.contactEmail ?? '', retentionDays: customer?.retentionDays ?? '' },
  });
  const { errors } = form.formState;
  const onSubmit = form.handleSubmit(async (body) => {
    setAlert(null);
    try {
      onSaved(await save.mutateAsync(body));
    } catch (err) {
      setAlert(showServerErrors(form, err, FIELDS));
    }
  });
  return (
    <form onSubmit={onSubmit} noValidate className="grid gap-4 sm:grid-cols-2" aria-label={customer ? 'Change customer' : 'New customer'}>
      <TextField label="Name" autoComplete="organization" error={errors.name?.message} className="sm:col-span-2" {...form.register('name')} />
      <TextField label="Contact e-mail" type="email" hint="Where reports and notices go." error={errors.contactEmail?.message} {...form.register('contactEmail')} />
      <TextField label="Retention (days)" inputMode="numeric" hint="How long halves are kept; empty for the lab’s default." error={errors.retentionDays?.message} {...form.register('retentionDays')} />
      <div className="sm:col-span-2">
        <FormAlert>{alert}</FormAlert>
      </div>
      <div className="flex gap-2 sm:col-span-2">
        <Button type="submit" busy={save.isPending} busyLabel="Saving …">
          {customer ? 'Save changes' : 'Add customer'}
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
