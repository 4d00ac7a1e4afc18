"use client";

import { signIn } from "next-auth/react";
import { useRouter } from "next/navigation";
import { useState, type FormEvent } from "react";
import { Button } from "@/components/ui/Button";
import { sendJson } from "./request";

const input = "mt-1 w-full rounded-md border border-line bg-raised px-3 py-2 text-ink outline-none focus:border-brass";

export function InviteAcceptForm({ token, email, minLength }: { token: string; email: string; minLength: number }) {
  const router = useRouter();
  const [error, setError] = useState<string | null>(null);
  const [pending, setPending] = useState(false);

  async function onSubmit(event: FormEvent<HTMLFormElement>) {
    event.preventDefault();
    const form = new FormData(event.currentTarget);
    const password = String(form.get("password") ?? "");
    if (password !== String(form.get("repeat") ?? "")) return setError("The two passwords are not the same.");
    if (password.length < minLength) return setError(`Use at least ${minLength} characters.`);
    setPending(true);
    setError(null);
    const result = await sendJson<{ email: string }>(`/api/v1/invites/${token}`, "POST", { password });
    if (!result.ok) {
      setPending(false);
      setError(result.problem.issues[0]?.message ? `Password: ${result.problem.issues[0].message}` : result.problem.message);
      return;
    }
    // Sign straight in with what was just typed; on failure the sign-in page takes over.
    const signedIn = await signIn("credentials", { email, password, redirect: false });
    router.replace(signedIn?.ok && !signedIn.error ? "/" : "/signin");
    router.refresh();
  }

  return (
    <form onSubmit={onSubmit} className="space-y-4">
      <input type="hidden" name="username" autoComplete="username" value={email} readOnly />
      <label className="block">
        <span className="text-sm font-medium">New password</span>
        <input name="password" type="password" autoComplete="new-password" required minLength={minLength} className={input} />
        <span className="mt-1 block text-xs text-muted">At least {minLength} characters. A few unrelated words work well.</span>
      </label>
      <label className="block">
        <span className="text-sm font-medium">Same password again</span>
        <input name="repeat" type="password" autoComplete="new-password" required className={input} />
      </label>
      {error && (
        <p role="alert" className="rounded-md border border-down/50 bg-down/10 px-3 py-2 text-sm">
          {error}
        </p>
      )}
      <Button type="submit" variant="primary" className="w-full py-2" disabled={pending}>
        {pending ? "Saving…" : "Set password and sign in"}
      </Button>
    </form>
  );
}
