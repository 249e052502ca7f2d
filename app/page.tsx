import { redirect } from "next/navigation";
import { currentUser } from "@/lib/http/session";

export const dynamic = "force-dynamic";

export default async function Home() {
  redirect((await currentUser()) ? "/manuscripts" : "/sign-in");
}
