import { describe, expect, it } from "vitest";
import { hashPassword, verifyPassword } from "@/lib/auth/password";
import { passwordSchema } from "@/lib/auth/password-rules";
import { isCommonPassword } from "@/lib/auth/leaked-passwords";

// The password rules: length on the form and the server, and the leaked-password list (the
// zxcvbn-ts common dictionary, itself drawn from published leaked-password frequency lists).

describe("password rules", () => {
  it("refuses passwords under 12 characters and over 200", () => {
    expect(passwordSchema.safeParse("short-pass1").success).toBe(false);
    expect(passwordSchema.safeParse("x".repeat(150) + "yzw" + "v".repeat(48)).success).toBe(false);
    expect(passwordSchema.safeParse("tray lid hinge 7").success).toBe(true);
  });

  it("finds the most common leaked passwords, case-insensitively, and common words padded with digits", () => {
    // "qwerty123456" and "1qaz2wsx3edc" are near the top of the dictionary's list.
    expect(isCommonPassword("qwerty123456")).toBe(true);
    expect(isCommonPassword("1QAZ2WSX3EDC")).toBe(true);
    expect(isCommonPassword("dragon2026!!!!")).toBe(true);
    expect(isCommonPassword("password12345678")).toBe(true);
    expect(isCommonPassword("lark-demo-2026")).toBe(false);
    expect(isCommonPassword("tray lid hinge 7")).toBe(false);
  });

  it("refuses to hash a leaked password, with a message for the password field", async () => {
    await expect(hashPassword("qwertyuiop123")).rejects.toMatchObject({ code: "validation", fields: { password: [expect.stringMatching(/leaked/)] } });
    const hash = await hashPassword("tray lid hinge 7");
    expect(await verifyPassword(hash, "tray lid hinge 7")).toBe(true);
    expect(await verifyPassword(hash, "tray lid hinge 8")).toBe(false);
  });
});
