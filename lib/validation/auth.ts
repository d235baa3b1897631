import { z } from "zod";
import { ROLES } from "@/lib/auth/permissions";

export const emailField = z
  .string()
  .trim()
  .toLowerCase()
  .min(1, "Enter an e-mail address.")
  .max(254, "That address is too long.")
  .pipe(z.email("Enter a valid e-mail address, like name@example.org."));

// At least 10 characters mixing letters with digits or symbols; long passphrases pass too.
export const passwordField = z
  .string()
  .min(10, "Use at least 10 characters.")
  .max(200, "Use at most 200 characters.")
  .refine((p) => p.length >= 16 || (/[A-Za-z]/.test(p) && /[^A-Za-z]/.test(p)), "Mix letters with digits or symbols (or use 16+ characters).");

export const nameField = z.string().trim().min(1, "Enter your name.").max(120, "Use at most 120 characters.");

export const signUpSchema = z.object({
  name: nameField,
  email: emailField,
  password: passwordField,
  labName: z.string().trim().min(2, "Name your lab (at least 2 characters).").max(120, "Use at most 120 characters."),
});

export const inviteSchema = z.object({
  email: emailField,
  role: z.enum(ROLES, "Choose a role."),
});

export const acceptInviteSchema = z.object({
  token: z.string().min(20).max(200),
  name: z.string().trim().max(120).optional(),
  password: z.string().min(1, "Enter a password.").max(200),
});

export const changePasswordSchema = z
  .object({ currentPassword: z.string().min(1, "Enter your current password."), newPassword: passwordField })
  .refine((v) => v.currentPassword !== v.newPassword, { path: ["newPassword"], message: "Choose a password different from the current one." });

export const memberRoleSchema = z.object({ userId: z.uuid(), role: z.enum(ROLES) });
