"use client";
import { useActionState } from "react";
import { Alert, Button, Field, Input, Select } from "@/components/ui";
import { FormError, fieldError } from "@/app/(auth)/sign-in/_components/form-error";
import { FORM_VISIBLE } from "@/lib/form-visible";
import { ROLE_LABEL, STAFF_ROLES } from "@/lib/permissions";
import { inviteStaffAction } from "../actions";

export function InviteForm({ shop }: { shop: string }) {
  const [state, action, pending] = useActionState(inviteStaffAction, null);
  const values = state && !state.ok ? state.values : undefined;
  return (
    <form action={action} className="space-y-4" noValidate>
      <input type="hidden" name="shop" value={shop} />
      <FormError state={state} visible={FORM_VISIBLE.inviteStaff} />
      {state?.ok ? <Alert tone="success">Invitation sent to {state.data.email}. The link lasts 7 days and works once.</Alert> : null}
      <div className="grid gap-4 sm:grid-cols-3">
        <Field id="invite-name" label="Name" error={fieldError(state, "name")} required>
          <Input name="name" autoComplete="off" defaultValue={values?.name} maxLength={120} />
        </Field>
        <Field id="invite-email" label="E-mail" error={fieldError(state, "email")} required>
          <Input name="email" type="email" inputMode="email" autoComplete="off" defaultValue={values?.email} />
        </Field>
        <Field id="invite-role" label="Role" error={fieldError(state, "role")} required>
          <Select name="role" defaultValue={values?.role ?? "technician"}>
            {STAFF_ROLES.map((r) => (
              <option key={r} value={r}>
                {ROLE_LABEL[r]}
              </option>
            ))}
          </Select>
        </Field>
      </div>
      <Button type="submit" loading={pending}>
        Send invitation
      </Button>
    </form>
  );
}
