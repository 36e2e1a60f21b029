/**
 * Add a person or change one (role, depots, active), and the reset-password form. react-hook-form + zod;
 * the API's issues land on their fields.
 */
import { useId, useState } from 'react';
import { Controller, useForm, useWatch } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { z } from 'zod';
import { ROLE_LABELS, ROLE_VALUES, type Role } from '@/lib/auth/permissions';
import { applyServerIssues, CheckRow, fieldAria, FormError, FormField } from '@/components/ui/FormField';
import { useAllDepots } from '@/components/depots/queries';
import { useCreatePerson, useUpdatePerson, type Person, type PersonChange } from './queries';

/** What each role may do, in a line (PRODUCT.md roles). */
export const ROLE_HINTS: Record<Role, string> = {
  admin: 'Everything: people, roles, depots, catalogue, API tokens, settings.',
  manager: 'All depots: patterns, campaigns, warranty evidence, imports, depots and the module catalogue, and all a supervisor does.',
  supervisor: 'Assigned depots: vehicles (including off road), defects, and the patterns of those depots (read only).',
  technician: 'Assigned depots: works defects — diagnosis, traces, photos, parts, closing.',
  viewer: 'Assigned depots, or all: reads only.',
};

const PASSWORD_MIN = 10;
const needsDepots = (r: Role) => r === 'supervisor' || r === 'technician' || r === 'viewer';

/** A random password (16 letters and digits without look-alikes, in four groups) from the browser's CSPRNG. */
export function suggestPassword(): string {
  const alphabet = 'abcdefghjkmnpqrstuvwxyzABCDEFGHJKMNPQRSTUVWXYZ23456789';
  const bytes = new Uint32Array(16);
  crypto.getRandomValues(bytes);
  const chars = Array.from(bytes, (b) => alphabet[b % alphabet.length]);
  return [0, 4, 8, 12].map((i) => chars.slice(i, i + 4).join('')).join('-');
}

function personSchema(mode: 'create' | 'edit') {
  return z
    .object({
      name: z.string().trim().min(1, 'Name is required.').max(120, 'Name is at most 120 characters.'),
      email: mode === 'create' ? z.email('Enter an e-mail address.').max(320) : z.string(),
      role: z.enum(ROLE_VALUES, 'Choose a role.'),
      depots: z.array(z.string()),
      allDepots: z.boolean(),
      active: z.boolean(),
      password: z.string().max(200, 'Password is at most 200 characters.'),
    })
    .superRefine((v, ctx) => {
      if (mode === 'create' && v.password.length < PASSWORD_MIN) {
        ctx.addIssue({ code: 'custom', path: ['password'], message: `At least ${PASSWORD_MIN} characters.` });
      }
      if ((v.role === 'supervisor' || v.role === 'technician') && v.depots.length === 0) {
        ctx.addIssue({ code: 'custom', path: ['depots'], message: `A ${ROLE_LABELS[v.role].toLowerCase()} needs at least one depot.` });
      }
      if (v.role === 'viewer' && !v.allDepots && v.depots.length === 0) {
        ctx.addIssue({ code: 'custom', path: ['depots'], message: 'Choose depots, or tick “All depots”.' });
      }
    });
}
type PersonFormValues = z.infer<ReturnType<typeof personSchema>>;
const FIELDS = ['name', 'email', 'role', 'depots', 'allDepots', 'active', 'password'];

/** A password input with show/hide and a suggestion button. */
function PasswordInput({
  id,
  error,
  value,
  onChange,
  onBlur,
  name,
  hasHint,
}: {
  id: string;
  error?: string | undefined;
  value: string;
  onChange: (v: string) => void;
  onBlur: () => void;
  name: string;
  hasHint?: boolean;
}) {
  const [shown, setShown] = useState(false);
  return (
    <div className="flex gap-2">
      <input
        className="input mono"
        type={shown ? 'text' : 'password'}
        autoComplete="new-password"
        name={name}
        value={value}
        onChange={(e) => onChange(e.target.value)}
        onBlur={onBlur}
        {...fieldAria(id, error, hasHint)}
      />
      <button type="button" className="btn-secondary shrink-0" onClick={() => setShown((s) => !s)} aria-pressed={shown}>
        {shown ? 'Hide' : 'Show'}
      </button>
      <button
        type="button"
        className="btn-secondary shrink-0"
        onClick={() => {
          onChange(suggestPassword());
          setShown(true);
        }}
      >
        Suggest
      </button>
    </div>
  );
}

