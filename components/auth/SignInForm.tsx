"use client";
// Password sign-in (next-auth's credentials provider) and, when configured, single sign-on.
import { signIn } from "next-auth/react";
import { useRouter } from "next/navigation";
import { Button } from "@/components/ui/Button";
import { ApiForm, FormProblem, SERVER_ERROR, SubmitButton, useApiForm } from "@/components/ui/form/api-form";
import { InputField } from "@/components/ui/form/fields";
import { signInSchema } from "@/lib/api/schemas/users";
import { signInErrorText } from "@/lib/auth/messages";

export function SignInForm({ callbackUrl, initialError, ssoName }: { callbackUrl: string; initialError?: string; ssoName: string | null }) {
  const router = useRouter();
  const form = useApiForm(signInSchema, { email: "", password: "" });
  const initial = signInErrorText(initialError);

  // next-auth answers with its own error words (lib/auth/messages.ts), not our API's issues.
  const onSubmit = form.handleSubmit(async ({ email, password }) => {
    const result = await signIn("credentials", { email, password, redirect: false });
    if (!result || result.error || !result.ok) {
      form.setError(SERVER_ERROR, { type: "server", message: signInErrorText(result?.error) ?? "Sign-in failed." });
      return;
    }
    router.replace(callbackUrl);
    router.refresh();
  });

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
      <ApiForm form={form} onSubmit={onSubmit} label="Sign in" className="mt-6 space-y-4">
        <InputField name="email" label="E-mail" type="email" autoComplete="username" />
        <InputField name="password" label="Password" type="password" autoComplete="current-password" />
        {initial && !form.formState.errors.root && (
          <p id="signin-error" role="alert" className="rounded-md border border-down/50 bg-down/10 px-3 py-2 text-sm text-ink">
            {initial}
          </p>
        )}
        <FormProblem id="signin-error" />
        <SubmitButton className="w-full py-2" working="Signing in…">
          Sign in
        </SubmitButton>
      </ApiForm>
    </>
  );
}
