import { Fragment, useEffect, useId, useState } from 'react';
import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { formatDistanceToNowStrict } from 'date-fns';
import { withQueryClient } from '../../components/ui/QueryProvider';
import { EmptyState, ErrorState, LoadingState } from '../../components/ui/States';
import { AskFirst } from '../../components/ui/AskFirst';
import { ConflictNotice } from '../../components/ui/ConflictNotice';
import { Field, describedBy } from '../../components/ui/Field';
import { ApiError, isConflict } from '../../lib/query-client';
import {
  CREW_ROLES,
  crewCreateSchema,
  invitationCreateSchema,
  type CrewDetailDto,
  type CrewRoleName,
  type CrewSummaryDto,
  type InvitationCreateInput,
  type InvitationDto,
  type MemberDto,
} from '../../domain/crews/crews.schema';
import * as api from './crew.api';
import { crewKeys, crewQuery, crewsQuery } from './crew.queries';

export const ROLE_TEXT: Record<CrewRoleName, string> = {
  owner: 'Everything, plus members, invitations and installers',
  editor: 'Edits rigs, loads and trips; saves forecasts',
  viewer: 'Sees rigs, loads, trips and forecasts',
};

const ROLE_LABEL: Record<CrewRoleName, string> = { owner: 'Owner', editor: 'Editor', viewer: 'Viewer' };
const WITH_ARTICLE: Record<CrewRoleName, string> = { owner: 'an owner', editor: 'an editor', viewer: 'a viewer' };

function RoleBadge({ role }: { role: CrewRoleName }) {
  const tone = role === 'owner' ? 'bg-dusk text-white' : role === 'editor' ? 'bg-moss-deep text-white' : 'bg-sand-dark text-dusk';
  return <span className={`inline-block rounded-full px-2.5 py-0.5 text-xs font-extrabold uppercase tracking-wide ${tone}`}>{ROLE_LABEL[role]}</span>;
}

/** Server field errors (issues) onto form fields; the rest as one message. */
function issueFor(error: unknown, path: string): string | undefined {
  if (!(error instanceof ApiError)) return undefined;
  return error.issues.find((i) => i.path === path)?.message ?? undefined;
}

function Notice({ text, tone = 'ok', onClose }: { text: string; tone?: 'ok' | 'alert'; onClose: () => void }) {
  return (
    <div role={tone === 'alert' ? 'alert' : 'status'} className={`my-3 flex items-start justify-between gap-3 rounded-[10px] border-l-4 px-4 py-3 ${tone === 'alert' ? 'border-alert bg-[#fbeae6]' : 'border-moss bg-[#eef5ef]'}`}>
      <p className="font-semibold">{text}</p>
      <button type="button" className="shrink-0 text-sm font-bold underline" onClick={onClose}>Dismiss</button>
    </div>
  );
}

function CrewSwitcher({ crews }: { crews: CrewSummaryDto[] }) {
  const qc = useQueryClient();
  const active = crews.find((c) => c.active) ?? crews[0];
  const switcher = useMutation({
    mutationFn: api.switchCrew,
    onSuccess: (list) => {
      qc.setQueryData(crewKeys.list(), list);
      void qc.invalidateQueries({ queryKey: crewKeys.all });
    },
  });
  if (crews.length < 2) return null;
  return (
    <section aria-labelledby="switch-h" className="card mb-5 p-4">
      <h2 id="switch-h" className="text-base">Your crews</h2>
      <p className="text-sm text-slate-text">This page manages the active crew; new rigs go into it. Rig and trip lists show every crew you are in.</p>
      <ul className="mt-3 flex flex-wrap gap-2">
        {crews.map((c) => (
          <li key={c.id}>
            <button
              type="button"
              aria-pressed={c.id === active?.id}
              disabled={switcher.isPending}
              onClick={() => switcher.mutate(c.id)}
              className={`rounded-full border-2 px-4 py-2 text-sm font-bold ${c.id === active?.id ? 'border-ember bg-[#fbf1e6]' : 'border-sand-dark bg-white hover:bg-sand'}`}
            >
              {c.name} <span className="font-semibold text-slate-text">· {ROLE_LABEL[c.role].toLowerCase()}</span>
            </button>
          </li>
        ))}
      </ul>
      {switcher.error ? <p className="field-error" role="alert">{(switcher.error as Error).message}</p> : null}
    </section>
  );
}

