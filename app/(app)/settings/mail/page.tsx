import { PageHeader, Sheet } from "@/components/ui";
import { requireUser } from "@/lib/http/session";
import { getMailPreferences } from "@/lib/server/mail/preferences";
import { MailPreferencesForm } from "./_components/mail-preferences-form";

export const metadata = { title: "Mail" };

const TIME_ZONES = ["UTC", ...Intl.supportedValuesOf("timeZone").filter((z) => z !== "UTC")];

export default async function MailSettingsPage() {
  const user = await requireUser();
  const prefs = await getMailPreferences(user);
  return (
    <>
      <PageHeader
        title="Mail"
        subtitle={`Which mail reaches ${user.email}: a digest, and review notices as they happen (several within a minute arrive as one mail). Sign-in links and invitations always arrive.`}
      />
      <Sheet className="max-w-2xl">
        <MailPreferencesForm kinds={prefs.kinds} manuscripts={prefs.manuscripts} digest={prefs.digest} timeZones={TIME_ZONES} />
      </Sheet>
    </>
  );
}
