"use client";
import { Printer } from "lucide-react";
import { Button } from "@/components/ui";

/** Prints the invoice on the page (its print rules hide everything else). */
export function PrintButton() {
  return (
    <Button variant="secondary" onClick={() => window.print()} icon={<Printer aria-hidden className="size-5" />}>
      Print
    </Button>
  );
}
