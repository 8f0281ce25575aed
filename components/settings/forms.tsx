'use client';

import { useActionState, useEffect, useRef } from 'react';
import { changeRoleAction, createTokenAction, inviteMemberAction, removeMemberAction, revokeInvitationAction, revokeTokenAction } from '@/app/(lab)/settings/actions';
import { Button } from '@/components/ui/button';
import { Field } from '@/components/ui/field';
import { FormStatus } from '@/components/ui/form-status';
import { CheckRow, OneTimeSecret, RowActionButton, type CheckOption } from './one-time-secret';
import type { FormState } from '@/lib/form-state';
import { ROLE_LABELS, ROLES, type Role } from '@/lib/auth/permissions';

function RoleSelect({ name, defaultValue, label }: { name: string; defaultValue?: Role; label: string }) {
  return (
    <select name={name} defaultValue={defaultValue} aria-label={label} className="rounded-md border border-line bg-canvas px-2 py-1.5 text-sm text-ink">
      {ROLES.map((r) => (
        <option key={r} value={r}>
          {ROLE_LABELS[r]}
        </option>
      ))}
    </select>
  );
}

export function MemberControls({ userId, role, name }: { userId: string; role: Role; name: string }) {
  const [roleState, roleAction, rolePending] = useActionState<FormState, FormData>(changeRoleAction, {});
  const [rmState, rmAction, rmPending] = useActionState<FormState, FormData>(removeMemberAction, {});
  return (
    <div className="flex flex-wrap items-center gap-2">
      <form action={roleAction} className="flex items-center gap-2">
        <input type="hidden" name="userId" value={userId} />
        <RoleSelect name="role" defaultValue={role} label={`Role of ${name}`} />
        <Button type="submit" tone="quiet" disabled={rolePending}>
          Change
        </Button>
      </form>
      <form
        action={rmAction}
        onSubmit={(e) => {
          if (!window.confirm(`Remove ${name} from this lab?`)) e.preventDefault();
        }}
      >
        <input type="hidden" name="userId" value={userId} />
        <Button type="submit" tone="danger" disabled={rmPending}>
          Remove
        </Button>
      </form>
      <FormStatus small state={roleState.message ? roleState : rmState} />
    </div>
  );
}

export function InviteForm() {
  const [state, action, pending] = useActionState<FormState, FormData>(inviteMemberAction, {});
  const ref = useRef<HTMLFormElement>(null);
  useEffect(() => {
    if (state.ok) ref.current?.reset();
  }, [state]);
  return (
    <form ref={ref} action={action} className="flex flex-wrap items-end gap-3" noValidate>
      <Field label="E-mail" name="email" type="email" defaultValue={state.ok ? undefined : state.values?.email} errors={state.fieldErrors?.email} className="min-w-64 flex-1" />
      <label className="text-sm">
        <span className="mb-1 block text-muted">Role</span>
        <RoleSelect name="role" defaultValue="tester" label="Role" />
      </label>
      <Button type="submit" disabled={pending}>
        {pending ? 'Sending…' : 'Send invitation'}
      </Button>
      <FormStatus small state={state} />
    </form>
  );
}

export function RevokeInvitationButton({ id }: { id: string }) {
  return <RowActionButton id={id} label="Withdraw" tone="quiet" action={revokeInvitationAction} />;
}

const TOKEN_SCOPES: CheckOption[] = [
  { name: 'scopeRead', label: 'read', defaultChecked: true },
  { name: 'scopeCapture', label: 'capture:write', defaultChecked: true },
  { name: 'scopeDelete', label: 'capture:delete', title: 'Delete capture sets this token created' },
  { name: 'scopeExport', label: 'export', title: 'Download the readings CSV' },
];

export function CreateTokenForm() {
  const [state, action, pending] = useActionState<FormState, FormData>(createTokenAction, {});
  return (
    <div className="space-y-3">
      <form action={action} className="flex flex-wrap items-end gap-3" noValidate>
        <Field label="Token name" name="name" placeholder="e.g. Bench rig 2" errors={state.fieldErrors?.name} className="min-w-64 flex-1" />
        <CheckRow legend="Scopes" options={TOKEN_SCOPES} />
        <Button type="submit" disabled={pending}>
          Create token
        </Button>
      </form>
      <OneTimeSecret state={state} groupError="scopes" testId="new-token" />
    </div>
  );
}

export function RevokeTokenButton({ id }: { id: string }) {
  return <RowActionButton id={id} label="Revoke" tone="danger" action={revokeTokenAction} />;
}
