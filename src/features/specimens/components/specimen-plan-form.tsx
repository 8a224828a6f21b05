import { zodResolver } from '@hookform/resolvers/zod';
import { useForm } from 'react-hook-form';
import type { z } from 'zod';
import { SPECIMEN_GEOMETRIES } from '../../../../shared/domain/specimen-geometries';
import { SpecimenUpdateSchema, type SpecimenDetail, type SpecimenUpdate } from '../../../../shared/schemas/specimens';
import { FormFooter, SelectField, TextField, useServerSubmit } from '../../../components/ui/form-field';
import { useUpdateSpecimen } from '../api/save-specimen';

type Input = z.input<typeof SpecimenUpdateSchema>;

/** Changes a registered specimen's geometry and standard (refused by the server once it is cut). */
export function SpecimenPlanForm({ specimen, onSaved, onCancel }: { specimen: SpecimenDetail; onSaved: () => void; onCancel: () => void }) {
  const save = useUpdateSpecimen(specimen.code);
  const form = useForm<Input, unknown, SpecimenUpdate>({
    resolver: zodResolver(SpecimenUpdateSchema),
    defaultValues: { geometryKey: specimen.geometryKey, testStandard: specimen.testStandard },
  });
  const { errors } = form.formState;
  const { onSubmit, alert } = useServerSubmit(form, ['geometryKey', 'testStandard'], async (body) => {
    await save.mutateAsync(body);
    onSaved();
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
      <FormFooter alert={alert} busy={save.isPending} submitLabel="Save plan" onCancel={onCancel} />
    </form>
  );
}