function CrewName({ crew }: { crew: CrewDetailDto }) {
  const qc = useQueryClient();
  const [editing, setEditing] = useState(false);
  const [name, setName] = useState(crew.name);
  const [theirs, setTheirs] = useState<{ name: string; version: number; updatedAt?: string } | null>(null);
  const inputId = useId();
  const save = useMutation({
    mutationFn: (version: number) => api.renameCrew(crew.id, { name, version }),
    onSuccess: () => {
      setEditing(false);
      setTheirs(null);
      void qc.invalidateQueries({ queryKey: crewKeys.all });
    },
    onError: (e) => {
      if (isConflict(e)) setTheirs(e.current<{ name: string; version: number; updatedAt?: string }>() ?? null);
    },
  });
  useEffect(() => {
    if (!editing) setName(crew.name);
  }, [crew.name, editing]);

  if (!editing) {
    return (
      <div className="flex flex-wrap items-center gap-3">
        <h1 className="text-2xl sm:text-3xl">{crew.name}</h1>
        <RoleBadge role={crew.role} />
        {crew.role === 'owner' ? (
          <button type="button" className="btn btn-quiet min-h-0 px-3 py-1 text-sm" onClick={() => setEditing(true)}>Rename</button>
        ) : null}
      </div>
    );
  }
  const nameError = issueFor(save.error, 'name');
  return (
    <form
      className="flex flex-wrap items-end gap-2"
      onSubmit={(e) => {
        e.preventDefault();
        save.mutate(crew.version);
      }}
      aria-label="Rename the crew"
    >
      <div className="min-w-[14rem] flex-1">
        <label htmlFor={inputId} className="field-label">Crew name</label>
        <input id={inputId} className="field-input" value={name} onChange={(e) => setName(e.target.value)} maxLength={80} {...describedBy(inputId, nameError)} />
        {nameError ? <p id={`${inputId}-error`} className="field-error" role="alert">Crew name: {nameError}</p> : null}
      </div>
      <button type="submit" className="btn btn-primary" disabled={save.isPending}>{save.isPending ? 'Saving…' : 'Save name'}</button>
      <button type="button" className="btn btn-quiet" onClick={() => { setEditing(false); setTheirs(null); save.reset(); }}>Cancel</button>
      {theirs ? (
        <div className="w-full">
          <ConflictNotice
            what="crew name"
            theirs={theirs}
            busy={save.isPending}
            onKeepMine={() => save.mutate(theirs.version)}
            onTakeTheirs={() => {
              setEditing(false);
              setTheirs(null);
              void qc.invalidateQueries({ queryKey: crewKeys.all });
            }}
          >
            <p className="mt-1">Their name: <strong>{theirs.name}</strong></p>
          </ConflictNotice>
        </div>
      ) : null}
      {save.error && !isConflict(save.error) && !nameError ? <p className="field-error w-full" role="alert">{(save.error as Error).message}</p> : null}
    </form>
  );
}

