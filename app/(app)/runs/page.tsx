import { Suspense } from "react";
import { RunPage } from "@/components/procedures/run-page";
import { Loading } from "@/components/ui/panel";

export const metadata = { title: "Procedure run" };

// One page for every run (/runs?id=…): precached once, it opens any run offline from the tablet store.
export default function RunsPage() {
  return (
    <Suspense fallback={<Loading label="Opening the run…" />}>
      <RunPage />
    </Suspense>
  );
}
