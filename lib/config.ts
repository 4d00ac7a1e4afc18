// Settings read from the environment (each documented in README.md).

/** Demo mode: the seed creates one account per role with a known password, and the UI says so. */
export const demoMode = () => process.env.PINCHPOINT_DEMO === "1";

export const appUrl = () => process.env.NEXTAUTH_URL ?? "http://127.0.0.1:3000";

/** The environment `/` shows. */
export const defaultEnvironment = () => process.env.PINCHPOINT_DEFAULT_ENV ?? "production";
