// The eight roles, who they belong to, and where each lands after signing in.

export const CUSTOMER_ROLES = ["clinic_staff", "clinic_manager"] as const;
export const UNIT_ROLES = ["dispatcher", "driver", "technician", "quality_lead", "finance", "admin"] as const;
export const ROLES = [...CUSTOMER_ROLES, ...UNIT_ROLES] as const;

export type CustomerRole = (typeof CUSTOMER_ROLES)[number];
export type UnitRole = (typeof UNIT_ROLES)[number];
export type Role = (typeof ROLES)[number];

export const ROLE_LABELS: Record<Role, string> = {
  clinic_staff: "Clinic staff",
  clinic_manager: "Clinic manager",
  dispatcher: "Dispatcher",
  driver: "Driver",
  technician: "Technician",
  quality_lead: "Quality lead",
  finance: "Finance",
  admin: "Administrator",
};

export function isRole(value: unknown): value is Role {
  return typeof value === "string" && (ROLES as readonly string[]).includes(value);
}

export function isCustomerRole(role: Role): role is CustomerRole {
  return (CUSTOMER_ROLES as readonly string[]).includes(role);
}

/** The audience a role works in: it picks the route group and its navigation. */
export type Audience = "clinic" | "unit" | "driver";

export function audienceOf(role: Role): Audience {
  if (isCustomerRole(role)) return "clinic";
  if (role === "driver") return "driver";
  return "unit";
}

export function homePathFor(role: Role): string {
  return `/${audienceOf(role)}`;
}
