import { z } from "zod";
import { route } from "@/lib/route";
import { ids } from "@/lib/server/access";
import { invoiceView } from "@/lib/server/invoice-views";

/** GET /api/jobs/[job]/invoice — the job's invoice, payments, deposits and authorisation record (owner and desk). */
export const GET = route({ params: z.object({ job: ids.job }), resource: "jobMoney", permission: "invoice:view" }, ({ found }) =>
  invoiceView(found.job.id, found.audience === "shop" ? "shop" : "owner"),
);
