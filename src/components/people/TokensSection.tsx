/**
 * API tokens for integrations (telematics or scan-tool feeds): the list, creating one for a person (the secret
 * is shown once, with a copy button) and revoking with confirmation.
 */
import { useId, useMemo, useRef, useState } from 'react';
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { z } from 'zod';
import { Check, Copy, Plus } from 'lucide-react';
import { ROLE_LABELS } from '@/lib/auth/permissions';
import { DataTable } from '@/components/ui/DataTable';
import { ConfirmDialog, Dialog } from '@/components/ui/Dialog';
import { applyServerIssues, CheckRow, fieldAria, FormError, FormField } from '@/components/ui/FormField';
import { sortRows, tokenColumns, tokenSortValue } from './columns';
import { useCreateToken, useRevokeToken, useTokens, type ApiToken, type NewToken, type Person } from './queries';

const TokenSchema = z.object({
  email: z.string().min(1, 'Choose the person the token acts as.'),
  label: z.string().trim().min(1, 'Give it a label, e.g. the system that will use it.').max(80, 'Label is at most 80 characters.'),
});
type TokenValues = z.infer<typeof TokenSchema>;

function CreateTokenForm({
  formId,
  people,
  onCreated,
  onBusy,
}: {
  formId: string;
  people: Person[];
  onCreated: (t: NewToken, who: Person | undefined) => void;
  onBusy: (b: boolean) => void;
}) {
  const uid = useId();
  const create = useCreateToken();
  const [formError, setFormError] = useState<string | null>(null);
  const { register, handleSubmit, setError, formState } = useForm<TokenValues>({ resolver: zodResolver(TokenSchema), defaultValues: { email: '', label: '' } });
  const e = formState.errors;
  const onSubmit = handleSubmit(async (v) => {
    setFormError(null);
    onBusy(true);
    try {
      const t = await create.mutateAsync({ email: v.email, label: v.label.trim() });
      onCreated(
        t,
        people.find((p) => p.email === v.email),
      );
    } catch (err) {
      setFormError(applyServerIssues(err, setError, ['email', 'label']));
    } finally {
      onBusy(false);
    }
  });
  return (
    <form id={formId} onSubmit={onSubmit} noValidate className="space-y-4">
      <FormError message={formError} />
      <FormField id={`${uid}-who`} label="Acts as" required error={e.email?.message} hint="The token can do exactly what this person may do, in their depots.">
        <select className="input" {...fieldAria(`${uid}-who`, e.email?.message, true)} {...register('email')}>
          <option value="">Choose a person…</option>
          {people.map((p) => (
            <option key={p.id} value={p.email}>
              {p.name} — {ROLE_LABELS[p.role]} ({p.email})
            </option>
          ))}
        </select>
      </FormField>
      <FormField id={`${uid}-label`} label="Label" required error={e.label?.message} hint="What it is for, so you know what breaks if you revoke it.">
        <input
          className="input"
          placeholder="e.g. Telematics fault-code feed"
          {...fieldAria(`${uid}-label`, e.label?.message, true)}
          {...register('label')}
          autoComplete="off"
        />
      </FormField>
    </form>
  );
}

/** Shows a new token once, with a copy button. */
function TokenReveal({ token, who }: { token: NewToken; who: Person | undefined }) {
  const ref = useRef<HTMLInputElement>(null);
  const [copied, setCopied] = useState<'yes' | 'failed' | null>(null);
  const copy = async () => {
    try {
      await navigator.clipboard.writeText(token.token);
      setCopied('yes');
    } catch {
      // NOTE: the Clipboard API needs a secure context (https or localhost); elsewhere select the text instead.
      ref.current?.select();
      setCopied('failed');
    }
  };
  return (
    <div className="space-y-3 text-sm">
      <p>
        Token <strong>{token.label}</strong> created{who ? ` for ${who.name}` : ''}.
      </p>
      <div className="flex gap-2">
        <label className="sr-only" htmlFor="new-token">
          New API token
        </label>
        <input ref={ref} id="new-token" className="input mono text-sm" readOnly value={token.token} onFocus={(e) => e.currentTarget.select()} />
        <button type="button" className="btn-primary shrink-0" onClick={copy}>
          {copied === 'yes' ? <Check size={16} aria-hidden="true" /> : <Copy size={16} aria-hidden="true" />}
          {copied === 'yes' ? 'Copied' : 'Copy'}
        </button>
      </div>
      {copied === 'failed' && <p className="text-brick-700">The browser blocked copying here. The token is selected: press Ctrl+C (⌘C on a Mac).</p>}
      <div className="caution" role="note">
        <strong>Copy it now: you won't see it again.</strong> Seepline keeps only a fingerprint of the token. If it is lost, revoke it and create a new one.
      </div>
      <p className="text-ink-600">
        The integration sends it as <code className="rounded bg-ink-100 px-1">Authorization: Bearer {token.prefix}…</code>
      </p>
    </div>
  );
}

