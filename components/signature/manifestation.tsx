// A signature as it must read wherever the signed record is shown (21 CFR 11.50 style): printed
// name, role, date and time, meaning, how identity was confirmed, and whether it still matches.
import { ROLE_LABEL, type Role } from "@/lib/auth/permissions";
import { formatDate, meaningLabel } from "@/lib/format";
import type { SignatureView } from "@/lib/procedures/state";

/** What a manifestation needs; loose on purpose so audit and handover views can pass their own rows. */
export type ManifestSig = Pick<SignatureView, "signerName" | "signerRole" | "signedAt" | "valid"> & {
  meaning: string;
  confirmedBy?: string | null;
  image?: string | null;
};

export function SignatureManifestation({ sig, compact = false }: { sig: ManifestSig; compact?: boolean }) {
  const role = ROLE_LABEL[sig.signerRole as Role] ?? sig.signerRole;
  return (
    <figure
      data-signature
      className={`sig-manifest flex flex-wrap items-center gap-3 rounded-xl border-2 ${sig.valid ? "border-ok" : "border-danger"} bg-panel px-3 py-2`}
    >
      {sig.image && !compact && (
        <img src={sig.image} alt={`Signature mark of ${sig.signerName}`} className="h-14 w-auto rounded bg-white" />
      )}
      <figcaption className="leading-snug">
        <span className="block font-semibold">
          {meaningLabel(sig.meaning)} — {sig.signerName}
        </span>
        <span className="block text-sm text-muted">
          {role} · <time dateTime={sig.signedAt}>{formatDate(sig.signedAt)}</time> ·{" "}
          {sig.confirmedBy === "pin"
            ? "identity confirmed with PIN"
            : sig.confirmedBy === "password"
              ? "identity confirmed with password"
              : "identity not confirmed"}
        </span>
        {!sig.valid && (
          <span className="block text-sm font-semibold text-danger">
            Does not match the record it names: the record was changed after signing.
          </span>
        )}
      </figcaption>
    </figure>
  );
}
