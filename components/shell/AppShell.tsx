"use client";

import Link from "next/link";
import { usePathname } from "next/navigation";
import { signOut } from "next-auth/react";
import { useRef, type ReactNode } from "react";
import { Logo } from "@/components/ui/Logo";
import { ROLE_LABELS, roleHas, type Role } from "@/lib/auth/roles";
import { DownSearch } from "./DownSearch";
import { EnvironmentSwitcher } from "./EnvironmentSwitcher";
import { ADMIN_NAV, MORE_NAV, PRIMARY_NAV, envFromPath, type NavItem } from "./nav";
import { ThemeToggle } from "./ThemeToggle";

const linkClass = (active: boolean) => `whitespace-nowrap rounded px-2 py-1 text-sm ${active ? "bg-raised text-ink" : "text-muted hover:text-ink"}`;

function NavLink({ item, env, path, onClick }: { item: NavItem; env: string; path: string; onClick?: () => void }) {
  const active = item.match(path, env);
  return (
    <Link href={item.href(env)} aria-current={active ? "page" : undefined} className={linkClass(active)} onClick={onClick}>
      {item.label}
    </Link>
  );
}

/** Reference screens behind one disclosure: a plain <details>, so it works with the keyboard and without script. */
function MoreMenu({ env, path }: { env: string; path: string }) {
  const ref = useRef<HTMLDetailsElement>(null);
  const active = MORE_NAV.find((i) => i.match(path, env));
  const close = () => ref.current?.removeAttribute("open");
  return (
    <details ref={ref} className="relative" onKeyDown={(e) => e.key === "Escape" && close()}>
      <summary className={`${linkClass(Boolean(active))} cursor-pointer list-none`}>
        {active ? `More: ${active.label}` : "More"} <span aria-hidden>▾</span>
      </summary>
      <ul className="absolute left-0 z-40 mt-1 min-w-40 rounded-md border border-line bg-surface p-1 shadow-lg">
        {MORE_NAV.map((item) => (
          <li key={item.label}>
            <NavLink item={item} env={env} path={path} onClick={close} />
          </li>
        ))}
      </ul>
    </details>
  );
}

export function AppShell({ user, defaultEnv, children }: { user: { name: string; email: string; role: Role }; defaultEnv: string; children: ReactNode }) {
  const path = usePathname();
  const env = envFromPath(path, defaultEnv);
  const admin = !ADMIN_NAV.permission || roleHas(user.role, ADMIN_NAV.permission);
  return (
    <div className="flex min-h-screen flex-col">
      <a href="#main" className="sr-only z-50 rounded bg-brass px-3 py-1.5 text-sm font-semibold text-on-brass focus:not-sr-only focus:fixed focus:left-2 focus:top-2">
        Skip to content
      </a>
      <header className="sticky top-0 z-30 border-b border-line bg-surface/95 px-4 backdrop-blur print:hidden">
        <div className="flex h-12 items-center gap-3">
          <Link href="/" aria-label="Pinchpoint home" className="shrink-0">
            <Logo size={22} />
          </Link>
          <EnvironmentSwitcher env={env} />
          <DownSearch env={env} />
          <div className="ml-auto flex shrink-0 items-center gap-3 text-sm">
            <ThemeToggle />
            <span className="text-muted" data-testid="signed-in-as" title={user.email}>
              <span className="hidden xl:inline">{user.email} · </span>
              <span className="sr-only xl:hidden">{user.email} · </span>
              <span className="rounded border border-line px-1.5 py-0.5 text-xs text-ink">{ROLE_LABELS[user.role]}</span>
            </span>
            <button type="button" onClick={() => signOut({ callbackUrl: "/signin" })} className="whitespace-nowrap text-muted hover:text-ink">
              Sign out
            </button>
          </div>
        </div>
        <nav aria-label="Main" className="-mx-1 flex h-10 items-center gap-1">
          {PRIMARY_NAV.map((item) => (
            <NavLink key={item.label} item={item} env={env} path={path} />
          ))}
          <MoreMenu env={env} path={path} />
          {admin && (
            <span className="ml-auto border-l border-line pl-2">
              <NavLink item={ADMIN_NAV} env={env} path={path} />
            </span>
          )}
        </nav>
      </header>
      <main id="main" tabIndex={-1} className="mx-auto w-full max-w-[1400px] flex-1 px-4 py-6 focus:outline-none">
        {children}
      </main>
    </div>
  );
}
