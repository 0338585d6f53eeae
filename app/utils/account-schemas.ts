/**
 * Form schemas for accounts, shared by the server (authoritative) and the browser
 * (early hints). Messages are written for the person at the form.
 */
import { z } from "zod";
import { PREFERENCE_CHOICES } from "~/utils/display-units";
import { isTimeZone } from "~/utils/time-zones";

const COMMON_PASSWORDS = new Set([
  "password",
  "password1",
  "password123",
  "1234567890",
  "12345678910",
  "qwertyuiop",
  "letmein123",
  "iloveyou12",
  "aquarium123",
  "fishtank123",
]);

const EmailSchema = z
  .string({ error: "Enter your e-mail address." })
  .trim()
  .toLowerCase()
  .min(1, "Enter your e-mail address.")
  .max(254, "That e-mail address is too long.")
  .pipe(z.email("Enter an e-mail address like name@example.org."));

const NewPasswordSchema = z
  .string({ error: "Choose a password." })
  .min(10, "Use at least 10 characters.")
  .max(200, "Use at most 200 characters.")
  .refine((p) => !COMMON_PASSWORDS.has(p.toLowerCase()), "That password is too common; choose another.")
  .refine((p) => new Set(p).size >= 4, "That password is too easy to guess; mix more characters.");

const NameSchema = z
  .string({ error: "Tell us what to call you." })
  .trim()
  .min(1, "Tell us what to call you.")
  .max(80, "Keep the name under 80 characters.");

export const SignUpSchema = z
  .object({
    name: NameSchema,
    email: EmailSchema,
    password: NewPasswordSchema,
    confirmPassword: z.string({ error: "Type the password again." }),
  })
  .refine((v) => v.password === v.confirmPassword, {
    path: ["confirmPassword"],
    message: "The two passwords differ.",
  })
  .refine((v) => v.password.toLowerCase() !== v.email, {
    path: ["password"],
    message: "Do not use your e-mail address as the password.",
  });

export const SignInSchema = z.object({
  email: EmailSchema,
  password: z
    .string({ error: "Enter your password." })
    .min(1, "Enter your password.")
    .max(200, "That password is too long."),
});

export const ForgotPasswordSchema = z.object({ email: EmailSchema });

export const ResetPasswordSchema = z
  .object({
    token: z.string().min(10).max(200),
    password: NewPasswordSchema,
    confirmPassword: z.string({ error: "Type the password again." }),
  })
  .refine((v) => v.password === v.confirmPassword, {
    path: ["confirmPassword"],
    message: "The two passwords differ.",
  });

export const ChangePasswordSchema = z
  .object({
    currentPassword: z
      .string({ error: "Enter your current password." })
      .min(1, "Enter your current password.")
      .max(200),
    password: NewPasswordSchema,
    confirmPassword: z.string({ error: "Type the password again." }),
  })
  .refine((v) => v.password === v.confirmPassword, {
    path: ["confirmPassword"],
    message: "The two passwords differ.",
  });

export const UnitPreferencesSchema = z.object({
  name: NameSchema,
  volumeUnit: z.enum(PREFERENCE_CHOICES.volumeUnit, { error: "Choose a volume unit." }),
  temperatureUnit: z.enum(PREFERENCE_CHOICES.temperatureUnit, { error: "Choose a temperature unit." }),
  nitrateUnit: z.enum(PREFERENCE_CHOICES.nitrateUnit, { error: "Choose how nitrate is shown." }),
  khUnit: z.enum(PREFERENCE_CHOICES.khUnit, { error: "Choose a KH unit." }),
  /** Blank: the browser's zone. */
  timeZone: z
    .string()
    .trim()
    .optional()
    .transform((v) => v || null)
    .refine(
      (v) => v === null || isTimeZone(v),
      "Choose a time zone from the list, like Europe/Berlin or America/New_York.",
    ),
});
