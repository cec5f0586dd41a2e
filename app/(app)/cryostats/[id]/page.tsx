// A cryostat: quick entries and its logbook. The HTML is the same for every cryostat and user
// (no data in it), so the service worker serves one cached copy offline; data comes from Dexie.
import { CryostatCharts } from "@/components/charts/cryostat-charts";
import { CryostatScreen } from "@/components/logbook/cryostat-screen";

export const metadata = { title: "Cryostat" };

export default function CryostatPage() {
  return (
    <>
      <CryostatScreen />
      <div className="mt-6">
        <CryostatCharts />
      </div>
    </>
  );
}
