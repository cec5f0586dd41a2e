import Link from "next/link";
import { Panel } from "@/components/ui/panel";

export function NotAllowed({ need }: { need: string }) {
  return (
    <Panel className="mx-auto max-w-xl text-center">
      <h1 className="mb-2 text-3xl font-bold">Not allowed</h1>
      <p className="mb-4 text-muted">
        This page is for the {need}. Your role does not include it; ask the facility admin if you need it.
      </p>
      <Link
        href="/"
        className="inline-flex min-h-12 items-center rounded-xl border-2 border-accent px-5 font-semibold text-accent"
      >
        Back to the room
      </Link>
    </Panel>
  );
}
