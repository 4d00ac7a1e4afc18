import Link from "next/link";
import { Logo } from "@/components/ui/Logo";

export const metadata = { title: "Not allowed" };

export default function ForbiddenPage() {
  return (
    <main className="flex min-h-screen flex-col items-center justify-center gap-4 p-6 text-center">
      <Logo />
      <h1 className="text-2xl font-semibold">Your role does not open this page</h1>
      <p className="max-w-md text-muted">Ask an admin if you need it. Everything you can read is still on the overview.</p>
      <Link href="/" className="text-brass underline underline-offset-4">Back to the overview</Link>
    </main>
  );
}
