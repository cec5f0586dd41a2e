import { ProceduresHome } from "@/components/procedures/procedures-home";

export const metadata = { title: "Procedures" };

// The same HTML for everyone (cached by the service worker); the data comes from the tablet store.
export default function ProceduresPage() {
  return (
    <>
      <h1 className="mb-4 text-3xl font-bold">Procedures</h1>
      <ProceduresHome />
    </>
  );
}
