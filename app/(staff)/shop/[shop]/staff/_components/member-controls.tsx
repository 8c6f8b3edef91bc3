"use client";
import { useActionState, useState } from "react";
import { Button, Select } from "@/components/ui";
import { ROLE_LABEL, STAFF_ROLES, type StaffRole } from "@/lib/permissions";
import { changeStaffRoleAction, deactivateStaffAction, reactivateStaffAction, revokeInviteAction } from "../actions";
import type { ActionState } from "@/lib/action";

/** The action's message, with the field messages (these forms have no visible field but the role). */
function Problem({ state }: { state: ActionState }) {
  if (!state || state.ok) return null;
  const details = Object.values(state.error.fields ?? {}).flat();
  return (
    <span role="alert" className="text-sm text-rust">
      {details.length ? details.join(" ") : state.error.message}
    </span>
  );
}

/** Role of one member: a select and a save button (their sessions end when it changes). */
export function RoleForm({ shop, user, name, role }: { shop: string; user: number; name: string; role: StaffRole }) {
  const [state, action, pending] = useActionState(changeStaffRoleAction, null);
  return (
    <form action={action} className="flex flex-col gap-1">
      <input type="hidden" name="shop" value={shop} />
      <input type="hidden" name="user" value={user} />
      <div className="flex flex-wrap items-center gap-2">
        <label htmlFor={`role-${user}`} className="sr-only">
          Role of {name}
        </label>
        <Select id={`role-${user}`} name="role" defaultValue={role}>
          {STAFF_ROLES.map((r) => (
            <option key={r} value={r}>
              {ROLE_LABEL[r]}
            </option>
          ))}
        </Select>
        <Button type="submit" variant="secondary" loading={pending}>
          Save role<span className="sr-only"> of {name}</span>
        </Button>
      </div>
      <Problem state={state} />
    </form>
  );
}

/** Take someone off the staff (after a second, explicit click: their sessions end at once), or put them back. */
export function ActiveToggle({ shop, user, name, active }: { shop: string; user: number; name: string; active: boolean }) {
  const [state, action, pending] = useActionState(active ? deactivateStaffAction : reactivateStaffAction, null);
  const [confirming, setConfirming] = useState(false);
  if (active && !confirming) {
    return (
      <div className="flex flex-col items-start gap-1">
        <Button type="button" variant="danger" onClick={() => setConfirming(true)}>
          Deactivate<span className="sr-only"> {name}</span>
        </Button>
        <Problem state={state} />
      </div>
    );
  }
  return (
    <form action={action} className="flex flex-col items-start gap-1" aria-label={active ? `Confirm deactivating ${name}` : undefined}>
      <input type="hidden" name="shop" value={shop} />
      <input type="hidden" name="user" value={user} />
      {active ? <p className="text-sm text-ink">Take {name} off the staff? They are signed out everywhere at once; their work stays on the jobs.</p> : null}
      <div className="flex flex-wrap gap-2">
        <Button type="submit" variant={active ? "danger" : "secondary"} loading={pending}>
          {active ? "Yes, deactivate" : "Reactivate"}
          <span className="sr-only"> {name}</span>
        </Button>
        {active ? (
          <Button type="button" variant="ghost" onClick={() => setConfirming(false)}>
            Keep<span className="sr-only"> {name}</span>
          </Button>
        ) : null}
      </div>
      <Problem state={state} />
    </form>
  );
}

export function RevokeInvite({ shop, invite, email }: { shop: string; invite: number; email: string }) {
  const [state, action, pending] = useActionState(revokeInviteAction, null);
  return (
    <form action={action} className="flex flex-col items-start gap-1">
      <input type="hidden" name="shop" value={shop} />
      <input type="hidden" name="invite" value={invite} />
      <Button type="submit" variant="ghost" loading={pending}>
        Withdraw<span className="sr-only"> the invitation to {email}</span>
      </Button>
      <Problem state={state} />
    </form>
  );
}
