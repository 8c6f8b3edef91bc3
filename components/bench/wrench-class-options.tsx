import { WRENCH_CLASSES, WRENCH_CLASS_IDS } from "@/lib/torque-check";

/** The torque wrench classes (ISO 6789-1) as <option>s, for the torque form and the bench settings. */
export function WrenchClassOptions() {
  return (
    <>
      {WRENCH_CLASS_IDS.map((c) => (
        <option key={c} value={c}>
          {WRENCH_CLASSES[c].label}
        </option>
      ))}
    </>
  );
}
