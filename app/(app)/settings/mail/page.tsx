import { PageHeader, Sheet } from "@/components/ui";
import { requireUser } from "@/lib/http/session";
import { getMailPreferences } from "@/lib/server/mail/preferences";
import { MailPreferencesForm } from "./_components/mail-preferences-form";

export const metadata = { title: "Mail" };

export default async function MailSettingsPage() {
  const user = await requireUser();
  const prefs = await getMailPreferences(user);
  return (
    <>
      <PageHeader
        title="Mail"
        subtitle={`Which review notices reach ${user.email}. Several within a minute arrive as one mail; sign-in links and invitations always arrive.`}
      />
      <Sheet className="max-w-2xl">
        <MailPreferencesForm kinds={prefs.kinds} manuscripts={prefs.manuscripts} />
      </Sheet>
    </>
  );
}
