import path from "node:path";

// Who the end-to-end tests act as: demo sign-ins from README.md.
export const STAFF = {
  owner: { email: "dana@coppergulch.test", password: "gulch-owner-demo" },
  writer: { email: "priya@coppergulch.test", password: "gulch-writer-demo" },
  technician: { email: "mateo@coppergulch.test", password: "gulch-tech-demo" },
  // Each role of another shop (Saltmarsh Small Engine).
  otherShopOwner: { email: "wren@saltmarsh.test", password: "saltmarsh-demo" },
  otherShopWriter: { email: "odile@saltmarsh.test", password: "saltmarsh-demo" },
  otherShopTechnician: { email: "sam@saltmarsh.test", password: "saltmarsh-demo" },
} as const;

/**
 * Staff whose Copper Gulch membership is deactivated in the seed. auth.setup.ts gives them a
 * session from before the deactivation (which a password sign-in no longer could).
 */
export const FORMER_STAFF = {
  deactivatedTechnician: { email: "rafe@coppergulch.test", password: "gulch-former-demo", shop: "copper-gulch" },
} as const;

export const CUSTOMERS = {
  /** Owner of the Tessaro ATV: jobs J-0001 and J-0005 at Copper Gulch. */
  jobCustomer: { email: "ruth.calloway@mail.test" },
  /** A customer of the same shop, but not of those jobs. */
  otherCustomer: { email: "jonah.pike@mail.test" },
  /** Invited by Ruth Calloway to follow J-0005 (db/seeds/demo.ts): e-mail updates, no money. */
  follower: { email: "noor.calloway@mail.test" },
} as const;

export type Persona = keyof typeof STAFF | keyof typeof FORMER_STAFF | keyof typeof CUSTOMERS;

/** Signed-in browser state saved by auth.setup.ts, so each persona signs in once per run. */
export function storageStatePath(persona: Persona): string {
  return path.join(__dirname, "..", "..", ".data", "test", "e2e-auth", `${persona}.json`);
}
