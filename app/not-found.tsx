import Link from "next/link";

export default function NotFound() {
  return (
    <main className="mx-auto max-w-xl p-10">
      <div className="card">
        <h1 className="text-lg font-semibold">Not found</h1>
        <p className="mt-2 text-sm text-ink-300">
          This page does not exist, or it belongs to a team you are not a member of.
        </p>
        <Link href="/home" className="btn-quiet mt-4">
          Back to team home
        </Link>
      </div>
    </main>
  );
}
