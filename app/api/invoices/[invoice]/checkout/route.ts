import { z } from "zod";
import { route } from "@/lib/route";
import { ids } from "@/lib/server/access";
import { startInvoiceCheckout } from "@/lib/server/invoice-payments";

/**
 * POST /api/invoices/[invoice]/checkout — the machine's owner starts paying the balance: answers
 * `{url}`, the payment service's page. The amount is worked out here, never taken from the client.
 */
export const POST = route({ params: z.object({ invoice: ids.invoice }), resource: "invoice", permission: "invoice:pay" }, ({ actor, found }) => startInvoiceCheckout(actor, found));
