import { useState } from 'react';
import { useMutation, useQuery, useQueryClient } from '@tanstack/react-query';
import { useForm } from 'react-hook-form';
import { zodResolver } from '@hookform/resolvers/zod';
import { formatInstant, type ZoneClock } from '../../lib/clock';
import { useUserZone } from '../../components/ui/useUserZone';
import { withQueryClient } from '../../components/ui/QueryProvider';
import { EmptyState, ErrorState, LoadingState } from '../../components/ui/States';
import { AskFirst } from '../../components/ui/AskFirst';
import { Field, describedBy } from '../../components/ui/Field';
import { ApiError } from '../../lib/query-client';
import { grantCreateSchema, type GrantCreateInput, type GrantDto, type ShareInviteDto } from '../../domain/crews/crews.schema';
import { grantRig, revokeGrant } from './installer.api';
import { grantKeys, rigGrantsQuery } from './installer.queries';

function GrantRow({ grant, canManage, onDone, zone }: { grant: GrantDto; zone: ZoneClock; canManage: boolean; onDone: (t: string, tone?: 'ok' | 'alert') => void }) {
  const qc = useQueryClient();
  const revoke = useMutation({
    mutationFn: () => revokeGrant(grant.id),
    onSuccess: () => {
      onDone(`${grant.installer.name} no longer has access to this rig.`);
      void qc.invalidateQueries({ queryKey: grantKeys.all });
    },
    onError: (e) => {
      onDone((e as Error).message, 'alert');
      void qc.invalidateQueries({ queryKey: grantKeys.all });
    },
  });
  return (
    <li className="flex flex-col gap-2 py-3 sm:flex-row sm:items-center sm:justify-between" data-grant={grant.installer.email}>
      <div className="min-w-0">
        <p className="font-bold">{grant.installer.name}</p>
        <p className="truncate text-sm text-slate-text">{grant.installer.email}</p>
        <p className="text-sm text-slate-text">
          Since {formatInstant(grant.createdAt, zone, 'date')}
          {grant.grantedBy ? <> · shared by {grant.grantedBy}</> : null}
        </p>
      </div>
      {canManage ? (
        <AskFirst
          buttonClassName="btn btn-quiet text-alert"
          label={revoke.isPending ? 'Revoking…' : 'Revoke access'}
          question={`Take ${grant.installer.name}’s access to this rig away? They will no longer see it, its loads, trips or forecasts.`}
          confirmLabel="Revoke access"
          onConfirm={() => revoke.mutate()}
          busy={revoke.isPending}
        />
      ) : null}
    </li>
  );
}

function InvitedRow({ invite, canManage, onDone, zone }: { invite: ShareInviteDto; zone: ZoneClock; canManage: boolean; onDone: (t: string, tone?: 'ok' | 'alert') => void }) {
  const qc = useQueryClient();
  const withdraw = useMutation({
    mutationFn: () => revokeGrant(invite.id),
    onSuccess: () => {
      onDone(`The share with ${invite.email} was withdrawn.`);
      void qc.invalidateQueries({ queryKey: grantKeys.all });
    },
    onError: (e) => {
      onDone((e as Error).message, 'alert');
      void qc.invalidateQueries({ queryKey: grantKeys.all });
    },
  });
  return (
    <li className="flex flex-col gap-2 py-3 sm:flex-row sm:items-center sm:justify-between" data-invited={invite.email}>
      <div className="min-w-0">
        <p className="font-bold [overflow-wrap:anywhere]">Invited {invite.email}</p>
        <p className="text-sm text-slate-text">
          Since {formatInstant(invite.createdAt, zone, 'date')}
          {invite.invitedBy ? <> · shared by {invite.invitedBy}</> : null} · shows as theirs once an installer with this e-mail opens it
        </p>
      </div>
      {canManage ? (
        <AskFirst
          buttonClassName="btn btn-quiet text-alert"
          label={withdraw.isPending ? 'Withdrawing…' : 'Withdraw'}
          question={`Withdraw the share with ${invite.email}? If an installer has this e-mail, they will no longer see this rig.`}
          confirmLabel="Withdraw"
          onConfirm={() => withdraw.mutate()}
          busy={withdraw.isPending}
        />
      ) : null}
    </li>
  );
}

