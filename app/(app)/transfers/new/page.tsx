import { TransferForm } from "@/components/transfer/transfer-form";

export const metadata = { title: "Helium transfer" };

// The same HTML for everyone (the service worker precaches it); the form reads the tablet store.
export default function NewTransferPage() {
  return (
    <>
      <h1 className="mb-4 text-3xl font-bold">Record a helium transfer</h1>
      <TransferForm />
    </>
  );
}
