/**
 * The browser's better-auth client (sign-in/up, password reset, teams). Browser-safe: imports only
 * the access-control roles, never the server options. Same-origin, so no baseURL is needed.
 */
import { createAuthClient } from "better-auth/react";
import { organizationClient } from "better-auth/client/plugins";
import { ac, roles } from "./permissions";

export const authClient = createAuthClient({
  plugins: [organizationClient({ ac, roles })],
});

export const { useSession, signIn, signOut, signUp } = authClient;
