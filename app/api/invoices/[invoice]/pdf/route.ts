import { z } from "zod";
import { AppError } from "@/lib/errors";
import { route } from "@/lib/route";
import { ids } from "@/lib/server/access";
import { renderInvoicePdf } from "@/lib/server/invoice-pdf";
import { invoiceView } from "@/lib/server/invoice-views";

/** GET /api/invoices/[invoice]/pdf — the invoice as a PDF, for the job's owner and the desk only. */
export const GET = route({ params: z.object({ invoice: ids.invoice }), resource: "invoice", permission: "invoice:view" }, async ({ found }) => {
  const { invoice, job, audience } = found;
  const view = await invoiceView(job.id, audience === "shop" ? "shop" : "owner");
  if (view.invoice?.publicId !== invoice.publicId) throw new AppError("not_found", "This invoice was cancelled; the job's current invoice is on its page.");
  const pdf = await renderInvoicePdf(view);
  return new Response(new Uint8Array(pdf), {
    headers: {
      "content-type": "application/pdf",
      "content-disposition": `inline; filename="${view.invoice.label}.pdf"`,
      "cache-control": "private, no-store",
      "x-content-type-options": "nosniff",
    },
  });
});
