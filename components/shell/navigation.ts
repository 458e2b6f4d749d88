import type { Action } from "@/lib/auth/permissions";
import type { Audience } from "@/lib/auth/roles";

// The navigation of each audience. An entry shows only when the role may do its action.

export type NavIcon = "home" | "users" | "map-pin" | "truck" | "building" | "book" | "barcode" | "file-text" | "archive";

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
    { href: "/clinic/store", label: "In the unit's store", icon: "archive", action: "orders.view" },
    { href: "/clinic/sets", label: "Our sets", icon: "barcode", action: "sets.view" },
    { href: "/clinic/catalogue", label: "Set catalogue", icon: "book", action: "catalogue.view" },
    { href: "/clinic/contract", label: "Contract", icon: "file-text", action: "contracts.view" },
    { href: "/clinic/team", label: "Team", icon: "users", action: "users.view" },
  ],
  unit: [
    { href: "/unit", label: "Overview", icon: "home", action: "home.view" },
    { href: "/unit/orders", label: "Orders", icon: "truck", action: "orders.view" },
    { href: "/unit/customers", label: "Customers", icon: "building", action: "organisations.view" },
    { href: "/unit/sites", label: "Sites", icon: "map-pin", action: "sites.view" },
    { href: "/unit/catalogue", label: "Set catalogue", icon: "book", action: "catalogue.view" },
    { href: "/unit/sets", label: "Sets", icon: "barcode", action: "sets.view" },
    { href: "/unit/contracts", label: "Contracts", icon: "file-text", action: "contracts.view" },
    { href: "/unit/users", label: "People", icon: "users", action: "users.view" },
  ],
  driver: [{ href: "/driver", label: "Today", icon: "truck", action: "home.view" }],
};
