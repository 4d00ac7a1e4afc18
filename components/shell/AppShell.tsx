"use client";

import Link from "next/link";
import { usePathname } from "next/navigation";
import { signOut } from "next-auth/react";
import type { ReactNode } from "react";
import { Logo } from "@/components/ui/Logo";
import { ThemeToggle } from "./ThemeToggle";
import { ROLE_LABELS, roleHas, type Role } from "@/lib/auth/roles";
import { NAV, envFromPath } from "./nav";

export function AppShell({ user, defaultEnv, children }: { user: { name: string; email: string; role: Role }; defaultEnv: string; children: ReactNode }) {
  const path = usePathname();
  const env = envFromPath(path, defaultEnv);
  const items = NAV.filter((item) => !item.permission || roleHas(user.role, item.permission));
  return (
    <div className="flex min-h-screen flex-col">
      <header className="sticky top-0 z-30 flex h-12 print:hidden items-center gap-4 border-b border-line bg-surface/95 px-4 backdrop-blur">
        <Link href="/" aria-label="Pinchpoint home">
          <Logo size={22} />
        </Link>
        <span className="rounded border border-line px-2 py-0.5 font-mono text-xs text-muted" title="Environment">
          {env}
        </span>
        <nav aria-label="Main" className="flex items-center gap-1 overflow-x-auto">
          {items.map((item) => {
            const active = item.match(path, env);
            return (
              <Link
                key={item.label}
                href={item.href(env)}
                aria-current={active ? "page" : undefined}
                className={`whitespace-nowrap rounded px-2 py-1 text-sm ${active ? "bg-raised text-ink" : "text-muted hover:text-ink"}`}
              >
                {item.label}
              </Link>
            );
          })}
        </nav>
        <div className="ml-auto flex shrink-0 items-center gap-3 text-sm">
          <ThemeToggle />
          <span className="text-muted" data-testid="signed-in-as" title={user.email}>
            <span className="hidden 2xl:inline">{user.email} · </span>
            <span className="sr-only 2xl:hidden">{user.email} · </span>
            <span className="text-ink">{ROLE_LABELS[user.role]}</span>
          </span>
          <button type="button" onClick={() => signOut({ callbackUrl: "/signin" })} className="text-muted hover:text-ink">
            Sign out
          </button>
        </div>
      </header>
      <main className="mx-auto w-full max-w-[1400px] flex-1 px-4 py-6">{children}</main>
    </div>
  );
}
