import { FileDown } from "lucide-react";
import { ButtonLink } from "@/components/ui";
import { PrintButton } from "./print-button";

/** The invoice page's header actions, for the desk and the owner alike: print it, or get the PDF. */
export function InvoiceActions({ invoicePublicId }: { invoicePublicId: string }) {
  return (
    <>
      <PrintButton />
      <ButtonLink href={`/api/invoices/${invoicePublicId}/pdf`} variant="secondary" icon={<FileDown aria-hidden className="size-5" />} prefetch={false}>
        PDF
      </ButtonLink>
    </>
  );
}
