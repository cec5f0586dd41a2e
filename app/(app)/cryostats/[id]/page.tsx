import { CryostatCharts } from "@/components/charts/cryostat-charts";
import { CryostatLogbook } from "@/components/logbook/cryostat-logbook";

export const metadata = { title: "Logbook" };

export default async function CryostatPage({ params }: { params: Promise<{ id: string }> }) {
  const { id } = await params;
  return (
    <>
      <CryostatLogbook cryostatId={id} />
      <div className="mt-6"><CryostatCharts cryostatId={id} /></div>
    </>
  );
}
