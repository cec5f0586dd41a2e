import { Suspense } from "react";
import { HandoverPage } from "@/components/handover/handover-screen";
import { Loading } from "@/components/ui/panel";

export const metadata = { title: "Shift handover" };

// /handover?cryostat=… — one cached page for every cryostat; data from the tablet store.
export default function Handover() {
  return (
    <Suspense fallback={<Loading />}>
      <HandoverPage />
    </Suspense>
  );
}
