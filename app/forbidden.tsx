import Link from "next/link";

export default function Forbidden() {
  return (
    // Inside the workspace's own <main>: a section, not a second main landmark.
    <section className="grid min-h-[60vh] place-items-center px-4" aria-labelledby="forbidden-title">
      <div className="max-w-md text-center">
        <p className="font-mono text-sm text-ink-500">403</p>
        <h1 id="forbidden-title" className="mt-2 text-2xl font-semibold">Not open to your role</h1>
        <p className="mt-3 text-ink-700">
          Your role in this lab does not include this page. If you need it, ask a lab administrator to change your role.
        </p>
        <Link href="/" className="mt-6 inline-block font-semibold text-quartz-700 hover:underline">
          Back to your workspace
        </Link>
      </div>
    </section>
  );
}
