"use client";
import { Field, Input, Select } from "@/components/ui";
import type { ActionState } from "@/lib/action";
import { MACHINE_KINDS, MACHINE_KIND_LABEL, describeMachine } from "@/lib/machine";
import { type CustomerSearchResult, LATEST_MODEL_YEAR } from "@/lib/schemas/check-in";
import { ChoiceCard, ChoiceGroup, FormSection, fieldError } from "./form-bits";
import type { OwnerMode } from "./owner-section";

/** Which machine: one of the chosen owner's (by id) or a new one. */
export type MachinePick = number | "new";

type Props = {
  state: ActionState;
  ownerMode: OwnerMode;
  customer: CustomerSearchResult | null;
  pick: MachinePick | null;
  onPickChange: (pick: MachinePick) => void;
};

/** Step 2: the machine — one already on file for this owner, or a new one. */
export function MachineSection({ state, ownerMode, customer, pick, onPickChange }: Props) {
  const onFile = ownerMode === "existing" ? (customer?.machines ?? []) : [];
  // A new owner, or one with nothing on file, brings a new machine.
  const effective: MachinePick | null = onFile.length ? pick : "new";
  const waitingForOwner = ownerMode === "existing" && !customer;

  return (
    <FormSection id="machine-heading" title="Machine">
      {waitingForOwner ? (
        <p className="text-ink-muted">Find the owner first: their machines on file are listed here.</p>
      ) : (
        <>
          {effective != null ? <input type="hidden" name="machineMode" value={effective === "new" ? "new" : "existing"} /> : null}
          {typeof effective === "number" ? <input type="hidden" name="machineId" value={effective} /> : null}
          {onFile.length ? (
            <ChoiceGroup id="machine-pick" legend="Which machine?" error={fieldError(state, "machineMode") ?? fieldError(state, "machineId")}>
              {onFile.map((m) => (
                <ChoiceCard
                  key={m.id}
                  name="machinePick"
                  value={String(m.id)}
                  checked={pick === m.id}
                  onChange={() => onPickChange(m.id)}
                  title={describeMachine(m)}
                  detail={[MACHINE_KIND_LABEL[m.kind], m.serial].filter(Boolean).join(" · ")}
                />
              ))}
              <ChoiceCard name="machinePick" value="new" checked={pick === "new"} onChange={() => onPickChange("new")} title="Another machine" detail="Not on file yet" />
            </ChoiceGroup>
          ) : null}
          {effective === "new" ? <NewMachineFields state={state} /> : null}
        </>
      )}
    </FormSection>
  );
}

function NewMachineFields({ state }: { state: ActionState }) {
  // React resets the form after each action; a select takes its defaultValue only when it
  // mounts, so each select is keyed on the value sent back to bring it back after an error.
  const values = state && !state.ok ? state.values : undefined;
  const err = (name: string) => fieldError(state, name);
  return (
    <div className="space-y-4">
      <Field id="machine-kind" label="Kind" required error={err("machineKind")}>
        <Select name="machineKind" key={`kind-${values?.machineKind ?? ""}`} defaultValue={values?.machineKind ?? ""}>
          <option value="">Pick one</option>
          {MACHINE_KINDS.map((k) => (
            <option key={k} value={k}>
              {MACHINE_KIND_LABEL[k]}
            </option>
          ))}
        </Select>
      </Field>
      <Field id="machine-make" label="Make" required error={err("machineMake")}>
        <Input name="machineMake" autoComplete="off" autoCapitalize="words" defaultValue={values?.machineMake} maxLength={60} />
      </Field>
      <Field id="machine-model" label="Model" required error={err("machineModel")}>
        <Input name="machineModel" autoComplete="off" autoCapitalize="words" defaultValue={values?.machineModel} maxLength={80} />
      </Field>
      <Field id="machine-year" label="Year" hint={`Model year, 1900–${LATEST_MODEL_YEAR}`} error={err("machineYear")}>
        <Input name="machineYear" inputMode="numeric" autoComplete="off" maxLength={4} defaultValue={values?.machineYear} />
      </Field>
      <Field id="machine-engine" label="Engine size (cc)" error={err("machineEngineCc")}>
        <Input name="machineEngineCc" inputMode="numeric" autoComplete="off" maxLength={6} defaultValue={values?.machineEngineCc} />
      </Field>
      <Field id="machine-serial" label="Serial number or VIN" error={err("machineSerial")}>
        <Input name="machineSerial" autoComplete="off" autoCapitalize="characters" autoCorrect="off" spellCheck={false} maxLength={64} defaultValue={values?.machineSerial} />
      </Field>
      <Field id="machine-hours" label="Hours" hint="From the hour meter, e.g. 312.4" error={err("machineHours")}>
        <Input name="machineHours" inputMode="decimal" autoComplete="off" maxLength={9} defaultValue={values?.machineHours} />
      </Field>
      <Field id="machine-odometer" label="Odometer" error={err("machineOdometer")}>
        <Input name="machineOdometer" inputMode="numeric" autoComplete="off" maxLength={9} defaultValue={values?.machineOdometer} />
      </Field>
      <Field id="machine-odometer-unit" label="Odometer unit" error={err("machineOdometerUnit")}>
        <Select name="machineOdometerUnit" key={`unit-${values?.machineOdometerUnit ?? ""}`} defaultValue={values?.machineOdometerUnit ?? "mi"}>
          <option value="mi">Miles</option>
          <option value="km">Kilometres</option>
        </Select>
      </Field>
    </div>
  );
}
