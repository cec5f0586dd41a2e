"use client";
// <Caution topic="transfer" cryostatId="plover" />: the cryogen and magnet cautions for a work
// screen, in plain words, with the facility's own values (oxygen alarm level, PPE, two-person
// rule, ramp limit, contacts) beside them and a link to the facility's rules document.
import { useId, useState } from "react";
import { useLoopState } from "@/components/sync/runtime";
import { useFacilityRules } from "@/lib/local/hooks";
import { type CautionContext, type CautionTopic, cautionsFor, facilityFacts } from "@/lib/safety/cautions";

export type CautionProps = CautionContext & {
  topic: CautionTopic;
  /** Start with the texts open (the facts and the document link are always visible). */
  defaultOpen?: boolean;
  className?: string;
};

export const RULES_DOCUMENT_URL = "/api/rules/document";

export function Caution({ topic, defaultOpen = false, className = "", ...ctx }: CautionProps) {
  // The rules as the last sync brought them to this tablet (they change only with a pull).
  const rules = useFacilityRules();
  const loop = useLoopState();
  const loading = rules === undefined || (rules === null && loop.running);
  const offline = !loop.online;
  const [open, setOpen] = useState(defaultOpen);
  const id = useId();
  const values = rules?.values;
  const sections = values ? cautionsFor(topic, values, ctx) : [];
  const facts = values ? facilityFacts(values, ctx) : null;
  return (
    <aside
      aria-labelledby={`${id}-title`}
      data-caution={topic}
      className={`rounded-2xl border-2 border-warn bg-panel p-4 ${className}`}
    >
      <div className="flex flex-wrap items-center justify-between gap-2">
        <h2 id={`${id}-title`} className="text-lg font-bold text-warn">
          <span aria-hidden>⚠ </span>Safety: {TOPIC_TITLE[topic]}
        </h2>
        <button
          type="button"
          aria-expanded={open}
          aria-controls={`${id}-body`}
          onClick={() => setOpen((o) => !o)}
          className="min-h-12 rounded-xl border-2 border-line px-4 font-semibold hover:bg-sunk"
        >
          {open ? "Hide the cautions" : "Read the cautions"}
        </button>
      </div>
      {!values && loading && <p className="text-muted">Loading the facility's rules…</p>}
      {!values && !loading && (
        <p className="text-ink">
          The facility's rules are not on this tablet yet{offline ? " (no connection)" : ""}. Follow the facility's
          rules, your training, the safety officer and the equipment maker's instructions.
        </p>
      )}
      {facts && rules && (
        <dl className="mt-2 grid gap-x-4 gap-y-1 text-base sm:grid-cols-[auto_1fr]" aria-label="The facility's values">
          <dt className="font-semibold text-muted">Oxygen</dt>
          <dd data-fact="oxygen">{facts.oxygen}</dd>
          {(topic === "transfer" || topic === "cooldown" || topic === "oxygen") && (
            <>
              <dt className="font-semibold text-muted">People</dt>
              <dd data-fact="two-person">{facts.twoPerson}</dd>
            </>
          )}
          <dt className="font-semibold text-muted">Wear</dt>
          <dd data-fact="ppe">{facts.ppe.length ? facts.ppe.join(" · ") : "No list set by the facility admin"}</dd>
          {(topic === "ramp" || topic === "magnet" || topic === "quench") && (
            <>
              <dt className="font-semibold text-muted">Field</dt>
              <dd data-fact="controlled-area">{facts.controlledArea}</dd>
            </>
          )}
          {facts.maxRamp !== undefined && (topic === "ramp" || topic === "magnet") && (
            <>
              <dt className="font-semibold text-muted">Ramp limit</dt>
              <dd data-fact="ramp-limit">
                <span className="num">{facts.maxRamp}</span> T/min (facility)
              </dd>
            </>
          )}
          {facts.minLevel !== undefined && (topic === "transfer" || topic === "quench") && (
            <>
              <dt className="font-semibold text-muted">Minimum level</dt>
              <dd data-fact="min-level" className="num">
                {facts.minLevel} %
              </dd>
            </>
          )}
          <dt className="font-semibold text-muted">Contacts</dt>
          <dd data-fact="contacts">
            {facts.contacts.map((c) => (
              <span key={`${c.role}|${c.name}|${c.phone}`} className="mr-3 inline-block">
                {c.role}: {c.name},{" "}
                <a
                  className="num inline-flex min-h-12 items-center font-semibold underline"
                  href={`tel:${c.phone.replace(/[^+\d]/g, "")}`}
                >
                  {c.phone}
                </a>
              </span>
            ))}
          </dd>
        </dl>
      )}
      {rules?.document && (
        <p className="mt-2">
          <a
            href={RULES_DOCUMENT_URL}
            target="_blank"
            rel="noopener"
            className="inline-flex min-h-12 items-center font-semibold text-accent underline"
          >
            Open the facility's rules document ({rules.document.fileName})
          </a>
        </p>
      )}
      <div id={`${id}-body`} hidden={!open} className="mt-3 flex flex-col gap-3">
        {sections.map((s) => (
          <section key={s.id} data-section={s.id}>
            <h3 className="font-bold">{s.title}</h3>
            <ul className="ml-5 list-disc">
              {s.points.map((p) => (
                <li key={p}>{p}</li>
              ))}
            </ul>
          </section>
        ))}
      </div>
      {sections[0] && (
        <p data-deferral className="mt-2 text-base font-semibold">
          {sections[0].deferral}
        </p>
      )}
    </aside>
  );
}

const TOPIC_TITLE: Record<CautionTopic, string> = {
  transfer: "helium transfer",
  cooldown: "cooldown",
  warmup: "warmup",
  ramp: "magnet ramp",
  quench: "quench",
  magnet: "magnet",
  oxygen: "oxygen deficiency",
  cold: "cold burns",
};
