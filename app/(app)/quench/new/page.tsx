import { QuenchForm } from "@/components/quench/quench-form";

export const metadata = { title: "Quench or incident" };

export default function NewQuenchPage() {
  return (
    <>
      <h1 className="mb-4 text-3xl font-bold">Record a quench or incident</h1>
      <QuenchForm />
    </>
  );
}
