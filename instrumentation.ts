/**
 * Runs once when the Next server starts. A production server refuses to run with a missing,
 * development or short BETTER_AUTH_SECRET: a known key lets anyone sign a session for any user.
 */
declare global {
  var __lapbenchClientAddress: boolean | undefined;
}

export async function register() {
  if (process.env.NEXT_RUNTIME !== "nodejs" || process.env.NODE_ENV !== "production") return;
  const { authSecretProblem, assertProductionAuthSecret } = await import("./lib/security/auth-secret");
  if (authSecretProblem(process.env.BETTER_AUTH_SECRET)) {
    try {
      assertProductionAuthSecret(process.env.BETTER_AUTH_SECRET);
    } catch (e) {
      console.error(`[lapbench] refusing to start: ${(e as Error).message}`);
    }
    process.exit(1);
  }
  if (globalThis.__lapbenchClientAddress !== true) {
    console.warn(
      "[lapbench] started without workers/services/peer-address-preload.mjs: client addresses (sign-in limits, /dev/mail) cannot be trusted. Start with `npm start`, or `node --import ./workers/services/peer-address-preload.mjs node_modules/next/dist/bin/next start`.",
    );
  }
}
