import { PasswordForm } from "@/components/account/password-form";

export const metadata = { title: "My account" };

/** `?reset=1`: sent here by the page guard after an admin's password reset. */
export default async function AccountPage({ searchParams }: { searchParams: Promise<{ reset?: string }> }) {
  const { reset } = await searchParams;
  return (
    <>
      <h1 className="mb-4 text-3xl font-bold">My account</h1>
      <PasswordForm mustChange={reset === "1"} />
    </>
  );
}
