import { PageHeader, RoleBadge, Sheet } from "@/components/ui";
import { roleAllows } from "@/lib/authz/policy";
import { formatDate } from "@/lib/data/format";
import { listPendingInvitations } from "@/lib/server/members";
import { BackToManuscript, loadManuscriptPage } from "../_components/manuscript-page";
import { InviteForm, MemberControls } from "./_components/member-forms";
import { MailDelivery } from "./_components/mail-delivery";

export const metadata = { title: "Members" };

export default async function MembersPage({ params }: { params: Promise<{ id: string }> }) {
  const { user, id, manuscript: m } = await loadManuscriptPage(params);
  const invitations = await listPendingInvitations(user, id);
  const mayManage = roleAllows(m.role, "member.manage");
  return (
    <>
      <PageHeader title="Members" subtitle={<BackToManuscript manuscript={m} showRole={false} />} />
      <div className="grid gap-6 lg:grid-cols-[minmax(0,1fr)_320px]">
        <div className="min-w-0 space-y-6">
          <div className="relative overflow-x-auto">
            <table className="w-full border border-rule bg-sheet text-sm">
              <caption className="sr-only">Members of {m.title}</caption>
              <thead className="bg-paper text-left text-xs uppercase tracking-wide text-muted">
                <tr>
                  <th className="px-4 py-2">Name</th>
                  <th className="px-4 py-2">E-mail</th>
                  <th className="px-4 py-2">Role</th>
                  {mayManage ? <th className="px-4 py-2">Manage</th> : null}
                </tr>
              </thead>
              <tbody className="divide-y divide-rule">
                {m.members.map((p) => (
                  <tr key={p.userId}>
                    <td className="px-4 py-2.5 font-medium">{p.name}</td>
                    <td className="px-4 py-2.5 text-muted">{p.email}</td>
                    <td className="px-4 py-2.5">
                      <RoleBadge role={p.role} />
                    </td>
                    {mayManage ? (
                      <td className="px-4 py-2.5">
                        <MemberControls manuscriptId={id} userId={p.userId} role={p.role} name={p.name} />
                      </td>
                    ) : null}
                  </tr>
                ))}
              </tbody>
            </table>
          </div>
          {mayManage ? <MailDelivery user={user} manuscriptId={id} /> : null}
          {invitations.length ? (
            <Sheet>
              <h2 className="text-sm font-semibold">Pending invitations</h2>
              <ul className="mt-2 space-y-1 text-sm">
                {invitations.map((i) => (
                  <li key={i.id} className="flex flex-wrap items-center gap-2">
                    <span aria-hidden>✉</span>
                    {i.email} <RoleBadge role={i.role} />
                    <span className="text-xs text-muted">expires {formatDate(i.expiresAt)}</span>
                  </li>
                ))}
              </ul>
            </Sheet>
          ) : null}
        </div>
        {mayManage ? (
          <Sheet>
            <h2 className="mb-3 text-sm font-semibold">Invite someone</h2>
            <InviteForm manuscriptId={id} />
          </Sheet>
        ) : (
          <Sheet>
            <p className="text-sm text-muted">Only the PI manages members.</p>
          </Sheet>
        )}
      </div>
    </>
  );
}
