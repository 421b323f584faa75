import type { EntityManager } from 'typeorm';
import type { Role } from '../../shared/auth/roles';
import { SiteMemberEntity } from '../sites/site-member.entity';
import { ChangeBuffer, writeRecord } from '../records/record-writer';
import { UserEntity } from '../users/user.entity';
import { hashPassword } from '../users/user-service';

/** The invented demo scenario's people and site. Everyone here is made up. */
export const DEMO_PASSWORD = 'fluxwalk-demo';
export const DEMO_SITE_ID = '0f3c2a9e-5b1d-4c7e-9a2f-6d8e1b4c7a10';

export const DEMO_USERS: { id: string; email: string; displayName: string; roles: Role[]; member: boolean }[] = [
  { id: '1a6f0c3e-2d4b-4e8a-9c1f-3b5d7e9f1a01', email: 'crew@fluxwalk.example', displayName: 'Rowan Ashby', roles: ['crew'], member: true },
  {
    id: '1a6f0c3e-2d4b-4e8a-9c1f-3b5d7e9f1a02',
    email: 'lead@fluxwalk.example',
    displayName: 'Imke Dahlberg',
    roles: ['lead'],
    member: true,
  },
  { id: '1a6f0c3e-2d4b-4e8a-9c1f-3b5d7e9f1a03', email: 'lab@fluxwalk.example', displayName: 'Tomas Varga', roles: ['lab'], member: false },
  {
    id: '1a6f0c3e-2d4b-4e8a-9c1f-3b5d7e9f1a04',
    email: 'admin@fluxwalk.example',
    displayName: 'Priya Lindqvist',
    roles: ['admin'],
    member: false,
  },
];

export async function seedDemoAccounts(em: EntityManager): Promise<void> {
  const hash = await hashPassword(DEMO_PASSWORD);
  for (const u of DEMO_USERS) {
    await em.getRepository(UserEntity).insert({
      id: u.id,
      email: u.email,
      displayName: u.displayName,
      passwordHash: hash,
      roles: u.roles,
      disabled: false,
    });
  }
  // Through the record writer, so the site enters the change log and reaches devices on pull.
  const admin = DEMO_USERS.find((u) => u.roles.includes('admin'))!;
  const changes = new ChangeBuffer();
  const site = await writeRecord(
    em,
    { id: admin.id, roles: ['admin'], siteIds: [] },
    {
      entity: 'site',
      id: DEMO_SITE_ID,
      baseRev: null,
      op: 'upsert',
      fields: {
        name: 'Alder Hollow Field Station',
        timezone: 'Europe/Berlin',
        elevationM: 420,
        latitude: 51.0,
        longitude: 10.0,
        safetyNote:
          'Check the forecast before leaving: stop work and leave the plots when thunder is heard. Carry water; ' +
          'in heat, take breaks in shade. Nobody walks the far plots alone: tell the station when you leave and return. ' +
          'Follow the station safety plan and local rules; they take precedence over this note.',
      },
    },
    changes,
  );
  if (site.status !== 'applied') throw new Error(`demo site: ${JSON.stringify(site.error)}`);
  await changes.flush(em);
  for (const u of DEMO_USERS) {
    if (u.member) await em.getRepository(SiteMemberEntity).insert({ siteId: DEMO_SITE_ID, userId: u.id });
  }
}
