import { useEffect, useState } from "react";

/** False while the page is only the server's HTML (and always, in a browser without JavaScript); true once scripts run. */
export function useHydrated() {
  const [hydrated, setHydrated] = useState(false);
  useEffect(() => setHydrated(true), []);
  return hydrated;
}
