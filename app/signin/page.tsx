import { Suspense } from "react";
import { SignInForm } from "@/components/shell/sign-in-form";
import { ThemeToggle } from "@/components/shell/theme-toggle";

export const metadata = { title: "Sign in" };

export default function SignInPage() {
  return (
    <main className="mx-auto flex min-h-screen max-w-md flex-col justify-center gap-6 px-4 py-10">
      <div className="flex items-center justify-between">
        <p className="flex items-center gap-2 text-2xl font-bold">
          <span aria-hidden className="inline-block h-7 w-7 rounded-md bg-accent" />
          Rimelog
        </p>
        <ThemeToggle />
      </div>
      <Suspense>
        <SignInForm />
      </Suspense>
      <p className="text-center text-sm text-muted">
        The logbook of the cryostat room. Works without a network once you have signed in here.
      </p>
    </main>
  );
}
