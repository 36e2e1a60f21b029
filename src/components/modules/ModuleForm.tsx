/** Create or change a module type (react-hook-form + zod); the server's 422 issues land on their fields. */
import { useId, useState } from 'react';
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { z } from 'zod';
import { FUNCTION_LABELS } from '@/components/labels';
import { applyServerIssues, fieldAria, FormError, FormField } from '@/components/ui/FormField';
import { MODULE_FUNCTIONS, useSaveModule, type ModuleType } from './queries';

const ModuleFormSchema = z.object({
  code: z
    .string()
    .trim()
    .min(1, 'Code is required.')
    .max(32, 'Code is at most 32 characters.')
    .regex(/^[A-Za-z0-9_.-]+$/, 'Code may hold letters, digits, ".", "-" and "_" only.'),
  name: z.string().trim().min(1, 'Name is required.').max(200, 'Name is at most 200 characters.'),
  function: z.enum(MODULE_FUNCTIONS, 'Choose what the module does.'),
  partNumber: z.string().trim().max(64, 'Part number is at most 64 characters.'),
  supplier: z.string().trim().max(200, 'Supplier is at most 200 characters.'),
});
type ModuleFormInput = z.input<typeof ModuleFormSchema>;
type ModuleFormValues = z.output<typeof ModuleFormSchema>;
const FIELDS = Object.keys(ModuleFormSchema.shape);

type Props = { formId: string; module: ModuleType | null; onSaved: (m: ModuleType) => void; onBusy: (busy: boolean) => void };

/** The module-type form; the dialog footer's submit button targets it through `formId`. */
export function ModuleForm({ formId, module, onSaved, onBusy }: Props) {
  const uid = useId();
  const id = (f: string) => `${uid}-${f}`;
  const save = useSaveModule();
  const [formError, setFormError] = useState<string | null>(null);
  const { register, handleSubmit, setError, formState } = useForm<ModuleFormInput, unknown, ModuleFormValues>({
    resolver: zodResolver(ModuleFormSchema),
    defaultValues: {
      code: module?.code ?? '',
      name: module?.name ?? '',
      function: module?.function ?? ('' as ModuleFormInput['function']),
      partNumber: module?.partNumber ?? '',
      supplier: module?.supplier ?? '',
    },
  });
  const e = formState.errors;

  const onSubmit = handleSubmit(async (v) => {
    setFormError(null);
    onBusy(true);
    try {
      const saved = await save.mutateAsync({
        code: module?.code ?? null,
        body: { code: v.code.toUpperCase(), name: v.name, function: v.function, partNumber: v.partNumber || null, supplier: v.supplier || null },
      });
      onSaved(saved);
    } catch (err) {
      setFormError(applyServerIssues(err, setError, FIELDS, { conflictField: module ? undefined : 'code' }));
    } finally {
      onBusy(false);
    }
  });

  return (
    <form id={formId} onSubmit={onSubmit} noValidate className="space-y-4">
      <FormError message={formError} />
      <div className="grid gap-4 sm:grid-cols-[12rem_1fr]">
        <FormField id={id('code')} label="Code" required error={e.code?.message} hint={module ? 'The code cannot be changed.' : 'e.g. WLR-4'}>
          <input
            className="input mono uppercase read-only:bg-ink-50 read-only:text-ink-600"
            {...fieldAria(id('code'), e.code?.message, true)}
            {...register('code')}
            readOnly={!!module}
            autoComplete="off"
          />
        </FormField>
        <FormField id={id('function')} label="Function" required error={e.function?.message}>
          <select className="input" {...fieldAria(id('function'), e.function?.message)} {...register('function')}>
            <option value="">Choose…</option>
            {MODULE_FUNCTIONS.map((f) => (
              <option key={f} value={f}>
                {FUNCTION_LABELS[f] ?? f}
              </option>
            ))}
          </select>
        </FormField>
      </div>
      <FormField id={id('name')} label="Name" required error={e.name?.message} hint="What a technician would call it, e.g. “Window lifter motor, front doors”.">
        <input className="input" {...fieldAria(id('name'), e.name?.message, true)} {...register('name')} autoComplete="off" />
      </FormField>
      <div className="grid gap-4 sm:grid-cols-2">
        <FormField id={id('partNumber')} label="Part number" error={e.partNumber?.message}>
          <input className="input mono" {...fieldAria(id('partNumber'), e.partNumber?.message)} {...register('partNumber')} autoComplete="off" />
        </FormField>
        <FormField id={id('supplier')} label="Supplier" error={e.supplier?.message} hint="Named on warranty evidence packs.">
          <input className="input" {...fieldAria(id('supplier'), e.supplier?.message, true)} {...register('supplier')} autoComplete="off" />
        </FormField>
      </div>
    </form>
  );
}
