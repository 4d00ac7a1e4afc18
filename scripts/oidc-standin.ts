// A local stand-in for the company's single sign-on: an OpenID Connect provider (the
// `oidc-provider` package) on loopback with a few invented demo identities. Run as a process by
// `npm start` (scripts/services.sh, on 127.0.0.1:$PINCHPOINT_OIDC_PORT, 3001) and imported by the
// end-to-end setup (tests/support/e2e-global.ts); production points PINCHPOINT_OIDC_ISSUER at the
// real provider.
import type { AddressInfo } from "node:net";
import Provider, { type Configuration } from "oidc-provider";

/** Invented people of the Harbor Pantry demo who sign in only through single sign-on. */
export const DEMO_SSO_IDENTITIES: Record<string, { email: string; name: string }> = {
  "sso-mara": { email: "mara.tideway@harbor-pantry.example", name: "Mara Tideway" },
  "sso-jonas": { email: "jonas.bollard@harbor-pantry.example", name: "Jonas Bollard" },
  // The same address as a password account: SSO links to that account instead of creating one.
  "sso-viewer": { email: "viewer@harbor-pantry.example", name: "Iris Pollard (viewer)" },
};

export interface OidcStandInOptions {
  port: number;
  clientId: string;
  clientSecret: string;
  redirectUris: string[];
}

export async function startOidcStandIn(opts: OidcStandInOptions): Promise<{ issuer: string; close(): Promise<void> }> {
  const issuer = `http://127.0.0.1:${opts.port}`;
  const configuration: Configuration = {
    clients: [
      {
        client_id: opts.clientId,
        client_secret: opts.clientSecret,
        redirect_uris: opts.redirectUris,
        grant_types: ["authorization_code"],
        response_types: ["code"],
        token_endpoint_auth_method: "client_secret_basic",
      },
    ],
    claims: { openid: ["sub"], email: ["email", "email_verified"], profile: ["name"] },
    // The built-in development login and consent pages: the stand-in needs no UI of ours.
    features: { devInteractions: { enabled: true } },
    cookies: { keys: ["pinchpoint-oidc-stand-in-cookie-key"] },
    async findAccount(_ctx, id) {
      const person = DEMO_SSO_IDENTITIES[id];
      if (!person) return undefined;
      return {
        accountId: id,
        async claims() {
          return { sub: id, email: person.email, email_verified: true, name: person.name };
        },
      };
    },
    pkce: { required: () => false },
    ttl: { AccessToken: 3600, AuthorizationCode: 60, IdToken: 3600, Interaction: 600, Session: 8 * 3600, Grant: 8 * 3600 },
    // Put the e-mail and name claims in the ID token, as company providers commonly do;
    // next-auth reads the profile from the ID token.
    conformIdTokenClaims: false,
  };
  const provider = new Provider(issuer, configuration);
  const server = provider.listen(opts.port, "127.0.0.1");
  await new Promise<void>((resolve, reject) => {
    server.once("listening", () => resolve());
    server.once("error", reject);
  });
  const port = (server.address() as AddressInfo).port;
  return {
    issuer: `http://127.0.0.1:${port}`,
    close: () => new Promise((resolve) => server.close(() => resolve())),
  };
}

// Run directly (tsx scripts/oidc-standin.ts), not imported: start on the demo's port.
if (/oidc-standin\.ts$/.test(process.argv[1] ?? "")) {
  const appUrl = process.env.NEXTAUTH_URL ?? "http://127.0.0.1:3000";
  startOidcStandIn({
    port: Number(process.env.PINCHPOINT_OIDC_PORT ?? 3001),
    clientId: process.env.PINCHPOINT_OIDC_CLIENT_ID ?? "pinchpoint",
    clientSecret: process.env.PINCHPOINT_OIDC_CLIENT_SECRET ?? "pinchpoint-stand-in-secret",
    redirectUris: [`${appUrl}/api/auth/callback/oidc`],
  })
    .then(({ issuer }) => {
      console.log(`[sso] OpenID Connect stand-in on ${issuer}; demo identities (any password): ${Object.keys(DEMO_SSO_IDENTITIES).join(", ")}`);
    })
    .catch((error: unknown) => {
      console.error("[sso] could not start:", error);
      process.exit(1);
    });
}
