import { z } from "zod";
import { currency, line, timeZone } from "./common";

export const email = z
  .string({ error: "Email must be text" })
  .trim()
  .toLowerCase()
  .max(255, "Email must be at most 255 characters")
  .pipe(z.email({ error: "Email must be an email address" }));

export const password = z
  .string({ error: "Password must be text" })
  .min(10, "Password must be at least 10 characters")
  .max(128, "Password must be at most 128 characters");

export const signInSchema = z.object({
  email,
  password: z.string({ error: "Password must be text" }).min(1, "Password is required").max(128, "Password must be at most 128 characters"),
});

/** The grower's first site, made together with their account. */
export const newSiteSchema = z.object({
  siteName: line("Site name", 120),
  timeZone,
  currency,
});

export const signUpSchema = z
  .object({
    name: line("Name", 120),
    email,
    password,
  })
  .extend(newSiteSchema.shape);

export type SignInInput = z.infer<typeof signInSchema>;
export type SignUpInput = z.infer<typeof signUpSchema>;
export type NewSiteInput = z.infer<typeof newSiteSchema>;