function MemberRow({ crew, member, onNotice }: { crew: CrewDetailDto; member: MemberDto; onNotice: (t: string, tone?: 'ok' | 'alert') => void }) {
  const qc = useQueryClient();
  const isOwner = crew.role === 'owner';
  // The server refuses it too; the page just does not offer it.
  const lastOwner = member.role === 'owner' && crew.members.filter((m) => m.role === 'owner').length === 1;
  const selectId = useId();
  const refresh = () => qc.invalidateQueries({ queryKey: crewKeys.all });
  const role = useMutation({
    mutationFn: (next: CrewRoleName) => api.changeRole(crew.id, member.userId, next, member.version),
    onSuccess: (m) => {
      onNotice(`${m.name} is now ${WITH_ARTICLE[m.role]}.`);
      void refresh();
    },
    onError: (e) => {
      onNotice(isConflict(e) ? `Someone changed ${member.name}’s membership meanwhile; the list now shows it as it is.` : (e as Error).message, 'alert');
      void refresh();
    },
  });
  const remove = useMutation({
    mutationFn: () => api.removeMember(crew.id, member.userId, member.version),
    onSuccess: () => {
      if (member.isYou) {
        window.location.assign('/crew');
        return;
      }
      onNotice(`${member.name} was removed from ${crew.name}.`);
      void refresh();
    },
    onError: (e) => {
      onNotice(isConflict(e) ? `Someone changed ${member.name}’s membership meanwhile; look again before removing.` : (e as Error).message, 'alert');
      void refresh();
    },
  });
  const removeQuestion = member.isYou ? `Leave the crew “${crew.name}”? You will no longer see its rigs and trips.` : `Remove ${member.name} from “${crew.name}”? They will no longer see its rigs and trips.`;

  return (
    <li className="flex flex-col gap-3 py-4 sm:flex-row sm:items-center sm:justify-between" data-member={member.email}>
      <div className="min-w-0">
        <p className="font-bold">
          {member.name} {member.isYou ? <span className="font-semibold text-slate-text">(you)</span> : null}
        </p>
        <p className="truncate text-sm text-slate-text">{member.email}</p>
        {lastOwner && isOwner ? <p className="text-sm text-slate-text">The crew’s only owner: make someone else owner before changing this role or leaving.</p> : null}
      </div>
      <div className="flex flex-wrap items-center gap-2">
        {isOwner ? (
          <>
            <label htmlFor={selectId} className="sr-only">Role of {member.name}</label>
            <select
              id={selectId}
              className="field-input w-auto min-w-[8.5rem]"
              value={member.role}
              disabled={role.isPending || lastOwner}
              onChange={(e) => role.mutate(e.target.value as CrewRoleName)}
            >
              {CREW_ROLES.map((r) => <option key={r} value={r}>{ROLE_LABEL[r]}</option>)}
            </select>
          </>
        ) : (
          <RoleBadge role={member.role} />
        )}
        {(isOwner || member.isYou) && !lastOwner ? (
          <AskFirst buttonClassName="btn btn-quiet text-alert" label={member.isYou ? 'Leave crew' : 'Remove'} question={removeQuestion} confirmLabel={member.isYou ? 'Leave crew' : 'Remove'} onConfirm={() => remove.mutate()} busy={remove.isPending} />
        ) : null}
      </div>
    </li>
  );
}

function InviteForm({ crew, onNotice }: { crew: CrewDetailDto; onNotice: (t: string) => void }) {
  const qc = useQueryClient();
  const { register, handleSubmit, reset, setError, formState: { errors, isSubmitting } } = useForm<InvitationCreateInput>({
    resolver: zodResolver(invitationCreateSchema),
    defaultValues: { email: '', role: 'editor' },
  });
  const [formError, setFormError] = useState<string | null>(null);
  const onSubmit = handleSubmit(async (values) => {
    setFormError(null);
    try {
      const inv = await api.invite(crew.id, values);
      reset({ email: '', role: values.role });
      onNotice(`Invitation sent to ${inv.email}. The link works once, for 7 days.`);
      void qc.invalidateQueries({ queryKey: crewKeys.all });
    } catch (e) {
      const emailIssue = issueFor(e, 'email');
      const roleIssue = issueFor(e, 'role');
      if (emailIssue) setError('email', { message: emailIssue });
      if (roleIssue) setError('role', { message: roleIssue });
      setFormError((e as Error).message);
    }
  });
  return (
    <form onSubmit={onSubmit} noValidate aria-label="Invite someone" className="grid gap-3 sm:grid-cols-[1fr_11rem_auto] sm:items-start">
      <Field id="invite-email" label="E-mail" error={errors.email?.message}>
        <input id="invite-email" type="email" autoComplete="off" className="field-input" placeholder="name@example.com" {...describedBy('invite-email', errors.email?.message)} {...register('email')} />
      </Field>
      <Field id="invite-role" label="Role" error={errors.role?.message}>
        <select id="invite-role" className="field-input" {...describedBy('invite-role', errors.role?.message)} {...register('role')}>
          {CREW_ROLES.map((r) => <option key={r} value={r}>{ROLE_LABEL[r]}</option>)}
        </select>
      </Field>
      <div className="sm:pt-[1.6rem]">
        <button type="submit" className="btn btn-primary w-full sm:w-auto" disabled={isSubmitting}>{isSubmitting ? 'Sending…' : 'Send invitation'}</button>
      </div>
      {formError && !errors.email && !errors.role ? <p className="field-error sm:col-span-3" role="alert">{formError}</p> : null}
    </form>
  );
}

