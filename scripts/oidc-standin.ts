// The single sign-on stand-in as a process (npm start runs it on 127.0.0.1:3001).
import { DEMO_SSO_IDENTITIES, startOidcStandIn } from "./standins/oidc";

const port = Number(process.env.PINCHPOINT_OIDC_PORT ?? 3001);
const appUrl = process.env.NEXTAUTH_URL ?? "http://127.0.0.1:3000";

startOidcStandIn({
  port,
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
