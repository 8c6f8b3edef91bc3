/**
 * A plausibility warning (lib/torque-check.ts) with the box that confirms the value against the
 * maker's manual: the server refuses the value until it is ticked, and then keeps it.
 */
export function PlausibilityConfirm({ warning }: { warning: string }) {
  return (
    <div className="space-y-2 rounded-lg border border-line p-3" role="status">
      <p>
        <strong>Check this value:</strong> {warning}.
      </p>
      <label className="flex min-h-tap items-center gap-3">
        <input type="checkbox" name="plausibleChecked" className="size-6 accent-oil" />
        <span>Value checked against the maker&apos;s manual</span>
      </label>
    </div>
  );
}
