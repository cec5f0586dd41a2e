import type { ReactNode } from "react";
import { AppHeader } from "@/components/shell/app-header";

export default function SignedInLayout({ children }: { children: ReactNode }) {
  return (
    <>
      <AppHeader />
      <main className="mx-auto max-w-6xl px-4 py-6">{children}</main>
    </>
  );
}
