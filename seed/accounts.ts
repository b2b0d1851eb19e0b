// Demo accounts, one per role plus a lab manager, and the three demo labs; loaded by `npm start`.
// Idempotent: existing accounts keep their password; roles and memberships are put back as listed.
// Everyone here is invented.
import { sql } from 'kysely';
import { createDb } from '../src/lib/server/db/index.ts';
import { hashPassword } from '../src/lib/server/auth/passwords.ts';
import type { LabRole, Role } from '../src/lib/shared/principal.ts';

export const DEMO_PASSWORD = 'window-demo-2026';

export const DEMO_LABS = [
  { slug: 'riverbend-interfaces', name: 'Riverbend University Interfaces Group' },
  { slug: 'northmoor-energy', name: 'Northmoor Institute for Energy Materials' },
  { slug: 'kestrel-cells', name: 'Kestrel Cells R&D' },
] as const;

type DemoAccount = {
  email: string;
  name: string;
  role: Role;
  affiliation: string;
  labs: [string, LabRole][];
  what: string;
};

export const DEMO_ACCOUNTS: DemoAccount[] = [
  {
    email: 'admin@edgewise-demo.test',
    name: 'Iris Vantongeren',
    role: 'admin',
    affiliation: 'Edgewise',
    labs: [],
    what: 'admin',
  },
  {
    email: 'curator@edgewise-demo.test',
    name: 'Tomas Okafor-Lind',
    role: 'curator',
    affiliation: 'Edgewise',
    labs: [],
    what: 'curator',
  },
  {
    email: 'manager@riverbend-interfaces.test',
    name: 'Jun Aldana',
    role: 'contributor',
    affiliation: 'Riverbend University',
    labs: [['riverbend-interfaces', 'manager']],
    what: 'contributor, manager of Riverbend Interfaces',
  },
  {
    email: 'contributor@riverbend-interfaces.test',
    name: 'Mira Halvorsen',
    role: 'contributor',
    affiliation: 'Riverbend University',
    labs: [['riverbend-interfaces', 'member']],
    what: 'contributor, member of Riverbend Interfaces',
  },
  {
    email: 'contributor@northmoor-energy.test',
    name: 'Bao Castellanos',
    role: 'contributor',
    affiliation: 'Northmoor Institute',
    labs: [['northmoor-energy', 'manager']],
    what: 'contributor, manager of Northmoor Energy',
  },
  {
    email: 'reader@edgewise-demo.test',
    name: 'Pell Ravensworth',
    role: 'reader',
    affiliation: 'Kestrel Cells',
    labs: [],
    what: 'reader',
  },
];

/** Creates or restores the demo labs and accounts in the database at databaseUrl. */
export async function seedAccounts(databaseUrl: string): Promise<typeof DEMO_ACCOUNTS> {
  const db = createDb(databaseUrl, 1);
  try {
    const hash = await hashPassword(DEMO_PASSWORD);
    await db.transaction().execute(async (trx) => {
      for (const lab of DEMO_LABS) {
        await trx
          .insertInto('labs')
          .values(lab)
          .onConflict((oc) => oc.column('slug').doNothing())
          .execute();
      }
      for (const a of DEMO_ACCOUNTS) {
        await trx
          .insertInto('User')
          .values({
            email: a.email,
            name: a.name,
            role: a.role,
            affiliation: a.affiliation,
            emailVerified: new Date(),
            image: null,
            orcid: null,
            disabled_at: null,
          })
          .onConflict((oc) =>
            oc.expression(sql`lower(email)`).doUpdateSet({ role: a.role, disabled_at: null }),
          )
          .execute();
        const user = await trx
          .selectFrom('User')
          .select('id')
          .where(sql<string>`lower(email)`, '=', a.email)
          .executeTakeFirstOrThrow();
        await trx
          .insertInto('password_credentials')
          .values({ user_id: user.id, hash })
          .onConflict((oc) => oc.column('user_id').doNothing())
          .execute();
        for (const [slug, role] of a.labs) {
          const lab = await trx
            .selectFrom('labs')
            .select('id')
            .where('slug', '=', slug)
            .executeTakeFirstOrThrow();
          await trx
            .insertInto('lab_memberships')
            .values({ lab_id: lab.id, user_id: user.id, role })
            .onConflict((oc) => oc.columns(['lab_id', 'user_id']).doUpdateSet({ role }))
            .execute();
        }
      }
    });
    return DEMO_ACCOUNTS;
  } finally {
    await db.destroy();
  }
}

/** The lines `npm start` prints. */
export function demoAccountLines(): string {
  const width = Math.max(...DEMO_ACCOUNTS.map((a) => a.email.length));
  return [
    `  Demo sign-in (password for all: ${DEMO_PASSWORD})`,
    ...DEMO_ACCOUNTS.map((a) => `    ${a.email.padEnd(width)}  ${a.what}`),
  ].join('\n');
}
