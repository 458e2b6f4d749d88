import type { Action } from "@/lib/auth/permissions";
import type { Audience } from "@/lib/auth/roles";

// The navigation of each audience. An entry shows only when the role may do its action.

export type NavIcon = "home" | "users" | "map-pin" | "truck";

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
    { href: "/clinic/team", label: "Team", icon: "users", action: "users.view" },
  ],
  unit: [
    { href: "/unit", label: "Overview", icon: "home", action: "home.view" },
    { href: "/unit/sites", label: "Customer sites", icon: "map-pin", action: "sites.view" },
    { href: "/unit/users", label: "People", icon: "users", action: "users.view" },
  ],
  driver: [{ href: "/driver", label: "Today", icon: "truck", action: "home.view" }],
};
