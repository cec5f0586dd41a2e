// Sensor calibration tables per thermometer channel: upload, preview, accept, list.
import { CalibrationUploadPage } from "@/components/cryo/calibration-upload";

export const metadata = { title: "Sensor calibrations" };

export default function CalibrationsPage() {
  return <CalibrationUploadPage />;
}
