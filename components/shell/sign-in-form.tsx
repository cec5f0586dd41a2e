"use client";
// Email and password sign-in. Errors come back in plain words (wrong details; a locked account or
// address answers 429 with the wait, which next-auth's signIn() hands back as its error).
import { zodResolver } from "@hookform/resolvers/zod";
import { useSearchParams } from "next/navigation";
import { signIn } from "next-auth/react";
import { useState } from "react";
import { useForm } from "react-hook-form";
import { z } from "zod";
import { Button } from "@/components/ui/button";
import { TextField } from "@/components/ui/field";
import { Notice, Panel } from "@/components/ui/panel";
import { localDb } from "@/lib/local/db";
import { safeNextPath } from "@/lib/safe-next";
import { httpTransport } from "@/lib/sync/http";
import { registerDevice } from "@/lib/sync/register";

const schema = z.object({
  email: z.string().trim().email("Enter your email address"),
  password: z.string().min(1, "Enter your password"),
});

export function SignInForm() {
  const params = useSearchParams();
  const [error, setError] = useState<string | null>(null);
  const {
    register,
    handleSubmit,
    formState: { errors, isSubmitting },
  } = useForm<z.infer<typeof schema>>({ resolver: zodResolver(schema) });

  const submit = handleSubmit(async ({ email, password }) => {
    setError(null);
    if (!navigator.onLine) {
      setError("Signing in needs the network once. Connect the tablet, sign in, and it will then work offline.");
      return;
    }
    const res = await signIn("credentials", { email, password, redirect: false });
    if (!res || res.error) {
      setError(res?.error && res.error !== "CredentialsSignin" ? res.error : "Email or password did not match.");
      return;
    }
    // Bind this tablet to the session now (the first sync round does it again if this fails).
    try {
      await registerDevice(localDb(), httpTransport);
    } catch {
      /* no store or no answer: the sync round registers */
    }
    window.location.assign(safeNextPath(params.get("next")));
  });

  return (
    <Panel>
      <h1 className="mb-4 text-2xl font-bold">Sign in</h1>
      <form onSubmit={submit} className="flex flex-col gap-4" noValidate>
        <TextField
          label="Email"
          type="email"
          autoComplete="username"
          inputMode="email"
          {...register("email")}
          error={errors.email?.message}
        />
        <TextField
          label="Password"
          type="password"
          autoComplete="current-password"
          {...register("password")}
          error={errors.password?.message}
        />
        {error && (
          <Notice tone="danger" role="alert">
            {error}
          </Notice>
        )}
        <Button type="submit" variant="primary" disabled={isSubmitting} className="text-lg">
          {isSubmitting ? "Signing in…" : "Sign in"}
        </Button>
      </form>
    </Panel>
  );
}
