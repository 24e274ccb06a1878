import { requireAccess } from '@/lib/server/access';
import { listUsers } from '@/lib/db/users';
import { db } from '@/lib/db/client';
import { ROLE_LABEL, isRole } from '@/lib/server/roles';
import { TopBar } from '../../top-bar';
import { CreateUserForm } from './create-user-form';
import { RuleSetForm } from './rule-set-form';
import { listBuiltInRuleSets } from '@/lib/rules';
import { unitForUser } from '@/lib/server/unit';

export const dynamic = 'force-dynamic';

export default async function AdminPage() {
  const user = await requireAccess('/admin');
  const users = await listUsers(db());
  const unit = await unitForUser(user);
  const ruleSets = listBuiltInRuleSets().map((r) => ({ id: r.id, version: r.version, description: r.description.slice(0, 90) }));
  return (
    <>
      <TopBar user={user} />
      <main>
        <h1>Administration</h1>
        <section className="panel">
          <h2>Accounts</h2>
          <table>
            <thead><tr><th>Username</th><th>Name</th><th>Role</th><th>Active</th></tr></thead>
            <tbody>
              {users.map((u) => (
                <tr key={u.id}>
                  <td>{u.username}</td>
                  <td>{u.displayName}</td>
                  <td>{isRole(u.role) ? ROLE_LABEL[u.role] : u.role}</td>
                  <td>{u.active ? 'yes' : 'no'}</td>
                </tr>
              ))}
            </tbody>
          </table>
        </section>
        <div style={{ marginTop: 12 }}>
          <CreateUserForm />
        </div>
        {unit && (
          <div style={{ marginTop: 12 }}>
            <RuleSetForm options={ruleSets} active={{ id: unit.activeRuleSetId, version: unit.activeRuleSetVersion }} />
          </div>
        )}
      </main>
    </>
  );
}