function GrantForm({ rigId, onDone }: { rigId: string; onDone: (t: string) => void }) {
  const qc = useQueryClient();
  const [formError, setFormError] = useState<string | null>(null);
  const { register, handleSubmit, reset, setError, formState: { errors, isSubmitting } } = useForm<GrantCreateInput>({ resolver: zodResolver(grantCreateSchema), defaultValues: { email: '' } });
  const onSubmit = handleSubmit(async (values) => {
    setFormError(null);
    try {
      const answer = await grantRig(rigId, values);
      reset();
      onDone(answer.message);
      void qc.invalidateQueries({ queryKey: grantKeys.all });
    } catch (e) {
      const issue = e instanceof ApiError ? e.issues.find((i) => i.path === 'email') : undefined;
      if (issue) setError('email', { message: (e as Error).message });
      else setFormError((e as Error).message);
    }
  });
  return (
    <form onSubmit={onSubmit} noValidate aria-label="Share with an installer" className="grid gap-3 sm:grid-cols-[1fr_auto] sm:items-start">
      <Field id="grant-email" label="Installer’s e-mail" error={errors.email?.message} hint="The e-mail of their Sunreckon installer account. Every address is listed as invited until an installer with it opens the share.">
        <input id="grant-email" type="email" autoComplete="off" className="field-input" {...describedBy('grant-email', errors.email?.message, true)} {...register('email')} />
      </Field>
      <div className="sm:pt-[1.6rem]"><button type="submit" className="btn btn-primary w-full sm:w-auto" disabled={isSubmitting}>{isSubmitting ? 'Sharing…' : 'Share this rig'}</button></div>
      {formError ? <p className="field-error sm:col-span-2" role="alert">{formError}</p> : null}
    </form>
  );
}

/**
 * The rig page's Installers section: who the rig is shared with, and (for crew owners) sharing
 * and revoking. Mount it with `<RigInstallers client:load rigId={id} />`.
 */
function RigInstallers({ rigId, clock }: { rigId: string; clock?: ZoneClock | null }) {
  const zone = useUserZone(clock);
  const grants = useQuery(rigGrantsQuery(rigId));
  const [notice, setNotice] = useState<{ text: string; tone: 'ok' | 'alert' } | null>(null);
  const onDone = (text: string, tone: 'ok' | 'alert' = 'ok') => setNotice({ text, tone });
  const forbidden = grants.error instanceof ApiError && grants.error.status === 403;
  return (
    <section className="card p-5 sm:p-6" aria-labelledby="installers-h">
      <h2 id="installers-h" className="text-xl">Installers</h2>
      <p className="mt-1 text-slate-text">An installer you share this rig with can read its power system, loads, trips and saved forecasts and prepare a proposal. They cannot change anything, and never join the crew.</p>
      {notice ? (
        <p role={notice.tone === 'alert' ? 'alert' : 'status'} className={`mt-3 rounded-[10px] border-l-4 px-4 py-3 font-semibold ${notice.tone === 'alert' ? 'border-alert bg-[#fbeae6]' : 'border-moss bg-[#eef5ef]'}`}>{notice.text}</p>
      ) : null}
      {grants.isPending ? (
        <LoadingState label="Loading installers…" />
      ) : forbidden ? (
        <p className="mt-3 text-slate-text">The crew decides who else sees this rig.</p>
      ) : grants.isError ? (
        <ErrorState error={grants.error} title="The installers could not be loaded." onRetry={() => void grants.refetch()} />
      ) : (
        <GrantsBody zone={zone} rigId={rigId} grants={grants.data.grants} invited={grants.data.invited} canManage={grants.data.canManage} onDone={onDone} />
      )}
    </section>
  );
}

function GrantsBody({
  zone,
  rigId,
  grants,
  invited,
  canManage,
  onDone,
}: {
  zone: ZoneClock;
  rigId: string;
  grants: GrantDto[];
  invited: ShareInviteDto[];
  canManage: boolean;
  onDone: (t: string, tone?: 'ok' | 'alert') => void;
}) {
  return (
    <>
      {grants.length === 0 && invited.length === 0 ? (
        <div className="mt-4"><EmptyState title="Not shared with an installer">{canManage ? <p>Add your installer’s e-mail below to let them size an upgrade from your real loads and trips.</p> : null}</EmptyState></div>
      ) : (
        <ul className="mt-3 divide-y divide-sand-dark" aria-label="Installers with access">
          {grants.map((g) => <GrantRow key={g.id} zone={zone} grant={g} canManage={canManage} onDone={onDone} />)}
          {invited.map((i) => <InvitedRow key={i.id} zone={zone} invite={i} canManage={canManage} onDone={onDone} />)}
        </ul>
      )}
      {canManage ? (
        <div className="mt-5 border-t border-sand-dark pt-5"><GrantForm rigId={rigId} onDone={onDone} /></div>
      ) : (
        <p className="mt-4 text-sm text-slate-text">Only the crew’s owners can share this rig or take access away.</p>
      )}
    </>
  );
}

export default withQueryClient(RigInstallers);
