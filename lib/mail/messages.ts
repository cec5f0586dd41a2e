// The e-mails Rimelog sends, one builder per event, each with the event key that makes it go out
// once: a quench, an audit finding needing action, a handover waiting for acceptance, and the
// helium forecast reaching the minimum. Pure text; figures that are computed say so.
/** Where a message goes out: the server's nodemailer transport (SMTP or a local fake). */
export type MailTransport = {
  kind: "fake" | "smtp";
  send(m: { from: string; to: string; subject: string; text: string }): Promise<{ messageId: string }>;
};

export type MailMessage = { eventKey: string; to: string[]; subject: string; body: string };

const FOOTER =
  "\n\n—\nSent by Rimelog. Open the record in Rimelog for the details; the facility's rules, your training, the safety officer and the equipment maker's instructions come first.";

const when = (iso: string) => `${iso.slice(0, 16).replace("T", " ")} UTC`;

export function quenchMail(q: {
  entryId: string;
  cryostatName: string;
  at: string;
  fieldT: number;
  heliumLostLitres?: number | null;
  oxygenLowestPercent?: number;
  actions: string;
  reportedBy: string;
  to: string[];
}): MailMessage {
  const lines = [
    `${q.reportedBy} recorded a quench of the ${q.cryostatName} magnet at ${when(q.at)}, at ${q.fieldT} T.`,
    q.heliumLostLitres != null
      ? `Helium lost: about ${Number(q.heliumLostLitres.toFixed(1))} L (estimate).`
      : "Helium lost: not recorded.",
    q.oxygenLowestPercent !== undefined
      ? `Lowest oxygen reading: ${q.oxygenLowestPercent} %.`
      : "No oxygen reading was recorded.",
    `Actions taken: ${q.actions || "none recorded"}`,
    "The quench is in the safety officer's audit queue.",
  ];
  return {
    eventKey: `quench:${q.entryId}`,
    to: q.to,
    subject: `Quench on ${q.cryostatName} — ${when(q.at)}`,
    body: lines.join("\n") + FOOTER,
  };
}

export function findingNeedsActionMail(f: {
  findingId: string;
  targetKind: string;
  cryostatName: string;
  targetAt: string;
  officer: string;
  findings: string;
  flags: string[];
  to: string[];
}): MailMessage {
  const lines = [
    `${f.officer} audited the ${f.targetKind} on ${f.cryostatName} of ${when(f.targetAt)} and marked it as needing action.`,
    `Findings: ${f.findings || "(none written)"}`,
    f.flags.length ? `Flags: ${f.flags.join(", ")}.` : "No automatic flags.",
  ];
  return {
    eventKey: `finding-needs-action:${f.findingId}`,
    to: f.to,
    subject: `Audit: action needed on ${f.cryostatName} ${f.targetKind}`,
    body: lines.join("\n") + FOOTER,
  };
}

export function handoverWaitingMail(h: {
  handoverId: string;
  cryostatName: string;
  from: string;
  at: string;
  note: string;
  to: string[];
}): MailMessage {
  return {
    eventKey: `handover-waiting:${h.handoverId}`,
    to: h.to,
    subject: `Handover of ${h.cryostatName} waiting for you`,
    body:
      `${h.from} handed ${h.cryostatName} over to you at ${when(h.at)}; it is waiting for your acceptance.\nNote: ${h.note || "(none)"}` +
      FOOTER,
  };
}

export function heliumForecastMail(f: {
  cryostatId: string;
  cryostatName: string;
  /** The entry the current fill starts from (the last transfer), so each fill warns once. */
  anchorEntryId: string;
  daysLeft: number;
  reachAt: string;
  minimumPercent: number;
  litresPerDay: number;
  warnDays: number;
  to: string[];
}): MailMessage {
  const days = Math.max(0, f.daysLeft);
  return {
    eventKey: `helium-forecast:${f.cryostatId}:${f.anchorEntryId}`,
    to: f.to,
    subject: `${f.cryostatName}: helium reaches the minimum in about ${days.toFixed(1)} days`,
    body:
      `Estimate: at the recent boil-off of about ${f.litresPerDay.toFixed(1)} L/day, ${f.cryostatName}'s helium reaches the facility minimum of ${f.minimumPercent} % around ${when(f.reachAt)} — about ${days.toFixed(1)} days from now (the warning threshold is ${f.warnDays} days).\n` +
      "Plan the next transfer. The forecast is a straight-line fit of the level readings since the last transfer, not a measurement." +
      FOOTER,
  };
}

/** A row of the mail outbox as the admin reads it (dates are strings over JSON). */
export type MailRow = {
  id: string;
  eventKey: string;
  to: string;
  subject: string;
  body: string;
  createdAt: Date | string;
  sentAt: Date | string | null;
  error: string | null;
};
