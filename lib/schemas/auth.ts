import { z } from "zod";

const email = z
  .string({ error: "Enter your e-mail address" })
  .trim()
  .toLowerCase()
  .max(254, "That e-mail address is too long")
  .pipe(z.email({ error: "That doesn't look like an e-mail address" }));

export const passwordSignInSchema = z.object({
  email,
  password: z.string({ error: "Enter your password" }).min(1, "Enter your password").max(200, "That password is too long"),
});

export const linkRequestSchema = z.object({
  email,
  next: z
    .string()
    .max(300, "Bad return address")
    .regex(/^\/(?!\/)[A-Za-z0-9/_-]*$/, "Bad return address") // same-site paths only, never "//host"
    .optional(),
});

export const linkTokenSchema = z.object({
  token: z.string().regex(/^[A-Za-z0-9_-]{43}$/, "This sign-in link is incomplete; open it again from the e-mail"),
});
