import { route } from "@/lib/route";
import { invoiceJobAccess } from "@/lib/server/invoices";
import { invoiceView } from "@/lib/server/invoice-views";

/** GET /api/jobs/[job]/invoice — the job's invoice, payments, deposits and authorisation record (owner and desk). */
export const GET = route<never, { job: string }>({
  run: async ({ params, actor }) => {
    const { job, audience } = await invoiceJobAccess(actor, params.job);
    return invoiceView(job.id, audience === "shop" ? "shop" : "owner");
  },
});
