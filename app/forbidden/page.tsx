import Link from "next/link";

export const metadata = { title: "Not allowed" };

export default function ForbiddenPage() {
  return (
    <main className="mx-auto max-w-xl p-10">
      <div className="card">
        <h1 className="text-lg font-semibold">Your role does not include this screen</h1>
        <p className="mt-2 text-sm text-ink-300">Ask the team owner if you need it.</p>
        <Link href="/home" className="btn-quiet mt-4">Back to team home</Link>
      </div>
    </main>
  );
}
