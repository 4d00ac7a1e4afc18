import { Overview } from "@/components/overview/Overview";
import { defaultEnvironment } from "@/lib/config";

export const metadata = { title: "Overview" };

export default function HomePage() {
  return <Overview env={defaultEnvironment()} />;
}
