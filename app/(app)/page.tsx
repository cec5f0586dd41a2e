import { RoomOverview } from "@/components/room/room-overview";

export const metadata = { title: "Cryostat room" };

export default function RoomPage() {
  return (
    <>
      <h1 className="mb-4 text-3xl font-bold">Cryostat room</h1>
      <RoomOverview />
    </>
  );
}
