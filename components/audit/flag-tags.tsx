// The automatic flags of a record as tags (the label, with the detail as a tooltip and for screen readers).
import { Tag } from "@/components/ui/panel";
import type { Flag } from "@/lib/audit/flags";

export function FlagTags({ flags }: { flags: Flag[] }) {
  if (!flags.length) return <Tag tone="ok">No flags</Tag>;
  return (
    <span className="flex flex-wrap gap-1" data-flags={flags.map((f) => f.code).join(" ")}>
      {flags.map((f) => (
        <span key={f.code} title={f.detail} data-flag={f.code}>
          <Tag tone={f.code === "chain_broken" || f.code === "oxygen_below_alarm" ? "danger" : "warn"}>
            {f.label}
            <span className="sr-only">: {f.detail}</span>
          </Tag>
        </span>
      ))}
    </span>
  );
}
