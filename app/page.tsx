import { headers } from "next/headers";
import { redirect } from "next/navigation";
import { auth } from "@/lib/auth/auth";

export default async function Index() {
  const session = await auth.api.getSession({ headers: await headers() });
  redirect(session ? "/home" : "/sign-in");
}
