import { AppError } from "@/lib/errors";
import { route } from "@/lib/route";
import { invoiceAccess } from "@/lib/server/invoices";
import { renderInvoicePdf } from "@/lib/server/invoice-pdf";
import { invoiceView } from "@/lib/server/invoice-views";

/** GET /api/invoices/[invoice]/pdf — the invoice as a PDF, for the job's owner and the desk only. */
export const GET = route<never, { invoice: string }>({
  run: async ({ params, actor }) => {
    const { invoice, job, audience } = await invoiceAccess(actor, params.invoice);
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
  },
});
