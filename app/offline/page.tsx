import Link from "next/link";

export const metadata = { title: "Offline" };

export default function OfflinePage() {
  return (
    <main className="mx-auto flex min-h-screen max-w-md flex-col justify-center gap-4 px-4 text-center">
      <h1 className="text-3xl font-bold">This page is not on the tablet</h1>
      <p className="text-muted">
        There is no network, and this page was not saved for offline use. Everything you record is kept on the tablet
        and sent when the network returns.
      </p>
      <Link
        href="/"
        className="mx-auto inline-flex min-h-12 items-center rounded-xl border-2 border-accent px-5 font-semibold text-accent"
      >
        Back to the room
      </Link>
    </main>
  );
}
