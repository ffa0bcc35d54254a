/**
 * Origins whose file URLs the server accepts from upload callbacks and fetches: the local upload
 * service (UPLOADTHING_INGEST_URL serves the files too), any listed in LAPBENCH_FILE_ORIGINS, or
 * the hosted service's file host for the app id in UPLOADTHING_TOKEN.
 */
export function storageOrigins(env: NodeJS.ProcessEnv = process.env): string[] {
  const out = new Set<string>();
  const add = (v: string | undefined) => {
    if (!v) return;
    try {
      out.add(new URL(v).origin);
    } catch {
      /* ignored: not a URL */
    }
  };
  for (const v of (env.LAPBENCH_FILE_ORIGINS ?? "").split(",")) add(v.trim());
  add(env.UPLOADTHING_INGEST_URL);
  if (out.size === 0 && env.UPLOADTHING_TOKEN) {
    try {
      const { appId } = JSON.parse(Buffer.from(env.UPLOADTHING_TOKEN, "base64").toString("utf8")) as { appId?: string };
      if (appId && /^[a-z0-9-]+$/i.test(appId)) add(`https://${appId}.ufs.sh`);
    } catch {
      /* a malformed token is reported by the SDK */
    }
  }
  return [...out];
}
