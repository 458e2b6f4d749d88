import { redirect } from "next/navigation";
import { getCurrentUser } from "@/lib/auth/current-user";
import { homePathFor } from "@/lib/auth/roles";

// The root sends each person to their own home, or to sign in.
export default async function RootPage() {
  const user = await getCurrentUser();
  redirect(user ? homePathFor(user.role) : "/sign-in");
}
