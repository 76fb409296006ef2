import { z } from "zod";

export const emailField = z
  .string({ error: "Enter your e-mail address." })
  .trim()
  .toLowerCase()
  .min(1, { error: "Enter your e-mail address." })
  .max(254, { error: "That e-mail address is too long." })
  .pipe(z.email({ error: "Enter a valid e-mail address, like name@example.org." }));

export const newPasswordField = z
  .string({ error: "Choose a password." })
  .min(10, { error: "Use at least 10 characters for your password." })
  .max(200, { error: "Use at most 200 characters for your password." });

export const credentialsSchema = z.object({
  email: emailField,
  password: z.string({ error: "Enter your password." }).min(1, { error: "Enter your password." }).max(200),
});

export const signInLinkSchema = z.object({ email: emailField });

const timeZoneField = z
  .string({ error: "Choose your time zone." })
  .min(1, { error: "Choose your time zone." })
  .refine(isKnownTimeZone, { error: "Choose a time zone from the list." });

export const signUpSchema = z
  .strictObject({
    name: z
      .string({ error: "Enter the name other observers will see." })
      .trim()
      .min(2, { error: "Enter at least 2 characters for your name." })
      .max(80, { error: "Use at most 80 characters for your name." }),
    email: emailField,
    password: newPasswordField,
    confirmPassword: z.string({ error: "Type the password again." }),
    country: z
      .string()
      .trim()
      .toUpperCase()
      .regex(/^[A-Z]{2}$/, { error: "Use the two-letter country code, e.g. GB, DE or NZ." })
      .optional()
      .or(z.literal("").transform(() => undefined)),
    timeZone: timeZoneField,
  })
  .refine((v) => v.password === v.confirmPassword, {
    path: ["confirmPassword"],
    error: "The two passwords are not the same.",
  });
export type SignUpInput = z.output<typeof signUpSchema>;

export const resetRequestSchema = z.object({ email: emailField });

export const resetPasswordSchema = z
  .object({
    token: z.string().min(20, { error: "This reset link is incomplete. Ask for a new one." }).max(200),
    password: newPasswordField,
    confirmPassword: z.string(),
  })
  .refine((v) => v.password === v.confirmPassword, {
    path: ["confirmPassword"],
    error: "The two passwords are not the same.",
  });

export function isKnownTimeZone(zone: string): boolean {
  try {
    new Intl.DateTimeFormat("en-GB", { timeZone: zone });
    return true;
  } catch {
    return false;
  }
}