function InvitationRow({ inv, onNotice }: { inv: InvitationDto; onNotice: (t: string, tone?: 'ok' | 'alert') => void }) {
  const qc = useQueryClient();
  const refresh = () => qc.invalidateQueries({ queryKey: crewKeys.all });
  const onError = (e: unknown) => {
    onNotice(isConflict(e) ? `The invitation for ${inv.email} changed meanwhile; the list now shows it as it is.` : (e as Error).message, 'alert');
    void refresh();
  };
  const resend = useMutation({
    mutationFn: () => api.resendInvitation(inv.id, inv.version),
    onSuccess: () => {
      onNotice(`A fresh link went to ${inv.email}; the earlier link no longer works.`);
      void refresh();
    },
    onError,
  });
  const revoke = useMutation({
    mutationFn: () => api.revokeInvitation(inv.id, inv.version),
    onSuccess: () => {
      onNotice(`The invitation for ${inv.email} was withdrawn.`);
      void refresh();
    },
    onError,
  });
  const expired = inv.status === 'expired';
  return (
    <li className="flex flex-col gap-2 py-3 sm:flex-row sm:items-center sm:justify-between" data-invitation={inv.email}>
      <div className="min-w-0">
        <p className="truncate font-bold">{inv.email}</p>
        <p className="text-sm text-slate-text">
          {ROLE_LABEL[inv.role]} ·{' '}
          {expired ? <span className="font-bold text-alert">expired {formatDistanceToNowStrict(new Date(inv.expiresAt), { addSuffix: true })}</span> : <>expires {formatDistanceToNowStrict(new Date(inv.expiresAt), { addSuffix: true })}</>}
          {inv.invitedBy ? <> · by {inv.invitedBy}</> : null}
        </p>
      </div>
      <div className="flex gap-2">
        <button type="button" className="btn btn-quiet" onClick={() => resend.mutate()} disabled={resend.isPending || revoke.isPending}>{resend.isPending ? 'Sending…' : 'Resend'}</button>
        <button type="button" className="btn btn-quiet text-alert" onClick={() => revoke.mutate()} disabled={resend.isPending || revoke.isPending}>Revoke</button>
      </div>
    </li>
  );
}

function NewCrewForm() {
  const qc = useQueryClient();
  const { register, handleSubmit, reset, formState: { errors, isSubmitting } } = useForm<{ name: string }>({ resolver: zodResolver(crewCreateSchema), defaultValues: { name: '' } });
  const [error, setErr] = useState<string | null>(null);
  const onSubmit = handleSubmit(async ({ name }) => {
    setErr(null);
    try {
      await api.createCrew(name);
      reset();
      await qc.invalidateQueries({ queryKey: crewKeys.all });
    } catch (e) {
      setErr((e as Error).message);
    }
  });
  return (
    <details className="card mt-5 p-4">
      <summary className="cursor-pointer font-bold">Start another crew</summary>
      <p className="mt-2 text-sm text-slate-text">For a second household or a shared rig with friends. You become its owner.</p>
      <form onSubmit={onSubmit} noValidate className="mt-3 flex flex-wrap items-start gap-2" aria-label="Start another crew">
        <Field id="new-crew" label="Crew name" error={errors.name?.message ?? error ?? undefined} className="min-w-[14rem] flex-1">
          <input id="new-crew" className="field-input" {...describedBy('new-crew', errors.name?.message)} {...register('name')} />
        </Field>
        <div className="pt-[1.6rem]"><button type="submit" className="btn btn-quiet" disabled={isSubmitting}>Create crew</button></div>
      </form>
    </details>
  );
}

