"use client";
// Light for a bright bench, dim for a darkened lab. Stored per tablet.
import { useEffect, useState } from "react";
import { Button } from "@/components/ui/button";

export function ThemeToggle() {
  const [dim, setDim] = useState(false);
  useEffect(() => setDim(document.documentElement.dataset.theme === "dim"), []);
  const toggle = () => {
    const next = !dim;
    setDim(next);
    if (next) document.documentElement.dataset.theme = "dim";
    else delete document.documentElement.dataset.theme;
    try {
      localStorage.setItem("rimelog-theme", next ? "dim" : "light");
    } catch {
      /* private mode: the choice lasts for this page only */
    }
  };
  return (
    <Button variant="ghost" onClick={toggle} aria-pressed={dim} title="Switch theme">
      <span aria-hidden>{dim ? "☀" : "☾"}</span>
      <span>{dim ? "Light mode" : "Dim mode"}</span>
    </Button>
  );
}
