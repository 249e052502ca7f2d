import Link from "next/link";

export default function NotFound() {
  return (
    <main className="mx-auto max-w-lg px-6 py-24 text-center">
      <p className="text-5xl font-semibold text-muted">404</p>
      <h1 className="mt-4 text-xl font-semibold">Nothing here</h1>
      <p className="mt-2 text-sm text-muted">The page does not exist, or it belongs to a manuscript you are not a member of.</p>
      <Link href="/manuscripts" className="mt-6 inline-block text-accent underline">
        Your manuscripts
      </Link>
    </main>
  );
}
