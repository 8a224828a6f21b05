import { zodResolver } from '@hookform/resolvers/zod';
import { useState } from 'react';
import { useForm } from 'react-hook-form';
import type { z } from 'zod';
import { SPECIMEN_GEOMETRIES } from '../../../../shared/domain/specimen-geometries';
import { SpecimenUpdateSchema, type SpecimenDetail, type SpecimenUpdate } from '../../../../shared/schemas/specimens';
import { Button } from '../../../components/ui/button';
import { FormAlert, SelectField, showServerErrors, TextField } from '../../../components/ui/form-field';
import { useUpdateSpecimen } from '../api/save-specimen';

type Input = z.input<typeof SpecimenUpdateSchema>;

/** Changes a registered specimen's geometry and standard (refused by the server once it is cut). */
export function SpecimenPlanForm({ specimen, onSaved, onCancel }: { specimen: SpecimenDetail; onSaved: () => void; onCancel: () => void }) {
  const save = useUpdateSpecimen(specimen.code);
  const [alert, setAlert] = useState<string | null>(null);
  const form = useForm<Input, unknown, SpecimenUpdate>({
    resolver: zodResolver(SpecimenUpdateSchema),
    defaultValues: { geometryKey: specimen.geometryKey, testStandard: specimen.testStandard },
  });
  const { errors } = form.formState;
  const onSubmit = form.handleSubmit(async (body) => {
    setAlert(null);
    try {
      await save.mutateAsync(body);
      onSaved();
    } catch (err) {
      setAlert(showServerErrors(form, err, ['geometryKey', 'testStandard']));
    }
  });
  return (
    <form onSubmit={onSubmit} noValidate aria-label="Change specimen plan" className="grid gap-4 sm:grid-cols-2">
      <SelectField
        label="Geometry"
        options={SPECIMEN_GEOMETRIES.map((g) => ({ value: g.key, label: `${g.standard} · ${g.label}` }))}
        error={errors.geometryKey?.message}
        {...form.register('geometryKey')}
      />
      <TextField label="Test standard" error={errors.testStandard?.message} {...form.register('testStandard')} />
      <div className="sm:col-span-2">
        <FormAlert>{alert}</FormAlert>
      </div>
      <div className="flex gap-2 sm:col-span-2">
        <Button type="submit" busy={save.isPending} busyLabel="Saving …">
          Save plan
        </Button>
        <Button variant="ghost" onClick={onCancel}>
          Cancel
        </Button>
      </div>
    </form>
  );
}
