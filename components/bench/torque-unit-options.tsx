import { TORQUE_UNITS } from "@/lib/torque";

/** The torque units as <option>s, for the bench's torque selects. */
export function TorqueUnitOptions() {
  return (
    <>
      {TORQUE_UNITS.map((u) => (
        <option key={u.id} value={u.id}>
          {u.label}
        </option>
      ))}
    </>
  );
}
