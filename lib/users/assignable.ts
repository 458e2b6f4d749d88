import "server-only";
import type { Kysely } from "kysely";
import type { Database } from "@/db/schema";
import type { Role } from "@/lib/auth/roles";
import { tenantScope } from "@/lib/auth/scope";
import type { SessionUser } from "@/lib/auth/session-user";
import { assignableRoles } from "./service";

// The organisations, sites and roles a caller may put a new person into: the invite form's options.

export interface InviteOption {
  id: number;
  name: string;
  roles: readonly Role[];
  sites: { id: number; name: string }[];
}

export async function inviteOptions(db: Kysely<Database>, user: SessionUser): Promise<InviteOption[]> {
  const orgs = await db
    .selectFrom("organisations")
    .select(["id", "name", "kind"])
    .where("active", "=", 1)
    .where(tenantScope(user, { organisation: "organisations.id" }))
    .orderBy("kind", "desc")
    .orderBy("name")
    .execute();
  const sites = await db
    .selectFrom("sites")
    .select(["id", "name", "organisation_id"])
    .where(tenantScope(user, { organisation: "sites.organisation_id" }))
    .where("is_depot", "=", 0)
    .orderBy("name")
    .execute();
  return orgs
    .map((o) => ({
      id: o.id,
      name: o.name,
      roles: assignableRoles(user, o.kind),
      sites: sites.filter((s) => s.organisation_id === o.id).map((s) => ({ id: s.id, name: s.name })),
    }))
    .filter((o) => o.roles.length > 0);
}
