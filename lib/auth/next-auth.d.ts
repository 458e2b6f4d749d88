import "next-auth";
import "next-auth/jwt";

// What Steamlane keeps in the next-auth token and session.
declare module "next-auth" {
  interface User {
    sessionVersion: number;
  }
  interface Session {
    userId: number;
    sessionVersion: number;
  }
}

declare module "next-auth/jwt" {
  interface JWT {
    sv?: number;
  }
}
