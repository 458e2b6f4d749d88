import { z } from "zod";
import { COMMON_PASSWORDS } from "./common-passwords";

// The password rules, shared by the set-password form and the server.

export const PASSWORD_MIN_LENGTH = 12;
export const PASSWORD_MAX_LENGTH = 200;

export const passwordSchema = z
  .string()
  .min(PASSWORD_MIN_LENGTH, `Use at least ${PASSWORD_MIN_LENGTH} characters.`)
  .max(PASSWORD_MAX_LENGTH, `Use at most ${PASSWORD_MAX_LENGTH} characters.`)
  .refine((p) => !COMMON_PASSWORDS.has(p.toLowerCase()), "That password is too common; choose another.")
  .refine((p) => new Set(p).size >= 4, "Use more than three different characters.");
