import type { Action } from "@/lib/auth/permissions";
import type { Audience } from "@/lib/auth/roles";

// The navigation of each audience. An entry shows only when the role may do its action.

export type NavIcon = "home" | "users" | "map-pin" | "truck" | "building" | "book" | "barcode" | "file-text" | "archive" | "gauge" | "scan" | "cog" | "receipt" | "alert" | "clock" | "chart";

export interface NavItem {
  href: string;
  label: string;
  icon: NavIcon;
  action: Action;
}

export const NAVIGATION: Record<Audience, NavItem[]> = {
  clinic: [
    { href: "/clinic", label: "Overview", icon: "home", action: "home.view" },
    { href: "/clinic/sites", label: "Our sites", icon: "map-pin", action: "sites.view" },
    { href: "/clinic/orders", label: "Pickups and returns", icon: "truck", action: "orders.view" },
    { href: "/clinic/use", label: "Record use", icon: "scan", action: "procedures.record" },
    { href: "/clinic/expiring", label: "Nearing expiry", icon: "clock", action: "sets.view" },
    { href: "/clinic/store", label: "In the unit's store", icon: "archive", action: "orders.view" },
    { href: "/clinic/problems", label: "Problems", icon: "alert", action: "orders.view" },
    { href: "/clinic/recalls", label: "Recalls", icon: "alert", action: "recalls.view" },
    { href: "/clinic/sets", label: "Our sets", icon: "barcode", action: "sets.view" },
    { href: "/clinic/catalogue", label: "Set catalogue", icon: "book", action: "catalogue.view" },
    { href: "/clinic/contract", label: "Contract", icon: "file-text", action: "contracts.view" },
    { href: "/clinic/invoices", label: "Invoices", icon: "receipt", action: "billing.view" },
    { href: "/clinic/reports", label: "Reports", icon: "chart", action: "reports.customer" },
    { href: "/clinic/team", label: "Team", icon: "users", action: "users.view" },
    { href: "/clinic/settings", label: "E-mail settings", icon: "cog", action: "mail.preferences" },
  ],
  unit: [
    { href: "/unit", label: "Overview", icon: "home", action: "home.view" },
    { href: "/unit/board", label: "Unit board", icon: "gauge", action: "board.view" },
    { href: "/unit/stations", label: "Stations", icon: "scan", action: "stations.operate" },
    { href: "/unit/orders", label: "Orders", icon: "truck", action: "orders.view" },
    { href: "/unit/dispatch", label: "Dispatch", icon: "map-pin", action: "routes.view" },
    { href: "/unit/problems", label: "Problems queue", icon: "alert", action: "problems.answer" },
    { href: "/unit/customers", label: "Customers", icon: "building", action: "organisations.view" },
    { href: "/unit/sites", label: "Sites", icon: "map-pin", action: "sites.view" },
    { href: "/unit/catalogue", label: "Set catalogue", icon: "book", action: "catalogue.view" },
    { href: "/unit/sets", label: "Sets", icon: "barcode", action: "sets.view" },
    { href: "/unit/contracts", label: "Contracts", icon: "file-text", action: "contracts.view" },
    { href: "/unit/billing", label: "Billing", icon: "receipt", action: "billing.view" },
    { href: "/unit/reports", label: "Reports", icon: "chart", action: "reports.unit" },
    { href: "/unit/vans", label: "Vans", icon: "truck", action: "vans.manage" },
    { href: "/unit/machines", label: "Machines", icon: "cog", action: "machines.view" },
    { href: "/unit/batches", label: "Washer batches", icon: "archive", action: "machines.view" },
    { href: "/unit/monitoring", label: "Monitoring log", icon: "gauge", action: "machine_log.view" },
    { href: "/unit/loads", label: "Steriliser loads", icon: "archive", action: "loads.view" },
    { href: "/unit/steriliser-tests", label: "Steriliser tests", icon: "clock", action: "sterilisers.test" },
    { href: "/unit/release", label: "Release", icon: "gauge", action: "loads.release" },
    { href: "/unit/recalls", label: "Recalls", icon: "alert", action: "recalls.view" },
    { href: "/unit/shelf-life", label: "Shelf life", icon: "cog", action: "sterile_settings.manage" },
    { href: "/unit/users", label: "People", icon: "users", action: "users.view" },
  ],
  driver: [{ href: "/driver", label: "Today", icon: "truck", action: "home.view" }],
};
