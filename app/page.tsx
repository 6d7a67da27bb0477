import { redirect } from "next/navigation";
import { roleHome } from "@/lib/permissions";
import { currentUser } from "@/lib/server/session";

export default async function Home() {
  const user = await currentUser();
  redirect(user ? roleHome[user.role] : "/sign-in");
}
