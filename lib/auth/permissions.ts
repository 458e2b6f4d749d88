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
  "catalogue.view",
  "catalogue.manage",
  "sets.view",
  "sets.manage",
  "labels.print",
  "contracts.view",
  "contracts.manage",
  "files.view",
  "files.upload",
  "orders.view",
  "orders.book",
  "problems.report",
  "problems.answer",
  "procedures.record",
  "stations.operate",
  "machines.view",
  "machines.manage",
  "board.view",
  "billing.view",
  "billing.manage",
  "invoices.pay",
  "mail.preferences",
] as const;

export type Action = (typeof ACTIONS)[number];

// What every signed-in role may read (always within its tenant scope).
const everyone: Action[] = ["home.view", "sites.view", "catalogue.view", "sets.view", "files.view"];

export const PERMISSIONS: Record<Role, readonly Action[]> = {
  clinic_staff: [...everyone, "files.upload", "orders.view", "orders.book", "problems.report", "procedures.record", "mail.preferences"],
  clinic_manager: [
    ...everyone,
    "files.upload",
    "users.view",
    "users.invite",
    "users.manage",
    "contracts.view",
    "orders.view",
    "orders.book",
    "problems.report",
    "procedures.record",
    "billing.view",
    "invoices.pay",
    "mail.preferences",
  ],
  dispatcher: [...everyone, "organisations.view", "orders.view", "problems.answer", "board.view", "machines.view"],
  driver: [...everyone, "files.upload"],
  technician: [
    ...everyone,
    "organisations.view",
    "labels.print",
    "files.upload",
    "orders.view",
    "problems.answer",
    "stations.operate",
    "board.view",
    "machines.view",
  ],
  quality_lead: [
    ...everyone,
    "organisations.view",
    "audit.view",
    "labels.print",
    "files.upload",
    "orders.view",
    "problems.answer",
    "stations.operate",
    "board.view",
    "machines.view",
    "machines.manage",
  ],
  finance: [
    ...everyone,
    "organisations.view",
    "contracts.view",
    "contracts.manage",
    "files.upload",
    "orders.view",
    "board.view",
    "billing.view",
    "billing.manage",
  ],
  admin: [
    ...everyone,
    "users.view",
    "users.invite",
    "users.manage",
    "organisations.view",
    "organisations.manage",
    "sites.manage",
    "audit.view",
    "catalogue.manage",
    "sets.manage",
    "labels.print",
    "contracts.view",
    "files.upload",
    "orders.view",
    "problems.answer",
    "board.view",
    "machines.view",
    "machines.manage",
    "billing.view",
  ],
};

export function can(role: Role, action: Action): boolean {
  return PERMISSIONS[role].includes(action);
}

/** Throws a 403 AppError unless the role may do the action. */
export function assertCan(user: { role: Role }, action: Action): void {
  if (!can(user.role, action)) throw new AppError("forbidden", "Your role does not allow this.");
}
