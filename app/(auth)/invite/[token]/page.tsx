import type { Metadata } from "next";
import Link from "next/link";
import { InviteAcceptForm } from "@/components/auth/InviteAcceptForm";
import { Logo } from "@/components/ui/Logo";
import { inviteTokenSchema } from "@/lib/api/schemas/users";
import { findOpenInvite } from "@/lib/data/user-admin";

export const metadata: Metadata = { title: "Set your password", referrer: "no-referrer" };
// The link is a secret: never prerender or cache this page.
export const dynamic = "force-dynamic";

export default async function InvitePage({ params }: { params: Promise<{ token: string }> }) {
  const { token } = await params;
  const invite = inviteTokenSchema.safeParse(token).success ? await findOpenInvite({ token }) : null;
  return (
    <main className="flex min-h-screen items-center justify-center p-6">
      <div className="w-full max-w-sm space-y-6">
        <Logo />
        {invite ? (
          <>
            <div>
              <h1 className="text-xl font-semibold">Welcome, {invite.name}</h1>
              <p className="mt-1 text-sm text-muted">
                Choose a password for <span className="font-mono text-ink">{invite.email}</span>. This link works once.
              </p>
            </div>
            <InviteAcceptForm token={token} email={invite.email} />
          </>
        ) : (
          <div className="space-y-3" data-testid="invite-invalid">
            <h1 className="text-xl font-semibold">This invite link does not work</h1>
            <p className="text-sm text-muted">
              It has been used already, replaced by a newer link, or has expired. Ask a Pinchpoint admin to send you a new one. If you have already set your password, sign in.
            </p>
            <Link href="/signin" className="text-brass underline underline-offset-4">
              Go to sign-in
            </Link>
          </div>
        )}
      </div>
    </main>
  );
}