function CrewBody({ crewId, crews, joined }: { crewId: string; crews: CrewSummaryDto[]; joined: boolean }) {
  const crew = useQuery(crewQuery(crewId));
  const [notice, setNotice] = useState<{ text: string; tone: 'ok' | 'alert' } | null>(() => {
    const c = crews.find((x) => x.id === crewId);
    return joined && c ? { text: `Welcome to ${c.name}. You joined as ${WITH_ARTICLE[c.role]}; its rigs are under Rigs.`, tone: 'ok' } : null;
  });
  const onNotice = (text: string, tone: 'ok' | 'alert' = 'ok') => setNotice({ text, tone });
  if (crew.isPending) return <LoadingState label="Loading the crew…" />;
  if (crew.isError) return <ErrorState error={crew.error} title="The crew could not be loaded." onRetry={() => void crew.refetch()} />;
  const c = crew.data;
  const isOwner = c.role === 'owner';
  return (
    <>
      <CrewSwitcher crews={crews} />
      <section className="card p-5 sm:p-6" aria-label="Crew">
        <CrewName crew={c} />
        <p className="mt-2 text-slate-text">Everyone here shares the crew’s rigs and load list. Installers are never members: share a single rig with them from the rig’s Installers section.</p>
        {notice ? <Notice text={notice.text} tone={notice.tone} onClose={() => setNotice(null)} /> : null}

        <h2 className="mt-6 text-lg">Members <span className="font-semibold text-slate-text">({c.members.length})</span></h2>
        <ul className="divide-y divide-sand-dark" aria-label="Members">
          {c.members.map((m) => <MemberRow key={m.userId} crew={c} member={m} onNotice={onNotice} />)}
        </ul>

        <details className="mt-2 text-sm">
          <summary className="cursor-pointer font-bold text-slate-text">What each role can do</summary>
          <dl className="mt-2 grid grid-cols-[5.5rem_1fr] gap-y-1">
            {CREW_ROLES.map((r) => (
              <Fragment key={r}><dt className="font-bold">{ROLE_LABEL[r]}</dt><dd>{ROLE_TEXT[r]}</dd></Fragment>
            ))}
          </dl>
        </details>
      </section>

      {isOwner ? (
        <section className="card mt-5 p-5 sm:p-6" aria-labelledby="invite-h">
          <h2 id="invite-h" className="text-lg">Invite someone</h2>
          <p className="mb-3 text-sm text-slate-text">They get an e-mail with a link that works once, for 7 days, and only with that address.</p>
          <InviteForm crew={c} onNotice={onNotice} />
          <h3 className="mt-6 text-base">Open invitations</h3>
          {c.invitations.length === 0 ? (
            <p className="mt-1 text-sm text-slate-text">No open invitations.</p>
          ) : (
            <ul className="divide-y divide-sand-dark" aria-label="Open invitations">
              {c.invitations.map((inv) => <InvitationRow key={inv.id} inv={inv} onNotice={onNotice} />)}
            </ul>
          )}
        </section>
      ) : (
        <p className="mt-4 text-sm text-slate-text">Only the crew’s owners can invite people or change roles.</p>
      )}
      <NewCrewForm />
    </>
  );
}

/** The /crew page: switch crews, members and roles, invitations, rename; `joined` right after accepting an invitation. */
function CrewPage({ joined = false }: { joined?: boolean }) {
  const crews = useQuery(crewsQuery());
  if (crews.isPending) return <LoadingState label="Loading your crews…" />;
  if (crews.isError) return <ErrorState error={crews.error} title="Your crews could not be loaded." onRetry={() => void crews.refetch()} />;
  const active = crews.data.find((c) => c.active) ?? crews.data[0];
  if (!active) {
    return (
      <EmptyState title="You are not in a crew">
        <p>Ask a crew’s owner to invite you, or start a crew of your own.</p>
        <NewCrewForm />
      </EmptyState>
    );
  }
  return <CrewBody key={active.id} crewId={active.id} crews={crews.data} joined={joined} />;
}

export default withQueryClient(CrewPage);
