import "server-only";
import { mergeCustomers } from "@/db/queries/customer-merge";
import { updateCustomerContact } from "@/db/queries/customers";
import { transaction } from "@/db/transaction";
import type { Actor } from "@/lib/permissions";
import type { Resolved } from "@/lib/server/access";
import type { ContactInput } from "@/lib/schemas/customers";

// The work of the customer page's two forms, behind their declarations (app/(staff)/shop/[shop]/customers/[customer]/actions.ts).

type FoundCustomer = Resolved<"customer">;

export async function saveContact(found: FoundCustomer, contact: ContactInput): Promise<void> {
  await transaction((tx) =>
    updateCustomerContact(tx, {
      shopId: found.shop.id,
      customerId: found.customer.id,
      contact,
    }),
  );
}

/** Folds the duplicate (`duplicateId`, which must be of the same shop) into the customer found; one transaction. */
export async function mergeDuplicate(actor: Actor, found: FoundCustomer, duplicateId: number) {
  return transaction((tx) =>
    mergeCustomers(tx, {
      shopId: found.shop.id,
      keptId: found.customer.id,
      removedId: duplicateId,
      userId: actor.userId,
    }),
  );
}
