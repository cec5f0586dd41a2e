// Calculators for the ad-hoc questions of the cryostat room. Static HTML (no user data), so the
// service worker can cache it and every calculator runs offline in the browser.
import { Calculators } from "./_components/calculators";

export const metadata = { title: "Calculators" };

export default function CalcPage() {
  return <Calculators />;
}
