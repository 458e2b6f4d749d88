import { AppError } from "@/lib/errors";
import type { Role } from "./roles";

// The one permission table: what each role may do. Every page, route handler and server action
// asks `can`/`assertCan` with one of these actions; nothing checks role names directly.
export const ACTIONS = [
  "home.view",
  "users.view",
  "users.invite",
  "users.manage",
  "organisations.view",
  "organisations.manage",
  "sites.view",
  "sites.manage",
  "audit.view",
] as const;

export type Action = (typeof ACTIONS)[number];

const everyone: Action[] = ["home.view", "sites.view"];

export const PERMISSIONS: Record<Role, readonly Action[]> = {
  clinic_staff: [...everyone],
  clinic_manager: [...everyone, "users.view", "users.invite", "users.manage"],
  dispatcher: [...everyone, "organisations.view"],
  driver: [...everyone],
  technician: [...everyone, "organisations.view"],
  quality_lead: [...everyone, "organisations.view", "audit.view"],
  finance: [...everyone, "organisations.view"],
  admin: [
    ...everyone,
    "users.view",
    "users.invite",
    "users.manage",
    "organisations.view",
    "organisations.manage",
    "sites.manage",
    "audit.view",
  ],
};

export function can(role: Role, action: Action): boolean {
  return PERMISSIONS[role].includes(action);
}

/** Throws a 403 AppError unless the role may do the action. */
export function assertCan(user: { role: Role }, action: Action): void {
  if (!can(user.role, action)) throw new AppError("forbidden", "Your role does not allow this.");
}
