"use client";
import { useActionState, useState } from "react";
import { Alert, Button, Field, Input, Select, Textarea } from "@/components/ui";
import type { CustomerSearchResult } from "@/lib/schemas/check-in";
import { checkInMachine } from "../actions";
import { FormSection, fieldError } from "./form-bits";
import { MachineSection, type MachinePick } from "./machine-section";
import { OwnerSection, type OwnerMode } from "./owner-section";
import { FORM_VISIBLE, formBanner } from "@/lib/form-visible";

export type StaffOption = { id: number; name: string; role: "owner" | "service_writer" | "technician" };

type Props = {
  shopSlug: string;
  /** Today on the shop's calendar (YYYY-MM-DD): the earliest promised date. */
  today: string;
  staff: StaffOption[];
  defaultTechnicianId: number | null;
};

/** The check-in form: owner, machine, then the job itself. One column, thumb-sized throughout. */
export function CheckInForm({ shopSlug, today, staff, defaultTechnicianId }: Props) {
  const [state, action, pending] = useActionState(checkInMachine, null);
  const [ownerMode, setOwnerMode] = useState<OwnerMode>("existing");
  const [customer, setCustomer] = useState<CustomerSearchResult | null>(null);
  const [machinePick, setMachinePick] = useState<MachinePick | null>(null);
  const values = state && !state.ok ? state.values : undefined;
  const err = (name: string) => fieldError(state, name);
  const technicians = staff.filter((s) => s.role === "technician");
  const others = staff.filter((s) => s.role !== "technician");

  const chooseCustomer = (c: CustomerSearchResult | null) => {
    setCustomer(c);
    // One machine on file is almost always the one coming in; more than one, the writer picks.
    setMachinePick(c && c.machines.length === 1 ? c.machines[0]!.id : null);
  };

  return (
    <form action={action} className="space-y-6" noValidate>
      <input type="hidden" name="shop" value={shopSlug} />
      {state && !state.ok ? (
        <Alert tone="error">{formBanner(state.error, FORM_VISIBLE.checkIn)}</Alert>
      ) : null}

      <OwnerSection shopSlug={shopSlug} state={state} mode={ownerMode} onModeChange={setOwnerMode} customer={customer} onCustomerChange={chooseCustomer} />
      <MachineSection state={state} ownerMode={ownerMode} customer={customer} pick={machinePick} onPickChange={setMachinePick} />

      <FormSection id="job-heading" title="The job">
        <Field id="concern" label="Owner's concern" hint="In the owner's own words, e.g. “Hard to start when hot”" required error={err("concern")}>
          <Textarea name="concern" rows={4} maxLength={4000} defaultValue={values?.concern} />
        </Field>
        <Field id="intake-notes" label="Condition at check-in" hint="Scratches, missing parts, fuel level… Photos come next, on the job page." error={err("intakeNotes")}>
          <Textarea name="intakeNotes" rows={3} maxLength={4000} defaultValue={values?.intakeNotes} />
        </Field>
        <Field id="promised-on" label="Promised for" hint="Optional. Today or later." error={err("promisedOn")}>
          <Input name="promisedOn" type="date" min={today} defaultValue={values?.promisedOn} />
        </Field>
        <Field id="technician" label="Technician" error={err("technicianId")}>
          <Select name="technicianId" key={`technician-${values?.technicianId ?? ""}`} defaultValue={values?.technicianId ?? (defaultTechnicianId ? String(defaultTechnicianId) : "")}>
            <option value="">Not assigned yet</option>
            {technicians.length ? (
              <optgroup label="Technicians">
                {technicians.map((s) => (
                  <option key={s.id} value={s.id}>
                    {s.name}
                  </option>
                ))}
              </optgroup>
            ) : null}
            {others.length ? (
              <optgroup label="Other staff">
                {others.map((s) => (
                  <option key={s.id} value={s.id}>
                    {s.name}
                  </option>
                ))}
              </optgroup>
            ) : null}
          </Select>
        </Field>
      </FormSection>

      <Button type="submit" size="lg" loading={pending} fullWidth>
        Check in machine
      </Button>
    </form>
  );
}
