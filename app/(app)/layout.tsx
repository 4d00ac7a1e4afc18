import type { ReactNode } from "react";
import { AppShell } from "@/components/shell/AppShell";
import { requireUser } from "@/lib/auth/page";
import { defaultEnvironment } from "@/lib/config";

export default async function SignedInLayout({ children }: { children: ReactNode }) {
  const user = await requireUser();
  return (
    <AppShell user={{ name: user.name, email: user.email, role: user.role }} defaultEnv={defaultEnvironment()}>
      {children}
    </AppShell>
  );
}
