import { AppHeader } from "@/components/layout/app-header";
import { requirePageUser } from "@/lib/server/session";

// Every signed-in page: reads the session on the server and redirects to /signin without one.
// Route handlers check roles themselves; this only guards what is rendered.
export default async function AppLayout({ children }: { children: React.ReactNode }) {
  const user = await requirePageUser();
  return (
    <div className="flex min-h-screen flex-col">
      <AppHeader user={user} />
      <main className="rw-shell flex-1 px-4 py-5 sm:px-6">{children}</main>
      <footer className="rw-shell px-4 pb-5 text-[12px] text-ink-faint sm:px-6">
        Railwise · behavioural simulation of op-amp stages; confirm on the bench before a board is built.
      </footer>
    </div>
  );
}
