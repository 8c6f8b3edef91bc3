import type { Metadata } from "next";
import { CircleCheck, CircleSlash, Users } from "lucide-react";
import { Badge, Card, EmptyState, PageHeader, TBody, TD, TH, THead, TR, Table } from "@/components/ui";
import { listOpenInvites, listStaffMembers } from "@/db/queries/staff";
import { ROLE_LABEL } from "@/lib/permissions";
import { shopPageAccess } from "../shop-access";
import { InviteForm } from "./_components/invite-form";
import { ActiveToggle, RevokeInvite, RoleForm } from "./_components/member-controls";

export const metadata: Metadata = { title: "Staff" };

/** The shop owner's staff page: who works here, in what role, and open invitations. */
export default async function StaffPage({ params }: { params: Promise<{ shop: string }> }) {
  const { shop: slug } = await params;
  const { shop, actor } = await shopPageAccess(slug, "shop:manage-staff", `/shop/${slug}/staff`);
  const [members, invites] = await Promise.all([listStaffMembers({ shopId: shop.id }), listOpenInvites({ shopId: shop.id })]);
  const when = new Intl.DateTimeFormat("en-US", { timeZone: shop.timezone, month: "short", day: "numeric", year: "numeric" });
  return (
    <div className="space-y-6">
      <PageHeader
        title="Staff"
        description="Invite people by e-mail, set their roles, and take them off the staff. A change of role or a deactivation signs the person out at once. The shop always keeps at least one active owner."
        back={{ href: `/shop/${shop.slug}`, label: "All jobs" }}
      />
      <Card as="section" title="Invite someone" headingId="invite-heading" description="They get an e-mail with a link to set their password. The link lasts 7 days and works once.">
        <InviteForm shop={shop.slug} />
      </Card>
      <section aria-labelledby="members-heading" className="space-y-3">
        <h2 id="members-heading" className="text-lg font-bold">
          People
        </h2>
        <Table label="Staff of the shop">
          <THead>
            <TR>
              <TH>Name</TH>
              <TH>E-mail</TH>
              <TH>Role</TH>
              <TH>State</TH>
              <TH>
                <span className="sr-only">Action</span>
              </TH>
            </TR>
          </THead>
          <TBody>
            {members.map((m) => (
              <TR key={m.userId}>
                <TD className="font-semibold">
                  {m.name}
                  {m.userId === actor.userId ? <span className="text-sm font-normal text-ink-muted"> (you)</span> : null}
                </TD>
                <TD className="break-all">{m.email}</TD>
                <TD>{m.deactivatedAt ? ROLE_LABEL[m.role] : <RoleForm shop={shop.slug} user={m.userId} name={m.name} role={m.role} />}</TD>
                <TD>
                  {m.deactivatedAt ? (
                    <Badge tone="rust" icon={CircleSlash}>
                      Deactivated {when.format(m.deactivatedAt)}
                    </Badge>
                  ) : (
                    <Badge tone="moss" icon={CircleCheck}>
                      Active
                    </Badge>
                  )}
                </TD>
                <TD>
                  <ActiveToggle key={m.deactivatedAt ? "off" : "on"} shop={shop.slug} user={m.userId} name={m.name} active={!m.deactivatedAt} />
                </TD>
              </TR>
            ))}
          </TBody>
        </Table>
      </section>
      <section aria-labelledby="invites-heading" className="space-y-3">
        <h2 id="invites-heading" className="text-lg font-bold">
          Open invitations
        </h2>
        {invites.length === 0 ? (
          <EmptyState icon={Users} title="No open invitations" description="Invitations waiting to be accepted show here until they are used or expire." />
        ) : (
          <Table label="Open invitations">
            <THead>
              <TR>
                <TH>Name</TH>
                <TH>E-mail</TH>
                <TH>Role</TH>
                <TH>Expires</TH>
                <TH>
                  <span className="sr-only">Action</span>
                </TH>
              </TR>
            </THead>
            <TBody>
              {invites.map((i) => (
                <TR key={i.id}>
                  <TD>{i.name}</TD>
                  <TD className="break-all">{i.email}</TD>
                  <TD>{ROLE_LABEL[i.role]}</TD>
                  <TD className="whitespace-nowrap">{when.format(i.expires_at)}</TD>
                  <TD>
                    <RevokeInvite shop={shop.slug} invite={i.id} email={i.email} />
                  </TD>
                </TR>
              ))}
            </TBody>
          </Table>
        )}
      </section>
    </div>
  );
}