/** The API tokens card of the People page. */
export function TokensSection({ people }: { people: Person[] }) {
  const { data, isFetching, error } = useTokens();
  const revoke = useRevokeToken();
  const [sort, setSort] = useState('-createdAt');
  const [showRevoked, setShowRevoked] = useState(false);
  const [creating, setCreating] = useState(false);
  const [created, setCreated] = useState<{ token: NewToken; who: Person | undefined } | null>(null);
  const [revoking, setRevoking] = useState<ApiToken | null>(null);
  const [busy, setBusy] = useState(false);
  const columns = useMemo(() => tokenColumns({ onRevoke: setRevoking }), []);
  const all = data ?? [];
  const revokedCount = all.filter((t) => t.revokedAt).length;
  const rows = sortRows(showRevoked ? all : all.filter((t) => !t.revokedAt), sort, tokenSortValue);
  const activePeople = people.filter((p) => p.active);
  const closeCreate = () => {
    setCreating(false);
    setCreated(null);
  };

  return (
    <section className="mt-8" aria-labelledby="tokens-heading">
      <div className="mb-3 flex flex-wrap items-end justify-between gap-3">
        <div>
          <h2 id="tokens-heading">API tokens</h2>
          <p className="text-sm text-ink-500">
            For integrations such as telematics or scan-tool feeds that push fault codes. A token acts as the person it belongs to.
          </p>
        </div>
        <button type="button" className="btn-secondary" onClick={() => setCreating(true)}>
          <Plus size={18} aria-hidden="true" /> Create token
        </button>
      </div>
      {revokedCount > 0 && (
        <div className="mb-2">
          <CheckRow checked={showRevoked} onChange={(e) => setShowRevoked(e.target.checked)}>
            Show revoked tokens ({revokedCount})
          </CheckRow>
        </div>
      )}
      <DataTable
        caption="API tokens"
        columns={columns}
        data={rows}
        total={rows.length}
        page={1}
        pageSize={Math.max(1, rows.length)}
        sort={sort}
        onSort={setSort}
        onPage={() => undefined}
        loading={isFetching && !data}
        error={error ? error.message : null}
        emptyText={revokedCount && !showRevoked ? 'No active tokens.' : 'No API tokens yet.'}
      />

      <Dialog
        open={creating}
        onClose={closeCreate}
        title={created ? 'Your new API token' : 'Create API token'}
        footer={
          created ? (
            <button type="button" className="btn-primary" onClick={closeCreate}>
              I have stored it
            </button>
          ) : (
            <>
              <button type="button" className="btn-secondary" onClick={closeCreate}>
                Cancel
              </button>
              <button type="submit" form="token-form" className="btn-primary" disabled={busy}>
                {busy ? 'Creating…' : 'Create token'}
              </button>
            </>
          )
        }
      >
        {created ? (
          <TokenReveal token={created.token} who={created.who} />
        ) : (
          <CreateTokenForm formId="token-form" people={activePeople} onBusy={setBusy} onCreated={(token, who) => setCreated({ token, who })} />
        )}
      </Dialog>

      <ConfirmDialog
        open={revoking !== null}
        onClose={() => setRevoking(null)}
        title="Revoke this token?"
        confirmLabel="Revoke token"
        onConfirm={() => revoke.mutateAsync(revoking!.id)}
      >
        <p>
          <strong>{revoking?.label}</strong> <span className="mono text-ink-600">({revoking?.prefix}…)</span>, acting as {revoking?.name}.
        </p>
        <p>Anything using it is refused from now on. This cannot be undone; create a new token if it is needed again.</p>
      </ConfirmDialog>
    </section>
  );
}
