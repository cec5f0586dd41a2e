"use client";
// The facility rules on the tablet: fetched from the server when online and remembered in
// localStorage, so the cautions keep showing the facility's own values with no network.
import { useEffect, useState } from "react";
import { recall, remember } from "@/components/ui/remembered";
import type { RulesInForce } from "@/lib/schemas/rules";

const KEY = "rimelog-rules";

const remembered = () => recall<RulesInForce>(KEY);

export type RulesState = { rules: RulesInForce | null; loading: boolean; offline: boolean };

export function useFacilityRules(): RulesState {
  const [state, setState] = useState<RulesState>({ rules: null, loading: true, offline: false });
  useEffect(() => {
    setState({ rules: remembered(), loading: true, offline: false });
    let cancelled = false;
    fetch("/api/rules", { cache: "no-store" })
      .then(async (r) => {
        if (!r.ok) throw new Error(String(r.status));
        const { rules } = (await r.json()) as { rules: RulesInForce | null };
        if (cancelled) return;
        if (rules) localStorage.setItem(KEY, JSON.stringify(rules));
        setState({ rules, loading: false, offline: false });
      })
      .catch(() => {
        if (!cancelled) setState({ rules: remembered(), loading: false, offline: true });
      });
    return () => {
      cancelled = true;
    };
  }, []);
  return state;
}

/** Called by the admin screen after saving, so this tablet shows the new values at once. */
export function rememberRules(rules: RulesInForce): void {
  remember(KEY, rules);
}
