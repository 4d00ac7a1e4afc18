// What the sign-in page may say. next-auth passes a thrown error's message through `?error=`,
// so the page shows only these texts (matched by value) or a generic line: never raw query text.
export const SIGN_IN_ERRORS = {
  wrong: "That e-mail and password do not match an active account.",
  limited: "Too many failed attempts. Wait 15 minutes, or ask an admin to check the account.",
  ssoNoAccount: "Single sign-on worked, but this identity has no active Pinchpoint account. Ask an admin.",
  unavailable: "Pinchpoint cannot reach its database right now. Try again in a few seconds.",
} as const;

const KNOWN = new Set<string>(Object.values(SIGN_IN_ERRORS));

export function signInErrorText(error: string | null | undefined): string | null {
  if (!error) return null;
  if (KNOWN.has(error)) return error;
  if (error === "CredentialsSignin") return SIGN_IN_ERRORS.wrong;
  if (error === "sso_no_account") return SIGN_IN_ERRORS.ssoNoAccount;
  return "Sign-in failed. Try again, or ask an admin to check your account.";
}
