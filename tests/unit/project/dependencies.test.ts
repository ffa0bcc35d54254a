/**
 * package.json keeps run-time and test-only packages apart: every entry of "dependencies" is used
 * by code that runs outside the tests (the app, the workers, the local services, the sample-log
 * generator, the npm scripts), and every package that code imports is in "dependencies", so an
 * install without dev dependencies still runs. Test-only packages belong in "devDependencies".
 */
import { describe, expect, it } from "vitest";
import { readdirSync, readFileSync, statSync } from "node:fs";
import { builtinModules } from "node:module";
import path from "node:path";

const ROOT = path.resolve(__dirname, "../../..");
const pkg = JSON.parse(readFileSync(path.join(ROOT, "package.json"), "utf8")) as { dependencies: Record<string, string>; devDependencies: Record<string, string>; scripts: Record<string, string> };
const RUNTIME = ["app", "components", "lib", "models", "workers", "sample-logs", "proxy.ts", "instrumentation.ts", "next.config.ts", "postcss.config.mjs"];
/** Build tools the Next.js build reads from config and CSS; a production build installs dev dependencies. */
const BUILD_TOOLS = new Set(["tailwindcss", "@tailwindcss/postcss"]);

function files(p: string): string[] {
  const full = path.join(ROOT, p);
  if (statSync(full).isFile()) return [full];
  return readdirSync(full, { withFileTypes: true }).flatMap((e) => (e.isDirectory() ? files(path.join(p, e.name)) : /\.(ts|tsx|mjs|css)$/.test(e.name) ? [path.join(full, e.name)] : []));
}

const packageOf = (spec: string) => (spec.startsWith("@") ? spec.split("/").slice(0, 2).join("/") : spec.split("/")[0]!);

/** Packages used at run time, with a file that uses each; notImported: only a type import or an npm script (which may run test tools). */
function runtimeUses(): Map<string, { file: string; notImported: boolean }> {
  const out = new Map<string, { file: string; notImported: boolean }>();
  const add = (spec: string, file: string, notImported: boolean) => {
    if (spec.startsWith(".") || spec.startsWith("@/") || spec.startsWith("node:") || builtinModules.includes(spec.split("/")[0]!)) return;
    const name = packageOf(spec);
    const had = out.get(name);
    if (!had || (had.notImported && !notImported)) out.set(name, { file: path.relative(ROOT, file), notImported });
  };
  for (const f of RUNTIME.flatMap(files)) {
    const text = readFileSync(f, "utf8");
    for (const m of text.matchAll(/^\s*(import|export)\s+(type\s+)?[^"';]*?from\s+"([^"]+)"/gm)) add(m[3]!, f, !!m[2]);
    for (const m of text.matchAll(/(?:^\s*import\s+|import\(|require\(|@import\s+)"([^"]+)"/gm)) add(m[1]!, f, false);
    for (const m of text.matchAll(/node_modules\/((?:@[^/"]+\/)?[^/"]+)\//g)) add(m[1]!, f, false);
  }
  for (const s of Object.values(pkg.scripts)) for (const m of s.matchAll(/^(\S+)|&&\s*(\S+)/g)) add(m[1] ?? m[2]!, "package.json scripts", true);
  return out;
}

describe("package.json: run-time and test-only packages", () => {
  const uses = runtimeUses();

  it("every dependency is used outside the tests", () => {
    // react-dom is loaded by Next.js itself (a peer dependency of next), not imported by our code.
    const unused = Object.keys(pkg.dependencies).filter((d) => !uses.has(d) && d !== "react-dom");
    expect(unused).toEqual([]);
  });

  it("everything the app, workers and generator import is a dependency, not a dev dependency", () => {
    const misplaced = [...uses]
      .filter(([name, u]) => !u.notImported && !BUILD_TOOLS.has(name) && !(name in pkg.dependencies))
      .map(([name, u]) => `${name} (${u.file})`);
    expect(misplaced).toEqual([]);
  });
});
