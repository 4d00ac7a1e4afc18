import { ColdStart } from "@/components/boot/ColdStart";

export const metadata = { title: "Cold start" };

export default async function ColdStartPage({ params }: { params: Promise<{ env: string }> }) {
  return <ColdStart env={(await params).env} />;
}
