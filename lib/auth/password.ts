import { hash, verify } from "@node-rs/argon2";
import { AppError } from "@/lib/errors";
import { isCommonPassword } from "./leaked-passwords";

// Password hashing: Argon2id with the library's defaults. The rules live in password-rules.ts;
// the long leaked-password list is checked here, the one gate every new password passes.

export async function hashPassword(password: string): Promise<string> {
  if (isCommonPassword(password)) {
    const message = "That password is on published lists of leaked passwords; choose another.";
    throw new AppError("validation", message, { password: [message] });
  }
  return hash(password);
}

export async function verifyPassword(passwordHash: string, password: string): Promise<boolean> {
  try {
    return await verify(passwordHash, password);
  } catch {
    return false;
  }
}
