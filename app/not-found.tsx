import Link from "next/link";

export default function NotFound() {
  return (
    <main className="grid min-h-[60vh] place-items-center px-4">
      <div className="max-w-md text-center">
        <p className="font-mono text-sm text-ink-500">404</p>
        <h1 className="mt-2 text-2xl font-semibold">No such page</h1>
        <p className="mt-3 text-ink-700">The address may be mistyped, or the record may belong to another lab.</p>
        <Link href="/" className="mt-6 inline-block font-semibold text-quartz-700 hover:underline">
          Back to your workspace
        </Link>
      </div>
    </main>
  );
}
