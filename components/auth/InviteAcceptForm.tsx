"use client";
// The invitee chooses a password (twice, to catch a typo) and is signed straight in.
import { signIn } from "next-auth/react";
import { useRouter } from "next/navigation";
import { ApiForm, FormProblem, SubmitButton, submitWith, useApiForm } from "@/components/ui/form/api-form";
import { InputField } from "@/components/ui/form/fields";
import { acceptedInviteSchema, acceptInviteSchema, MIN_PASSWORD_LENGTH } from "@/lib/api/schemas/users";
import { sendJson } from "@/lib/client/api";

/** The route's body, and the same password again (never sent). */
const acceptFormSchema = acceptInviteSchema.extend({ repeat: acceptInviteSchema.shape.password }).refine((v) => v.password === v.repeat, {
  path: ["repeat"],
  message: "the two passwords are not the same",
});

export function InviteAcceptForm({ token, email }: { token: string; email: string }) {
  const router = useRouter();
  const form = useApiForm(acceptFormSchema, { password: "", repeat: "" });
  const onSubmit = submitWith(
    form,
    ({ password }) => sendJson(acceptedInviteSchema, `/api/v1/invites/${token}`, "POST", { password }),
    async (_, { password }) => {
      // Sign straight in with what was just typed; on failure the sign-in page takes over.
      const signedIn = await signIn("credentials", { email, password, redirect: false });
      router.replace(signedIn?.ok && !signedIn.error ? "/" : "/signin");
      router.refresh();
    },
  );

  return (
    <ApiForm form={form} onSubmit={onSubmit} label="Set your password" className="space-y-4">
      <input type="hidden" name="username" autoComplete="username" value={email} readOnly />
      <InputField name="password" label="New password" type="password" autoComplete="new-password" help={`At least ${MIN_PASSWORD_LENGTH} characters. A few unrelated words work well.`} />
      <InputField name="repeat" label="Same password again" type="password" autoComplete="new-password" />
      <FormProblem />
      <SubmitButton className="w-full py-2" working="Saving…">
        Set password and sign in
      </SubmitButton>
    </ApiForm>
  );
}
