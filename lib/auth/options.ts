import type { NextAuthOptions } from "next-auth";
import CredentialsProvider from "next-auth/providers/credentials";
import { z } from "zod";
import { getDb } from "@/db";
import { AppError } from "@/lib/errors";
import { verifyCredentials } from "./sign-in";

// next-auth: e-mail and password, JWT sessions that last one working day. The token carries only
// the user id and the session version; everything else is read from the database per request.

export const SESSION_MAX_AGE_SECONDS = 10 * 60 * 60;

const credentialsSchema = z.object({
  email: z.string().trim().min(3).max(254),
  password: z.string().min(1).max(200),
});

export const authOptions: NextAuthOptions = {
  secret: process.env.NEXTAUTH_SECRET,
  session: { strategy: "jwt", maxAge: SESSION_MAX_AGE_SECONDS },
  jwt: { maxAge: SESSION_MAX_AGE_SECONDS },
  pages: { signIn: "/sign-in", error: "/sign-in" },
  providers: [
    CredentialsProvider({
      name: "E-mail and password",
      credentials: { email: { label: "E-mail", type: "email" }, password: { label: "Password", type: "password" } },
      async authorize(credentials) {
        const parsed = credentialsSchema.safeParse(credentials);
        if (!parsed.success) throw new Error("Enter your e-mail and password.");
        try {
          const account = await verifyCredentials(getDb(), parsed.data);
          return { id: String(account.userId), sessionVersion: account.sessionVersion };
        } catch (error) {
          // next-auth passes the message of an Error thrown here back to the sign-in form.
          if (error instanceof AppError) throw new Error(error.message);
          throw error;
        }
      },
    }),
  ],
  callbacks: {
    async jwt({ token, user }) {
      if (user) {
        token.sub = user.id;
        token.sv = user.sessionVersion;
      }
      return token;
    },
    async session({ session, token }) {
      session.userId = Number(token.sub);
      session.sessionVersion = Number(token.sv ?? 0);
      return session;
    },
  },
};
