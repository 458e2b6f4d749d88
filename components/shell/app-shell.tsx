"use client";

import * as DialogPrimitive from "@radix-ui/react-dialog";
import { Archive, Barcode, BookOpen, Building2, ChartLine, Clock, Cog, FileText, Gauge, Home, LogOut, MapPin, Menu, MessageSquareWarning, Receipt, ScanLine, Truck, Users, X } from "lucide-react";
import Link from "next/link";
import { usePathname } from "next/navigation";
import { signOut } from "next-auth/react";
import { type ReactNode, useState } from "react";
import { cn } from "@/lib/cn";
import { Wordmark } from "./logo";
import type { NavIcon, NavItem } from "./navigation";

const ICONS: Record<NavIcon, typeof Home> = {
  home: Home,
  users: Users,
  "map-pin": MapPin,
  truck: Truck,
  building: Building2,
  book: BookOpen,
  barcode: Barcode,
  "file-text": FileText,
  archive: Archive,
  gauge: Gauge,
  scan: ScanLine,
  cog: Cog,
  receipt: Receipt,
  alert: MessageSquareWarning,
  clock: Clock,
  chart: ChartLine,
};

export interface ShellUser {
  name: string;
  roleLabel: string;
  organisationName: string;
}

function NavLinks({ items, onNavigate }: { items: NavItem[]; onNavigate?: () => void }) {
  const pathname = usePathname();
  return (
    <nav aria-label="Main" className="space-y-1">
      {items.map((item) => {
        const Icon = ICONS[item.icon];
        const active = pathname === item.href || (item.href.split("/").length > 2 && pathname.startsWith(`${item.href}/`));
        return (
          <Link
            key={item.href}
            href={item.href}
            onClick={onNavigate}
            aria-current={active ? "page" : undefined}
            className={cn(
              "flex items-center gap-3 rounded-lg px-3 py-2.5 text-sm font-medium",
              active ? "bg-lagoon-700 text-white" : "text-ink-soft hover:bg-lagoon-50",
            )}
          >
            <Icon className="h-5 w-5" aria-hidden="true" />
            {item.label}
          </Link>
        );
      })}
    </nav>
  );
}

function UserBox({ user }: { user: ShellUser }) {
  return (
    <div className="space-y-3 border-t border-line pt-4">
      <div className="text-sm">
        <p className="font-medium text-ink" data-testid="shell-user-name">
          {user.name}
        </p>
        <p className="text-muted">
          {user.roleLabel} · {user.organisationName}
        </p>
      </div>
      <button
        type="button"
        onClick={() => signOut({ callbackUrl: "/sign-in" })}
        className="flex w-full items-center gap-2 rounded-lg px-3 py-2 text-sm font-medium text-ink-soft hover:bg-lagoon-50"
      >
        <LogOut className="h-4 w-4" aria-hidden="true" />
        Sign out
      </button>
    </div>
  );
}

/** The frame of every signed-in page: navigation for the role, the user, and the content. */
export function AppShell({ items, user, children }: { items: NavItem[]; user: ShellUser; children: ReactNode }) {
  const [open, setOpen] = useState(false);
  return (
    <div className="min-h-screen lg:flex">
      <a href="#main" className="sr-only focus:not-sr-only focus:absolute focus:left-2 focus:top-2 focus:z-50 focus:rounded focus:bg-surface focus:p-2">
        Skip to content
      </a>
      <aside className="no-print hidden w-64 shrink-0 flex-col justify-between border-r border-line bg-surface px-4 py-5 lg:flex">
        <div className="space-y-6">
          <Link href="/" className="block px-2">
            <Wordmark />
          </Link>
          <NavLinks items={items} />
        </div>
        <UserBox user={user} />
      </aside>

      <header className="no-print flex items-center justify-between border-b border-line bg-surface px-4 py-3 lg:hidden">
        <Link href="/">
          <Wordmark />
        </Link>
        <DialogPrimitive.Root open={open} onOpenChange={setOpen}>
          <DialogPrimitive.Trigger className="rounded-lg p-2 text-ink hover:bg-lagoon-50" aria-label="Open menu">
            <Menu className="h-6 w-6" aria-hidden="true" />
          </DialogPrimitive.Trigger>
          <DialogPrimitive.Portal>
            <DialogPrimitive.Overlay className="fixed inset-0 z-40 bg-ink/40" />
            <DialogPrimitive.Content className="fixed inset-y-0 right-0 z-50 flex w-72 flex-col justify-between bg-surface p-5 shadow-xl">
              <div className="space-y-6">
                <div className="flex items-center justify-between">
                  <DialogPrimitive.Title className="text-base font-semibold">Menu</DialogPrimitive.Title>
                  <DialogPrimitive.Description className="sr-only">Main navigation</DialogPrimitive.Description>
                  <DialogPrimitive.Close className="rounded-lg p-2 hover:bg-lagoon-50" aria-label="Close menu">
                    <X className="h-5 w-5" aria-hidden="true" />
                  </DialogPrimitive.Close>
                </div>
                <NavLinks items={items} onNavigate={() => setOpen(false)} />
              </div>
              <UserBox user={user} />
            </DialogPrimitive.Content>
          </DialogPrimitive.Portal>
        </DialogPrimitive.Root>
      </header>

      <main id="main" className="mx-auto w-full max-w-6xl flex-1 px-4 py-6 sm:px-6 lg:px-10 lg:py-10">
        {children}
      </main>
    </div>
  );
}
