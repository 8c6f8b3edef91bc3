import { route } from "@/lib/route";
import { startInvoiceCheckout } from "@/lib/server/invoice-payments";

/**
 * POST /api/invoices/[invoice]/checkout — the machine's owner starts paying the balance: answers
 * `{url}`, the payment service's page. The amount is worked out here, never taken from the client.
 */
export const POST = route<never, { invoice: string }>({
  run: async ({ params, actor }) => startInvoiceCheckout(actor, params.invoice),
});
