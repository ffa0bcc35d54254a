// better-auth's endpoints (/api/auth/*): sign-in/up/out, sessions, password reset, teams.
import { toNextJsHandler } from "better-auth/next-js";
import { auth } from "@/lib/auth/auth";

export const { GET, POST } = toNextJsHandler(auth);
