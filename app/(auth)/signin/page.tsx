import type { Metadata } from "next";
import { headers } from "next/headers";
import { redirect } from "next/navigation";
import { SignInForm } from "@/components/auth/SignInForm";
import { Logo } from "@/components/ui/Logo";
import { resolveActor } from "@/lib/auth/actor";
import { oidcProvider } from "@/lib/auth/options";
import { demoMode } from "@/lib/config";
import { sameOriginPath } from "@/lib/auth/callback";

export const metadata: Metadata = { title: "Sign in" };

export default async function SignInPage({ searchParams }: { searchParams: Promise<{ callbackUrl?: string; error?: string }> }) {
  const { callbackUrl, error } = await searchParams;
  const target = sameOriginPath(callbackUrl);
  // The server's word on the session, not the cookie's: an ended session (sign-out elsewhere, a role
  // change) must land here and stay, not bounce back to a page that refuses it.
  const actor = await resolveActor(await headers()).catch(() => null);
  if (actor?.type === "user") redirect(target);
  return (
    <main className="grid min-h-screen md:grid-cols-[1.1fr_1fr]">
      <section className="hidden flex-col justify-between border-r border-line bg-surface p-10 md:flex">
        <Logo size={34} />
        <div className="max-w-md">
          <h1 className="text-3xl font-semibold leading-tight tracking-tight">
            Where does your estate pinch?
          </h1>
          <p className="mt-4 text-muted">
            Pinchpoint keeps your service-dependency inventory as one graph, ranks the components whose loss takes the
            most down with them, and answers the on-call question: <em className="text-ink">this is down — what else is, and whom do I page?</em>
          </p>
          <p className="mt-6 text-xs text-faint">
            Rankings are only as good as the inventory they are computed from.
          </p>
        </div>
        <p className="text-xs text-faint">Pinchpoint · dependency analysis for site reliability engineering</p>
      </section>
      <section className="flex items-center justify-center p-6">
        <div className="w-full max-w-sm">
          <div className="mb-8 md:hidden">
            <Logo />
          </div>
          <h2 className="text-xl font-semibold">Sign in</h2>
          <p className="mt-1 text-sm text-muted">Use your work e-mail and password.</p>
          <SignInForm callbackUrl={target} initialError={error} ssoName={oidcProvider()?.name ?? null} />
          {demoMode() && (
            <p className="mt-8 rounded-md border border-line bg-surface p-3 text-xs text-muted">
              Demo mode: accounts are <span className="font-mono text-ink">&lt;role&gt;@harbor-pantry.example</span> (admin,
              architect, lead, engineer, viewer) with the password <span className="font-mono text-ink">pinchpoint-demo</span>.
            </p>
          )}
        </div>
      </section>
    </main>
  );
}