type Props = {
  formId: string;
  person: Person | null;
  meId: number;
  onSaved: (p: Person | null, message: string) => void;
  onBusy: (busy: boolean) => void;
};

/** Add a person (person = null) or change one. */
export function PersonForm({ formId, person, meId, onSaved, onBusy }: Props) {
  const mode = person ? 'edit' : 'create';
  const uid = useId();
  const id = (f: string) => `${uid}-${f}`;
  const depotsQuery = useAllDepots();
  const create = useCreatePerson();
  const update = useUpdatePerson();
  const [formError, setFormError] = useState<string | null>(null);
  const isMe = person?.id === meId;
  const { register, handleSubmit, setError, formState, control } = useForm<PersonFormValues>({
    resolver: zodResolver(personSchema(mode)),
    defaultValues: {
      name: person?.name ?? '',
      email: person?.email ?? '',
      role: person?.role ?? ('' as Role),
      depots: person && !person.allDepots ? person.depots : [],
      allDepots: person ? person.role === 'viewer' && person.allDepots : false,
      active: person?.active ?? true,
      password: '',
    },
  });
  const e = formState.errors;
  const role = useWatch({ control, name: 'role' });
  const allDepots = useWatch({ control, name: 'allDepots' });

  const onSubmit = handleSubmit(async (v) => {
    setFormError(null);
    const depots = needsDepots(v.role) && !(v.role === 'viewer' && v.allDepots) ? [...v.depots].sort() : [];
    const all = v.role === 'viewer' ? v.allDepots : false;
    onBusy(true);
    try {
      if (!person) {
        const p = await create.mutateAsync({ email: v.email.trim(), name: v.name.trim(), role: v.role, password: v.password, depots, allDepots: all });
        onSaved(p, `${p.name} added as ${ROLE_LABELS[p.role].toLowerCase()}. Give them their password by a separate channel.`);
        return;
      }
      const change: PersonChange = {};
      if (v.name.trim() !== person.name) change.name = v.name.trim();
      if (v.role !== person.role) change.role = v.role;
      if (v.active !== person.active) change.active = v.active;
      const beforeAll = person.role === 'viewer' && person.allDepots;
      if (all !== beforeAll) change.allDepots = all;
      const beforeDepots = person.allDepots ? [] : [...person.depots].sort();
      if (depots.join(',') !== beforeDepots.join(',')) change.depots = depots;
      if (Object.keys(change).length === 0) {
        onSaved(null, 'Nothing changed.');
        return;
      }
      const p = await update.mutateAsync({ id: person.id, body: change });
      onSaved(p, `${p.name} saved.`);
    } catch (err) {
      setFormError(applyServerIssues(err, setError, FIELDS, { conflictField: person ? undefined : 'email' }));
    } finally {
      onBusy(false);
    }
  });

  const depotList = depotsQuery.data?.items ?? [];
  const showDepots = role ? needsDepots(role) : false;

  return (
    <form id={formId} onSubmit={onSubmit} noValidate className="space-y-4">
      <FormError message={formError} />
      <div className="grid gap-4 sm:grid-cols-2">
        <FormField id={id('name')} label="Name" required error={e.name?.message}>
          <input className="input" {...fieldAria(id('name'), e.name?.message)} {...register('name')} autoComplete="off" />
        </FormField>
        <FormField
          id={id('email')}
          label="E-mail"
          required={!person}
          error={e.email?.message}
          hint={person ? 'The sign-in e-mail cannot be changed.' : 'Their sign-in; it must be unique.'}
        >
          <input
            className="input read-only:bg-ink-50 read-only:text-ink-600"
            type="email"
            {...fieldAria(id('email'), e.email?.message, true)}
            {...register('email')}
            readOnly={!!person}
            autoComplete="off"
          />
        </FormField>
      </div>
      <FormField id={id('role')} label="Role" required error={e.role?.message} hint={role ? ROLE_HINTS[role] : 'What they may see and do.'}>
        {isMe ? (
          <input className="input bg-ink-50 sm:w-1/2" id={id('role')} value={ROLE_LABELS[person!.role]} readOnly aria-describedby={`${id('role')}-hint`} />
        ) : (
          <select className="input sm:w-1/2" {...fieldAria(id('role'), e.role?.message, true)} {...register('role')}>
            <option value="">Choose…</option>
            {ROLE_VALUES.map((r) => (
              <option key={r} value={r}>
                {ROLE_LABELS[r]}
              </option>
            ))}
          </select>
        )}
      </FormField>

      <fieldset className="rounded-md border border-ink-200 px-4 pt-2 pb-3" aria-describedby={e.depots ? id('depots-error') : undefined}>
        <legend className="px-1 text-sm font-semibold text-ink-700">Depots</legend>
        {!role ? (
          <p className="py-1 text-sm text-ink-500">Choose a role first.</p>
        ) : !showDepots ? (
          <p className="py-1 text-sm text-ink-600">{ROLE_LABELS[role]}s see every depot.</p>
        ) : (
          <>
            {role === 'viewer' && (
              <CheckRow {...register('allDepots')} hint="A read-only view across the whole fleet.">
                All depots
              </CheckRow>
            )}
            <Controller
              control={control}
              name="depots"
              render={({ field }) => (
                <div className="grid max-h-56 gap-x-4 overflow-y-auto sm:grid-cols-2">
                  {depotsQuery.isPending && <p className="py-2 text-sm text-ink-500">Loading depots…</p>}
                  {depotsQuery.error && <p className="py-2 text-sm text-brick-700">Depots could not be loaded: {depotsQuery.error.message}</p>}
                  {depotList.map((d) => (
                    <CheckRow
                      key={d.code}
                      checked={field.value.includes(d.code)}
                      disabled={role === 'viewer' && allDepots}
                      onChange={(ev) => {
                        const next = ev.target.checked ? [...field.value, d.code] : field.value.filter((c) => c !== d.code);
                        field.onChange(next);
                      }}
                      hint={d.region ?? undefined}
                    >
                      <span className="mono font-semibold">{d.code}</span> {d.name}
                    </CheckRow>
                  ))}
                </div>
              )}
            />
          </>
        )}
        {e.depots?.message && showDepots && (
          <p id={id('depots-error')} className="mt-1 text-xs font-semibold text-brick-700">
            {e.depots.message}
          </p>
        )}
      </fieldset>

      {person ? (
        isMe ? (
          <p className="text-sm text-ink-500">This is you: you cannot deactivate yourself or change your own role.</p>
        ) : (
          <CheckRow {...register('active')} hint="A deactivated person cannot sign in and their API tokens stop working.">
            Active
          </CheckRow>
        )
      ) : (
        <FormField
          id={id('password')}
          label="Password"
          required
          error={e.password?.message}
          hint={`At least ${PASSWORD_MIN} characters. Give it to them by a separate channel.`}
        >
          <Controller
            control={control}
            name="password"
            render={({ field }) => (
              <PasswordInput
                id={id('password')}
                name={field.name}
                value={field.value}
                onChange={field.onChange}
                onBlur={field.onBlur}
                error={e.password?.message}
                hasHint
              />
            )}
          />
        </FormField>
      )}
    </form>
  );
}

