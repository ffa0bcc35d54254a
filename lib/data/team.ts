import "server-only";
/** Team members and invitations as plain objects (auth tables are better-auth's, read with SQL). */
import { QueryTypes } from "sequelize";
import { getSequelize } from "@/models/db";

export interface TeamMember {
  memberId: string;
  userId: string;
  name: string;
  email: string;
  role: string;
  joinedAt: string;
}

export interface PendingInvitation {
  id: string;
  email: string;
  role: string;
  expiresAt: string;
  inviterName: string | null;
}

export async function listMembers(teamId: string): Promise<TeamMember[]> {
  const rows = await getSequelize().query<{ memberId: string; userId: string; name: string; email: string; role: string; joinedAt: Date }>(
    `SELECT m.id AS memberId, u.id AS userId, u.name, u.email, m.role, m.createdAt AS joinedAt
       FROM member m JOIN user u ON u.id = m.userId WHERE m.organizationId = ? ORDER BY m.createdAt`,
    { replacements: [teamId], type: QueryTypes.SELECT },
  );
  return rows.map((r) => ({ ...r, joinedAt: new Date(r.joinedAt).toISOString() }));
}

export async function listPendingInvitations(teamId: string): Promise<PendingInvitation[]> {
  const rows = await getSequelize().query<{ id: string; email: string; role: string; expiresAt: Date; inviterName: string | null }>(
    `SELECT i.id, i.email, i.role, i.expiresAt, u.name AS inviterName
       FROM invitation i LEFT JOIN user u ON u.id = i.inviterId
      WHERE i.organizationId = ? AND i.status = 'pending' AND i.expiresAt > UTC_TIMESTAMP(3) ORDER BY i.createdAt DESC`,
    { replacements: [teamId], type: QueryTypes.SELECT },
  );
  return rows.map((r) => ({ ...r, expiresAt: new Date(r.expiresAt).toISOString() }));
}

export interface InvitationView {
  id: string;
  email: string;
  role: string;
  status: string;
  expiresAt: string;
  teamName: string;
  inviterName: string | null;
}

export async function getInvitation(id: string): Promise<InvitationView | null> {
  const rows = await getSequelize().query<{ id: string; email: string; role: string; status: string; expiresAt: Date; teamName: string; inviterName: string | null }>(
    `SELECT i.id, i.email, i.role, i.status, i.expiresAt, o.name AS teamName, u.name AS inviterName
       FROM invitation i JOIN organization o ON o.id = i.organizationId LEFT JOIN user u ON u.id = i.inviterId
      WHERE i.id = ?`,
    { replacements: [id], type: QueryTypes.SELECT },
  );
  const r = rows[0];
  return r ? { ...r, expiresAt: new Date(r.expiresAt).toISOString() } : null;
}
