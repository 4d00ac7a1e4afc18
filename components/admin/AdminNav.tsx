"use client";

import Link from "next/link";
import { usePathname } from "next/navigation";
import { roleHas, type Permission, type Role } from "@/lib/auth/roles";

// Shown only to roles that may open them; every page checks again on the server.
const ITEMS: { href: string; label: string; permission: Permission }[] = [
  { href: "/admin/users", label: "Users", permission: "admin" },
  { href: "/admin/tokens", label: "Tokens", permission: "admin" },
  { href: "/admin/environments", label: "Environments", permission: "admin" },
  { href: "/admin/audit", label: "Audit log", permission: "reviews:write" },
  { href: "/admin/mail", label: "Mail", permission: "admin" },
];

export function AdminNav({ role }: { role: Role }) {
  const path = usePathname();
  return (
    <nav aria-label="Admin" className="flex gap-1 border-b border-line">
      {ITEMS.filter((item) => roleHas(role, item.permission)).map((item) => {
        const active = path.startsWith(item.href);
        return (
          <Link
            key={item.href}
            href={item.href}
            aria-current={active ? "page" : undefined}
            className={`-mb-px border-b-2 px-3 py-2 text-sm ${active ? "border-brass text-ink" : "border-transparent text-muted hover:text-ink"}`}
          >
            {item.label}
          </Link>
        );
      })}
    </nav>
  );
}
