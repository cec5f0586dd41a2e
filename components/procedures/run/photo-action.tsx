"use client";
// A photo step: the camera (or a file), kept on the tablet and uploaded on the next sync.
import { useState } from "react";
import { buttonClass } from "@/components/ui/button";
import { putAttachment } from "@/lib/local/record";
import type { TemplateStep } from "@/lib/schemas/template";
import { type Ctx, errorText, writeStep } from "./context";

export function PhotoAction({ step, ctx }: { step: Extract<TemplateStep, { kind: "photo" }>; ctx: Ctx }) {
  const [busy, setBusy] = useState(false);
  return (
    <label className={buttonClass("primary", `min-h-16 self-start text-xl ${busy ? "opacity-50" : ""} cursor-pointer`)}>
      📷 {busy ? "Saving photo…" : "Take a photo"}
      <input
        type="file"
        accept="image/*"
        capture="environment"
        className="sr-only"
        aria-label="Take a photo"
        disabled={busy}
        onChange={async (e) => {
          const file = e.target.files?.[0];
          e.target.value = "";
          if (!file) return;
          setBusy(true);
          try {
            const attachmentId = await putAttachment(file, {
              fileName: file.name || "photo.jpg",
              mime: file.type || "image/jpeg",
            });
            await writeStep(ctx, { stepId: step.id, kind: "photo", attachmentId });
          } catch (err) {
            ctx.onError(errorText(err));
          } finally {
            setBusy(false);
          }
        }}
      />
    </label>
  );
}