const PasswordSchema = z.object({
  password: z.string().min(PASSWORD_MIN, `At least ${PASSWORD_MIN} characters.`).max(200, 'Password is at most 200 characters.'),
});
type PasswordValues = z.infer<typeof PasswordSchema>;

/** Set a new password for a person. */
export function PasswordForm({
  formId,
  person,
  onSaved,
  onBusy,
}: {
  formId: string;
  person: Person;
  onSaved: (message: string) => void;
  onBusy: (busy: boolean) => void;
}) {
  const uid = useId();
  const update = useUpdatePerson();
  const [formError, setFormError] = useState<string | null>(null);
  const { handleSubmit, setError, formState, control } = useForm<PasswordValues>({ resolver: zodResolver(PasswordSchema), defaultValues: { password: '' } });
  const onSubmit = handleSubmit(async (v) => {
    setFormError(null);
    onBusy(true);
    try {
      await update.mutateAsync({ id: person.id, body: { password: v.password } });
      onSaved(`New password set for ${person.name}.`);
    } catch (err) {
      setFormError(applyServerIssues(err, setError, ['password']));
    } finally {
      onBusy(false);
    }
  });
  const err = formState.errors.password?.message;
  return (
    <form id={formId} onSubmit={onSubmit} noValidate className="space-y-4">
      <FormError message={formError} />
      <p className="text-sm text-ink-600">
        {person.name} ({person.email}) signs in with the new password from now on; the old one stops working. Give it to them by a separate channel.
      </p>
      <FormField id={`${uid}-pw`} label="New password" required error={err} hint={`At least ${PASSWORD_MIN} characters.`}>
        <Controller
          control={control}
          name="password"
          render={({ field }) => (
            <PasswordInput id={`${uid}-pw`} name={field.name} value={field.value} onChange={field.onChange} onBlur={field.onBlur} error={err} hasHint />
          )}
        />
      </FormField>
    </form>
  );
}
