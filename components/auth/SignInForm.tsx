"use client";

import { signIn } from "next-auth/react";
import { useRouter } from "next/navigation";
import { useState, type FormEvent } from "react";
import { Button } from "@/components/ui/Button";
import { signInErrorText } from "@/lib/auth/messages";


export function SignInForm({ callbackUrl, initialError, ssoName }: { callbackUrl: string; initialError?: string; ssoName: string | null }) {
  const router = useRouter();
  const [error, setError] = useState<string | null>(signInErrorText(initialError));
  const [pending, setPending] = useState(false);

  async function onSubmit(event: FormEvent<HTMLFormElement>) {
    event.preventDefault();
    const form = new FormData(event.currentTarget);
    setPending(true);
    setError(null);
    const result = await signIn("credentials", {
      email: String(form.get("email") ?? ""),
      password: String(form.get("password") ?? ""),
      redirect: false,
    });
    setPending(false);
    if (!result || result.error || !result.ok) {
      setError(signInErrorText(result?.error) ?? "Sign-in failed.");
      return;
    }
    router.replace(callbackUrl);
    router.refresh();
  }

  return (
    <>
    {ssoName && (
      <div className="mt-6">
        <Button type="button" className="w-full py-2" onClick={() => signIn("oidc", { callbackUrl })}>
          Continue with {ssoName}
        </Button>
        <div className="mt-6 flex items-center gap-3 text-xs text-faint" aria-hidden="true">
          <span className="h-px flex-1 bg-line" /> or with a password <span className="h-px flex-1 bg-line" />
        </div>
      </div>
    )}
    <form onSubmit={onSubmit} className="mt-6 space-y-4" aria-describedby={error ? "signin-error" : undefined}>
      <label className="block">
        <span className="text-sm font-medium">E-mail</span>
        <input
          name="email"
          type="email"
          autoComplete="username"
          required
          className="mt-1 w-full rounded-md border border-line bg-raised px-3 py-2 text-ink outline-none focus:border-brass"
        />
      </label>
      <label className="block">
        <span className="text-sm font-medium">Password</span>
        <input
          name="password"
          type="password"
          autoComplete="current-password"
          required
          className="mt-1 w-full rounded-md border border-line bg-raised px-3 py-2 text-ink outline-none focus:border-brass"
        />
      </label>
      {error && (
        <p id="signin-error" role="alert" className="rounded-md border border-down/50 bg-down/10 px-3 py-2 text-sm text-ink">
          {error}
        </p>
      )}
      <Button type="submit" variant="primary" className="w-full py-2" disabled={pending}>
        {pending ? "Signing in…" : "Sign in"}
      </Button>
    </form>
    </>
  );
}
