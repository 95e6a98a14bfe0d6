import { redirect } from "next/navigation";

// The front door is the boards list; the (app) layout sends anyone without a session to /signin.
export default function Home(): never {
  redirect("/boards");
}
