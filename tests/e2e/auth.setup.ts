import { expect, test as setup } from "@playwright/test";
import { CUSTOMERS, STAFF, storageStatePath } from "./personas";
import { SignInPage } from "./pages/sign-in-page";

// Signs every persona in once through the real screens and keeps the browser state.
for (const [persona, who] of Object.entries(STAFF)) {
  setup(`sign in ${persona}`, async ({ page }) => {
    await new SignInPage(page).signInAsStaff(who.email, who.password);
    await expect(page).toHaveURL(/\/shop\//);
    await page.context().storageState({ path: storageStatePath(persona as keyof typeof STAFF) });
  });
}

for (const [persona, who] of Object.entries(CUSTOMERS)) {
  setup(`sign in ${persona}`, async ({ page }) => {
    await new SignInPage(page).signInAsOwner(who.email);
    await expect(page).toHaveURL(/\/my$/);
    await page.context().storageState({ path: storageStatePath(persona as keyof typeof CUSTOMERS) });
  });
}
