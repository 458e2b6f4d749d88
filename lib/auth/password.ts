import { hash, verify } from "@node-rs/argon2";

// Password hashing: Argon2id with the library's defaults. The rules live in password-rules.ts.

export function hashPassword(password: string): Promise<string> {
  return hash(password);
}

export async function verifyPassword(passwordHash: string, password: string): Promise<boolean> {
  try {
    return await verify(passwordHash, password);
  } catch {
    return false;
  }
}
